// The plan calendar in headless Chromium: the coordinator sees the dark bands and a flagged shift,
// drags it into daylight and sees it cleared; a stale drag is rolled back with the server's message;
// crew see the same week read-only. What "daylight" means at the site is checked against
// astronomy-engine 2.1.19 (geometric altitude of the sun's centre, no refraction, as docs/light-model.md).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Body, Equator, Horizon, Observer } from 'astronomy-engine'
import type { Browser, Page } from 'playwright-core'
import { signedInClient, startAppServer, type ApiClient, type AppServer } from '../support/app-server'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

// USNO: sunrise/sunset when the centre of the disc is 0.833° below the horizon (docs/light-model.md)
const SUNRISE_ALTITUDE = -0.833
// a fixed week in March 2027, when every band from night to daylight occurs at 78°N
const WEEK = '2027-03-01'

let server: AppServer
let browser: Browser
let coordinator: ApiClient
let site: { id: number, name: string, latitude: number, longitude: number, timezone: string }

function referenceAltitude(ms: number) {
  const observer = new Observer(site.latitude, site.longitude, 0)
  const sky = Equator(Body.Sun, new Date(ms), observer, true, true)
  return Horizon(new Date(ms), observer, sky.ra, sky.dec).altitude
}

/** Minutes of [startMs, endMs) with the sun below sunrise altitude, by astronomy-engine at 1-minute steps. */
function referenceMinutesBelowDaylight(startMs: number, endMs: number) {
  let below = 0
  for (let t = startMs; t < endMs; t += 60_000) if (referenceAltitude(t + 30_000) < SUNRISE_ALTITUDE) below++
  return below
}

async function createShift(title: string, start: string, end: string, assigneeIds: number[] = []) {
  const reply = await coordinator.post('/api/shifts', { siteId: site.id, title, start, end, light: 'daylight', assigneeIds })
  expect(reply.status).toBe(201)
  return reply.body as { id: number, version: number, lightCheck: { minutesBelow: number, flagged: boolean } }
}

async function openWeek(page: Page, email: string) {
  await signInThroughPage(page, server.url, email)
  await page.goto(`${server.url}/plan?site=${site.id}&date=${WEEK}&view=week`)
  await page.getByTestId('plan-calendar').waitFor()
  await page.waitForLoadState('networkidle')
}

/** Drags a shift chip so that its start moves from one hour row to another, with real mouse events. */
async function dragChip(page: Page, shiftId: number, fromHour: string, toHour: string) {
  const chip = page.locator(`[data-testid="shift-chip"][data-shift-id="${shiftId}"]`)
  await page.locator(`td.fc-timegrid-slot-lane[data-time="13:00:00"]`).scrollIntoViewIfNeeded()
  const box = (await chip.boundingBox())!
  const from = (await page.locator(`td.fc-timegrid-slot-lane[data-time="${fromHour}:00:00"]`).boundingBox())!
  const to = (await page.locator(`td.fc-timegrid-slot-lane[data-time="${toHour}:00:00"]`).boundingBox())!
  const x = box.x + box.width / 2
  const y = box.y + 6
  await page.mouse.move(x, y)
  await page.mouse.down()
  await page.mouse.move(x, y + 12, { steps: 4 })
  await page.mouse.move(x, y + (to.y - from.y), { steps: 12 })
  await page.mouse.up()
}

beforeAll(async () => {
  server = await startAppServer()
  browser = await launchBrowser()
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  const sites = (await coordinator.get('/api/sites')).body as typeof site[]
  // the demo scenario's high-arctic camp (invented site at real coordinates, 78.2°N)
  site = sites.find(s => s.name === 'Kvitfjell Ice Camp')!
  expect(site.latitude).toBeGreaterThan(78)
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

describe('planning on the calendar in the browser', () => {
  it('shows the dark bands and a flagged shift, and clears it when dragged into daylight', async () => {
    // 17:00–20:00 on 2 March is after sunset at 78.2°N and 10:00–13:00 is in full daylight, by the
    // reference: so the first is flagged for its whole length and the second not at all
    const evening = await createShift('Glacier front survey', '2027-03-02T17:00', '2027-03-02T20:00')
    const eveningMs = [Date.parse('2027-03-02T16:00:00Z'), Date.parse('2027-03-02T19:00:00Z')] as const
    expect(referenceMinutesBelowDaylight(...eveningMs)).toBe(180)
    expect(referenceMinutesBelowDaylight(Date.parse('2027-03-02T09:00:00Z'), Date.parse('2027-03-02T12:30:00Z'))).toBe(0)
    expect(evening.lightCheck.flagged).toBe(true)
    expect(Math.abs(evening.lightCheck.minutesBelow - 180)).toBeLessThanOrEqual(1)

    const page = await browser.newPage({ viewport: { width: 1400, height: 1300 } })
    await matchServerClock(page, server)
    await openWeek(page, 'coordinator@gloamline.test')
    expect(await page.getByTestId('calendar-zone').textContent()).toContain(site.timezone)
    const chip = page.locator(`[data-testid="shift-chip"][data-shift-id="${evening.id}"]`)
    await chip.waitFor()
    expect(await chip.getByTestId('light-marker').getAttribute('data-light-state')).toBe('flagged')
    // the state word (shared/review.ts) and the reason with its figure
    expect(await chip.textContent()).toContain('Awaiting review: below its light')
    expect(await chip.getByTestId('review-reasons').textContent()).toContain('3 h below daylight')
    // the dark of the night behind the shifts, as hatched bands with words on them
    expect(await page.locator('.fc-bg-event.gl-band-night').count()).toBeGreaterThan(0)
    expect(await page.locator('.fc-bg-event.gl-band-astronomical').count()).toBeGreaterThan(0)
    expect(await page.locator('[data-band-label="night"]').first().textContent()).toContain('Night')
    expect(await page.locator('[data-band-label="day"]').first().textContent()).toContain('Daylight')
    await page.evaluate(() => window.scrollTo(0, 0))
    await keepScreenshot(page, 'plan-week-flagged')

    const saved = page.waitForResponse(r => r.url().endsWith(`/api/shifts/${evening.id}`) && r.request().method() === 'PATCH')
    await dragChip(page, evening.id, '17', '10')
    expect((await saved).status()).toBe(200)
    await expect.poll(() => chip.getByTestId('light-marker').getAttribute('data-light-state')).toBe('clear')
    await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Clear')

    const moved = (await coordinator.get(`/api/shifts/${evening.id}`)).body
    expect(moved.lightCheck).toMatchObject({ requirement: 'daylight', minutesBelow: 0, flagged: false })
    expect(moved.reviewState).toBe('not-needed')
    expect(moved.start.slice(0, 13)).toBe('2027-03-02T10')
    expect(Date.parse(moved.end) - Date.parse(moved.start)).toBe(3 * 3_600_000)
    await page.evaluate(() => window.scrollTo(0, 0))
    await keepScreenshot(page, 'plan-week-cleared')
    await page.close()
  })

  it('rolls a drag back and shows the server\'s message when the shift changed meanwhile', async () => {
    const shift = await createShift('Tide gauge check', '2027-03-04T17:00', '2027-03-04T19:00')
    const page = await browser.newPage({ viewport: { width: 1400, height: 1300 } })
    await matchServerClock(page, server)
    await openWeek(page, 'coordinator@gloamline.test')
    const chip = page.locator(`[data-testid="shift-chip"][data-shift-id="${shift.id}"]`)
    await chip.waitFor()
    // another coordinator renames it: the copy in this page is now stale
    expect((await coordinator.patch(`/api/shifts/${shift.id}`, { title: 'Tide gauge check (renamed)', version: shift.version })).status).toBe(200)

    const refused = page.waitForResponse(r => r.url().endsWith(`/api/shifts/${shift.id}`) && r.request().method() === 'PATCH')
    await dragChip(page, shift.id, '17', '11')
    expect((await refused).status()).toBe(409)
    await expect.poll(() => page.getByRole('alert').first().textContent()).toContain('changed by someone else')
    await expect.poll(() => chip.textContent()).toContain('17:00–19:00')
    expect((await coordinator.get(`/api/shifts/${shift.id}`)).body.start.slice(0, 16)).toBe('2027-03-04T17:00')
    await page.close()
  })

  it('shows crew their shifts in the same week read-only, in the dark theme', async () => {
    // crew see only their own shifts: put the demo crew member on one
    const people = (await coordinator.get('/api/people')).body as { id: number, email: string }[]
    const crewId = people.find(p => p.email === 'crew@gloamline.test')!.id
    const own = await createShift('Weather mast service', '2027-03-05T10:00', '2027-03-05T13:00', [crewId])
    const page = await browser.newPage({ viewport: { width: 1400, height: 1300 }, colorScheme: 'dark' })
    await matchServerClock(page, server)
    await openWeek(page, 'crew@gloamline.test')
    await page.locator(`[data-testid="shift-chip"][data-shift-id="${own.id}"]`).waitFor()
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true)
    // FullCalendar marks movable events with fc-event-draggable; none may be movable for crew
    expect(await page.locator('.fc-event-draggable').count()).toBe(0)
    expect(await page.locator('.fc-event').count()).toBeGreaterThan(0)
    await page.locator(`[data-testid="shift-chip"][data-shift-id="${own.id}"]`).click()
    await page.getByTestId('shift-summary').waitFor()
    expect(await page.getByTestId('shift-form').count()).toBe(0)
    await keepScreenshot(page, 'plan-week-crew-dark')
    await page.close()
  })
})
