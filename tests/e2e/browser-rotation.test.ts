// A rotation in headless Chromium, end to end: the coordinator turns a shift into a 4-on/3-off
// rotation at an invented 76°N site, through the autumn clock change into polar night, and sees its
// light shortfalls day by day before saving; safety approves its waiting shifts in one decision;
// changing one shift brings that shift alone back to the queue. References: the wall clock from the
// tz data through Intl (Arctic/Longyearbyen back to +01:00 on 31 Oct 2027); each shift's light
// against astronomy-engine 2.1.19 (geometric altitude of the sun's centre, USNO −0.833° for daylight).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Body, Equator, Horizon, Observer } from 'astronomy-engine'
import type { Browser } from 'playwright-core'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { ARTEFACTS_DIR, keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

const SITE = { name: 'Sorgneset Test Station', latitude: 76.45, longitude: 16.6, timezone: 'Arctic/Longyearbyen' }
let server: AppServer
let browser: Browser
let coordinator: ApiClient
let siteId: number

function referenceMinutesBelowDaylight(startMs: number, endMs: number) {
  const observer = new Observer(SITE.latitude, SITE.longitude, 0)
  let below = 0
  for (let t = startMs; t < endMs; t += 60_000) {
    const at = new Date(t + 30_000)
    const sky = Equator(Body.Sun, at, observer, true, true)
    if (Horizon(at, observer, sky.ra, sky.dec).altitude < -0.833) below++
  }
  return below
}

function intlWall(iso: string) {
  const p = Object.fromEntries(new Intl.DateTimeFormat('en-CA', { timeZone: SITE.timezone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(Date.parse(iso)).map(x => [x.type, x.value]))
  return `${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute}`
}

beforeAll(async () => {
  // the server's "now" is a week before the rotation, so all of it is upcoming
  server = await startAppServer({ clockStart: '2027-10-11T08:00:00.000Z' })
  browser = await launchBrowser()
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  siteId = (await coordinator.post('/api/sites', SITE)).body.id
  await coordinator.post('/api/people', { name: 'Runa Rotation', email: 'runa@rotation.gloamline.test', role: 'crew' })
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

describe('a rotation planned, previewed and reviewed in the browser', () => {
  it('is made from the calendar with its shortfalls shown first, approved in one decision, and one changed shift comes back alone', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await matchServerClock(page, server)
    await signInThroughPage(page, server.url, 'coordinator@gloamline.test')
    await page.goto(`${server.url}/plan?site=${siteId}&date=2027-10-18&view=week`)
    await page.getByTestId('plan-calendar').waitFor()
    // the calendar is ready once the site's light lies behind it
    await page.locator('.fc-bg-event').first().waitFor()
    // a click on Monday 18 October at 10:00 opens a new shift there
    const slot = page.locator('td.fc-timegrid-slot-lane[data-time="10:00:00"]')
    await slot.scrollIntoViewIfNeeded()
    const box = (await slot.boundingBox())!
    const monday = (await page.locator('th.fc-col-header-cell[data-date="2027-10-18"]').boundingBox())!
    await page.mouse.click(monday.x + monday.width / 2, box.y + box.height / 2)
    await page.getByTestId('shift-form').waitFor()
    await page.locator('#shift-title').fill('Snow stake survey')
    await page.getByRole('group', { name: 'People to assign' }).getByText('Runa Rotation').click()
    await page.getByTestId('shift-repeat').click()

    const panel = page.getByTestId('rotation-repeat')
    await panel.waitFor()
    await page.locator('#rotation-to').fill('2027-11-28')
    await page.locator('#rotation-start').fill('10:00')
    await page.locator('#rotation-end').fill('14:00')
    const summary = page.getByTestId('rotation-preview-summary')
    await expect.poll(async () => (await summary.textContent())?.replace(/\s+/g, ' '), { timeout: 10_000 }).toMatch(/^24 shifts; \d+ short of daylight/)
    const shownDays = await page.getByTestId('rotation-preview-day').count()
    expect(shownDays).toBe(24)
    await expect.poll(() => page.getByTestId('rotation-preview-day').filter({ hasText: 'short' }).count()).toBeGreaterThan(10)
    await keepScreenshot(page, 'rotation-preview-desk')
    await page.emulateMedia({ colorScheme: 'dark' })
    await panel.getByTestId('rotation-preview-days').scrollIntoViewIfNeeded()
    await keepScreenshot(page, 'rotation-preview-desk-dark')
    await page.emulateMedia({ colorScheme: 'light' })
    const previewText = (await summary.textContent())!.replace(/\s+/g, ' ')
    await page.getByTestId('rotation-save').click()
    await page.getByTestId('rotation-repeat').waitFor({ state: 'detached' })

    // the stored rotation: wall-clock 10:00–14:00 on every working day, light as the reference says
    const listed = (await coordinator.get(`/api/shifts?siteId=${siteId}&from=2027-10-18&to=2027-11-29`)).body as { id: number, rotationId: number, start: string, end: string, lightCheck: { minutesBelow: number, flagged: boolean }, reviewState: string }[]
    expect(listed).toHaveLength(24)
    const rotationId = listed[0]!.rotationId
    expect(listed.every(s => s.rotationId === rotationId)).toBe(true)
    for (const s of listed) {
      expect(intlWall(s.start)).toBe(`${s.start.slice(0, 10)} 10:00`)
      expect(intlWall(s.end)).toBe(`${s.start.slice(0, 10)} 14:00`)
      expect(Math.abs(s.lightCheck.minutesBelow - referenceMinutesBelowDaylight(Date.parse(s.start), Date.parse(s.end)))).toBeLessThanOrEqual(2)
    }
    const flagged = listed.filter(s => s.lightCheck.flagged)
    expect(previewText).toContain(`${flagged.length} short of daylight`)
    // into polar night: the last shifts have no daylight at all
    expect(listed.at(-1)!.lightCheck.minutesBelow).toBe(240)

    // safety: one card for the rotation, one decision for all its waiting shifts
    const safetyPage = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await matchServerClock(safetyPage, server)
    await signInThroughPage(safetyPage, server.url, 'safety@gloamline.test')
    await safetyPage.goto(`${server.url}/review?siteId=${siteId}`)
    const card = safetyPage.locator(`[data-testid="queue-rotation"][data-rotation-id="${rotationId}"]`)
    await card.waitFor()
    expect(await safetyPage.getByTestId('queue-item').count()).toBe(0)
    const dayMinutes = await card.getByTestId('rotation-day').evaluateAll(els => els.length)
    expect(dayMinutes).toBeGreaterThan(0)
    await keepScreenshot(safetyPage, 'rotation-review-desk')
    const phone = await browser.newContext({ viewport: { width: 390, height: 844 }, colorScheme: 'dark' })
    const phonePage = await phone.newPage()
    await matchServerClock(phonePage, server)
    await signInThroughPage(phonePage, server.url, 'safety@gloamline.test')
    await phonePage.goto(`${server.url}/review?siteId=${siteId}`)
    await phonePage.getByTestId('queue-rotation').waitFor()
    await keepScreenshot(phonePage, 'rotation-review-phone-dark')
    await phone.close()
    await card.getByTestId('rotation-decide').click()
    await card.getByRole('radio', { name: /^Approve/ }).check()
    await card.getByRole('checkbox').first().check()
    await card.getByRole('button', { name: 'Record decision' }).click()
    await card.waitFor({ state: 'detached' })
    const decided = (await coordinator.get(`/api/rotations/${rotationId}`)).body.shifts as { id: number, start: string, reviewState: string }[]
    expect(decided.filter(s => s.reviewState === 'approved').length).toBe(flagged.length)
    expect(decided.filter(s => s.reviewState === 'pending')).toHaveLength(0)

    // one shift moves an hour earlier: it alone waits again, as a single item
    const last = decided.at(-1)!
    const moved = await coordinator.patch(`/api/shifts/${last.id}`, { start: last.start.replace('T10:00', 'T09:00') })
    expect(moved.status).toBe(200)
    await safetyPage.reload()
    await safetyPage.getByTestId('queue-item').first().waitFor()
    expect(await safetyPage.getByTestId('queue-rotation').count()).toBe(0)
    expect(await safetyPage.getByTestId('queue-item').evaluateAll(els => els.map(e => Number(e.getAttribute('data-shift-id'))))).toEqual([last.id])
    // the season at a glance: the week roster (one person on site on each working day) and the year chart
    await page.goto(`${server.url}/roster?site=${siteId}&week=2027-11-01`)
    const onSite = await page.getByTestId('roster-on-site').locator('td').allTextContents()
    expect(onSite.map(t => t.trim())).toEqual(['1', '1', '1', '1', '0', '0', '0'])
    await keepScreenshot(page, 'rotation-roster-desk')
    await page.emulateMedia({ media: 'print' })
    await keepScreenshot(page, 'rotation-roster-print')
    await page.emulateMedia({ media: 'screen' })
    await page.goto(`${server.url}/sites/${siteId}`)
    await expect.poll(async () => (await page.getByTestId('year-work-summary').textContent().catch(() => ''))?.replace(/\s+/g, ' ') ?? '', { timeout: 15_000 })
      .toContain(`1 rotation planned: 24 shifts, ${flagged.length} short of the light they need`)
    await page.getByTestId('year-chart').scrollIntoViewIfNeeded()
    await keepScreenshot(page, 'rotation-year-chart-desk')
    await page.getByTestId('year-chart').screenshot({ path: `${ARTEFACTS_DIR}/year-chart-desk.png` })
    await page.getByTestId('horizon-chart').scrollIntoViewIfNeeded()
    await page.getByTestId('horizon-chart').screenshot({ path: `${ARTEFACTS_DIR}/horizon-chart-desk.png` })
    await page.close()
    await safetyPage.close()
  }, 90_000)
})
