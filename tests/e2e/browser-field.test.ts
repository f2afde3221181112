// The field day in headless Chromium on a phone (390 × 844): a crew member working alone checks out
// with one tap; when they are not back, safety gets the alert by SMTP (the local sink) and the field
// board shows them overdue in the strongest style; a check-in from the phone clears it. Time moves by
// restarting the server with its test clock later (same database, same port) and moving the page's
// clock with it. Screenshots are kept under test-results/screenshots.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

const PHONE = { width: 390, height: 844 }
const MIN = 60_000
const T0 = Date.parse(TEST_CLOCK.weekdayMorning)
const iso = (ms: number) => new Date(ms).toISOString()
const ENV = { REMINDER_TIMER: 'off', REQUEST_LOG: 'off', FIELD_ALERT_INTERVAL_MS: '250' }

let browser: Browser
let sink: Awaited<ReturnType<typeof startMailSink>>
const servers: AppServer[] = []

beforeAll(async () => {
  sink = await startMailSink()
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  for (const s of servers.reverse()) await s.stop()
  await sink?.close()
})

async function phonePage(server: AppServer, email: string, theme: 'light' | 'dark' = 'light'): Promise<Page> {
  const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 1, colorScheme: theme })
  const page = await context.newPage()
  await matchServerClock(page, server)
  await signInThroughPage(page, server.url, email)
  return page
}

describe('a lone worker checks out on a phone and is not back in time', () => {
  it('safety is mailed, the board shows them overdue, and a check-in from the phone clears it', async () => {
    const env = { ...ENV, SMTP_URL: sink.url }
    const first = await startAppServer({ env, clockStart: iso(T0) })
    servers.push(first)
    const coordinator = await signedInClient(first, 'coordinator@gloamline.test')
    const people = (await coordinator.get('/api/people')).body as { id: number, email: string }[]
    const site = ((await coordinator.get('/api/sites')).body as { id: number }[])[0]!
    const crewId = people.find(p => p.email === 'crew@gloamline.test')!.id
    // on site 30–90 minutes from now, 30 minutes' travel each way: expected back at T0 + 120 min
    const shift = await coordinator.post('/api/shifts', { siteId: site.id, title: 'Weather mast battery swap', start: iso(T0 + 30 * MIN), end: iso(T0 + 90 * MIN), light: 'any', assigneeIds: [crewId], travelMinutes: 30 })
    expect(shift.status).toBe(201)
    const id = shift.body.id as number
    expect((await coordinator.patch('/api/settings/field', { overdueGraceMinutes: 30, soloCheckInMinutes: 240 })).status).toBe(200)

    const crew = await phonePage(first, 'crew@gloamline.test')
    const buttons = crew.getByTestId(`field-buttons-${id}`)
    await buttons.waitFor()
    expect(await buttons.getByTestId('field-outing').textContent()).toMatch(/leave \d\d:\d\d, on site \d\d:\d\d–\d\d:\d\d, back \d\d:\d\d/)
    const leave = buttons.getByTestId('field-depart')
    const box = (await leave.boundingBox())!
    expect(box.height).toBeGreaterThanOrEqual(72)
    // the width of the card on a 390 px phone, well beyond the 44 px minimum (docs/look.md), for gloves
    expect(box.width).toBeGreaterThanOrEqual(250)
    await leave.click()
    await buttons.getByTestId('field-state').waitFor()
    expect(await buttons.getByTestId('field-state').textContent()).toContain('Out, expected back')
    // the check-in and back buttons appear at the top of the home
    const top = crew.getByTestId(`field-out-${id}`)
    await top.waitFor()
    expect(await top.getAttribute('data-state')).toBe('out')
    await keepScreenshot(crew, 'field-crew-out-phone')
    await crew.context().close()
    await first.kill()

    // 2 h 35 min later: 35 minutes past the expected return, beyond the 30-minute grace
    const later = await startAppServer({ env, clockStart: iso(T0 + 155 * MIN), databasePath: first.databasePath, port: first.port })
    servers.push(later)
    await sink.waitFor('accepted', 1)
    await expect.poll(() => sink.messages.some(m => m.to.includes('safety@gloamline.test')), { timeout: 15_000 }).toBe(true)
    const mail = sink.messages.find(m => m.to.includes('safety@gloamline.test'))!
    expect(mail.subject).toMatch(/^Party overdue: Weather mast battery swap at /)
    expect(mail.text).toContain('an alert is no rescue plan')

    for (const theme of ['light', 'dark'] as const) {
      const safety = await phonePage(later, 'safety@gloamline.test', theme)
      await safety.goto(`${later.url}/field`)
      const card = safety.getByTestId(`field-party-${id}`)
      await card.waitFor()
      expect(await card.getAttribute('data-state')).toBe('overdue')
      expect(await card.getByTestId('field-words').textContent()).toMatch(/^\s*Overdue by 35 min/)
      await keepScreenshot(safety, `field-board-overdue-phone-${theme}`)
      await safety.context().close()
    }

    const crewLater = await phonePage(later, 'crew@gloamline.test', 'dark')
    const again = crewLater.getByTestId(`field-out-${id}`)
    await again.getByTestId('field-check-in').waitFor()
    expect(await again.getByTestId('field-state').textContent()).toContain('Overdue')
    await keepScreenshot(crewLater, 'field-crew-overdue-phone-dark')
    const checkIn = again.getByTestId('field-check-in')
    expect((await checkIn.boundingBox())!.height).toBeGreaterThanOrEqual(72)
    await checkIn.click()
    await expect.poll(() => again.getAttribute('data-state')).toBe('out')
    expect(await again.getByTestId('field-state').textContent()).toContain('Out, expected back')
    await crewLater.context().close()

    const safety = await phonePage(later, 'safety@gloamline.test')
    await safety.goto(`${later.url}/field`)
    const card = safety.getByTestId(`field-party-${id}`)
    await card.waitFor()
    expect(await card.getAttribute('data-state')).toBe('out')
    await keepScreenshot(safety, 'field-board-cleared-phone')
    await safety.context().close()
  }, 120_000)
})
