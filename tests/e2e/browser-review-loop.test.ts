// The review loop as people click it, in headless Chromium: a lone worker's lit-area shift in polar
// night and a 14 h shift arrive in the queue with their reasons; safety sends one back with a note and
// the coordinator is mailed and sees the outcome and note on the calendar, the list and their home;
// safety approves the other with two mitigations, the coordinator's dialog shows them in words and
// warns before a change re-opens it; an exported week imports back unchanged.
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'
import { dateFromToday, findPeopleIds, startSafetyWorld, type SafetyWorld } from '../support/safety-fixtures'

interface SinkMessage { to: string[], subject: string, text: string }
let sink: { url: string, messages: SinkMessage[], close: () => Promise<void> }
let world: SafetyWorld
let browser: Browser
let siteId: number
const ids: Record<'lone' | 'long', number> = { lone: 0, long: 0 }
const NOTE = 'Put a second person on it, or move it to the radio-covered hut.'

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  // the default test clock is 18 November 2026: polar night at 78° N
  world = await startSafetyWorld({ SMTP_URL: sink.url, REMINDER_TIMER: 'off' })
  browser = await launchBrowser()
  // an invented site at 78.22° N, 15.65° E
  const site = await world.coordinator.post('/api/sites', { name: 'Invented Polar Loop Hut', latitude: 78.22, longitude: 15.65, timezone: 'Arctic/Longyearbyen' })
  siteId = site.body.id
  const { crew } = await findPeopleIds(world.coordinator)
  const day = dateFromToday(3)
  const lone = await world.coordinator.post('/api/shifts', { siteId, title: 'Lone mast check', start: `${day}T09:00:00Z`, end: `${day}T13:00:00Z`, light: 'any', assigneeIds: [crew[0]] })
  const long = await world.coordinator.post('/api/shifts', { siteId, title: 'Long fuel haul', start: `${dateFromToday(4)}T06:00:00Z`, end: `${dateFromToday(4)}T20:00:00Z`, light: 'any', assigneeIds: crew.slice(0, 2) })
  expect([lone.status, long.status]).toEqual([201, 201])
  ids.lone = lone.body.id
  ids.long = long.body.id
})
afterAll(async () => {
  await browser?.close()
  await world?.stop()
  await sink?.close()
})

async function openAs(email: string, viewport = { width: 1280, height: 800 }, colorScheme: 'light' | 'dark' = 'light'): Promise<Page> {
  const context = await browser.newContext({ viewport, colorScheme, acceptDownloads: true })
  const page = await context.newPage()
  await matchServerClock(page, world.server)
  await signInThroughPage(page, world.server.url, email)
  return page
}

// through the main navigation, as a person gets there (the list then loads in the browser)
async function openShiftList(page: Page) {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Shift list' }).click()
  await page.waitForURL(/\/shifts/)
  await page.getByTestId('shift-filters').waitFor()
}

describe('the review loop in the browser', () => {
  it('shows the lone polar-night shift and the 14 h shift in the queue with their reasons', async () => {
    const page = await openAs('safety@gloamline.test')
    await page.goto(`${world.server.url}/review`)
    const lone = page.locator(`[data-testid="queue-item"][data-shift-id="${ids.lone}"] [data-reason="lone"]`)
    const long = page.locator(`[data-testid="queue-item"][data-shift-id="${ids.long}"] [data-reason="long"]`)
    await lone.waitFor()
    expect(await lone.textContent()).toMatch(/Alone in the dark:\s+one person, 4 h with the sun below −6°/)
    expect(await long.textContent()).toMatch(/Long shift:\s+14 h, over the 12 h maximum/)
    await keepScreenshot(page, 'review-loop-queue-reasons')
    await page.context().close()
  })

  it('lets safety send the lone shift back with a note, and mails the coordinator', async () => {
    const page = await openAs('safety@gloamline.test')
    await page.goto(`${world.server.url}/review/${ids.lone}`)
    await page.getByTestId('decision-form').waitFor()
    await page.getByRole('radio', { name: /^Send back/ }).check()
    // the form asks for the note before anything is sent
    await page.getByRole('button', { name: 'Record decision' }).click()
    await expect.poll(() => page.getByTestId('decision-form').textContent()).toContain('Say which changes are needed.')
    await page.getByLabel('Changes needed (required)').fill(NOTE)
    await page.getByRole('button', { name: 'Record decision' }).click()
    await expect.poll(() => page.getByTestId('review-badge').first().getAttribute('data-review-state')).toBe('changes-requested')
    await keepScreenshot(page, 'review-loop-sent-back')
    await page.context().close()
    await expect.poll(() => sink.messages.filter(m => m.to.includes('coordinator@gloamline.test') && m.subject.startsWith('Sent back by safety review: Lone mast check')).length, { timeout: 10_000 }).toBe(1)
    expect(sink.messages.find(m => m.subject.startsWith('Sent back by safety review: Lone mast check'))!.text).toContain(NOTE)
  })

  it('shows the coordinator the outcome and note on the calendar, in the list and on their home', async () => {
    const page = await openAs('coordinator@gloamline.test')
    await page.goto(`${world.server.url}/plan?site=${siteId}&date=${dateFromToday(3)}&view=week`)
    const chip = page.locator(`[data-testid="shift-chip"][data-shift-id="${ids.lone}"]`)
    await chip.waitFor()
    expect(await chip.getByTestId('light-marker').textContent()).toContain('Sent back')
    expect(await chip.getByTestId('shift-chip-note').textContent()).toContain(NOTE)
    await keepScreenshot(page, 'review-loop-calendar-sent-back')

    await page.goto(`${world.server.url}/`)
    const outcome = page.locator(`[data-testid="review-outcomes"] [data-shift-id="${ids.lone}"]`)
    await outcome.waitFor()
    expect(await outcome.textContent()).toContain(NOTE)
    await keepScreenshot(page, 'review-loop-home-outcomes')
    // each outcome is a link that opens the shift in the plan, with the decision in its dialog
    await outcome.getByRole('link', { name: 'Lone mast check' }).click()
    const panel = page.getByTestId('review-outcome')
    await panel.waitFor()
    expect(await panel.textContent()).toContain('Sent back by Tomas Reyes')
    expect(await panel.textContent()).toContain(NOTE)
    await keepScreenshot(page, 'review-loop-dialog-sent-back')
    await page.context().close()
  })

  it('lets safety approve the long shift with two mitigations; the coordinator reads them and is warned before re-opening it', async () => {
    const safety = await openAs('safety@gloamline.test')
    await safety.goto(`${world.server.url}/review/${ids.long}`)
    await safety.getByTestId('decision-form').waitFor()
    await safety.getByRole('radio', { name: /^Approve/ }).check()
    await safety.getByRole('button', { name: 'Record decision' }).click()
    await expect.poll(() => safety.getByTestId('decision-form').textContent()).toContain('Tick at least one mitigation')
    await safety.getByRole('checkbox', { name: 'Warm-up breaks scheduled as the cold figures direct' }).check()
    await safety.getByRole('checkbox', { name: 'Check-in at a fixed interval' }).check()
    await safety.getByRole('button', { name: 'Record decision' }).click()
    await expect.poll(() => safety.getByTestId('review-badge').first().getAttribute('data-review-state')).toBe('approved')
    await safety.context().close()

    const page = await openAs('coordinator@gloamline.test')
    await openShiftList(page)
    const cell = page.locator(`tr[data-shift-id="${ids.long}"] [data-testid="shift-review-cell"]`)
    await cell.waitFor()
    expect(await cell.textContent()).toContain('Approved')
    expect(await cell.textContent()).toContain('Warm-up breaks scheduled as the cold figures direct; Check-in every 30 min')
    await page.locator(`tr[data-shift-id="${ids.long}"]`).getByRole('button', { name: 'Long fuel haul' }).click()
    await page.getByTestId('review-outcome').waitFor()
    expect(await page.getByTestId('review-outcome').textContent()).toContain('Approved by Tomas Reyes')
    const end = page.getByLabel('End time, 24-hour')
    // 20:00 UTC is 21:00 on the site's clock (UTC+1 in winter): two hours longer
    await end.fill('23:00')
    await page.getByRole('button', { name: 'Save changes' }).click()
    await page.getByTestId('review-reopen-warning').waitFor()
    expect(await page.getByTestId('review-reopen-warning').textContent()).toContain('“Approved”')
    await keepScreenshot(page, 'review-loop-reopen-warning')
    // nothing was saved yet: the shift is still approved
    expect((await world.coordinator.get(`/api/shifts/${ids.long}`)).body.reviewState).toBe('approved')
    await page.context().close()
  })

  it('exports a week of the list and imports it back unchanged', async () => {
    const page = await openAs('coordinator@gloamline.test')
    await openShiftList(page)
    await page.getByTestId('shift-filters').getByLabel('Site', { exact: true }).selectOption({ label: 'Invented Polar Loop Hut' })
    await expect.poll(() => page.getByTestId('shift-count').textContent()).toMatch(/^2 of/)
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: /Export these 2 as CSV/ }).click()])
    const file = readFileSync((await download.path())!, 'utf8')
    expect(file.split('\r\n')[0]).toMatch(/^id,site,title,start,end,light,assignees,notes,/)

    await page.goto(`${world.server.url}/import`)
    await page.getByTestId('import-file').setInputFiles({ name: 'week.csv', mimeType: 'text/csv', buffer: Buffer.from(file) })
    await expect.poll(() => page.getByTestId('import-summary').textContent()).toContain('0 change a planned shift, 2 unchanged')
    await keepScreenshot(page, 'review-loop-import-unchanged')
    await page.context().close()
  })

  it('shows the coordinator the review rules on the settings page, with the cold limit', async () => {
    const page = await openAs('coordinator@gloamline.test')
    await page.goto(`${world.server.url}/settings`)
    await page.getByTestId('review-rules').waitFor()
    expect(await page.getByLabel('Cold limit: wind chill at or below (°C)').inputValue()).toBe('-27')
    expect(await page.getByLabel('Longest shift (hours)').inputValue()).toBe('12')
    await page.getByTestId('review-rules').scrollIntoViewIfNeeded()
    await keepScreenshot(page, 'review-loop-settings-rules')
    await page.context().close()
  })

  it('reads on a phone in the dark theme', async () => {
    const page = await openAs('coordinator@gloamline.test', { width: 390, height: 844 }, 'dark')
    await page.goto(`${world.server.url}/`)
    await page.locator(`[data-testid="review-outcomes"] [data-shift-id="${ids.lone}"]`).waitFor()
    await keepScreenshot(page, 'review-loop-home-phone-dark')
    await page.goto(`${world.server.url}/review/${ids.lone}`)
    await page.getByTestId('review-reasons').first().waitFor()
    expect(await page.getByTestId('review-reasons').first().textContent()).toContain('Alone in the dark')
    await keepScreenshot(page, 'review-loop-review-phone-dark')
    await page.context().close()
  })
})
