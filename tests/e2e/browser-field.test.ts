// The field day in headless Chromium on a phone (390 × 844): a crew member working alone checks out
// with one tap; when they are not back, safety gets the alert by SMTP (the local sink) and the field
// board shows them overdue in the strongest style; a check-in from the phone clears it. Time moves by
// restarting the server with its test clock later (same database, same port) and moving the page's
// clock with it. Screenshots are kept under test-results/screenshots.
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'
import { ARTEFACTS_DIR, keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

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
    const buttons = crew.getByTestId(`field-buttons-${id}`).first()
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

describe('a weather hold on a crew member\'s phone, in their own units', () => {
  it('shows the operator\'s level, the figure in °F for an imperial reader, the advice and the deference line', async () => {
    const server = await startAppServer({ env: { ...ENV, FIELD_ALERT_TIMER: 'off' }, clockStart: iso(T0) })
    servers.push(server)
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const people = (await coordinator.get('/api/people')).body as { id: number, email: string }[]
    const site = ((await coordinator.get('/api/sites')).body as { id: number }[])[0]!
    const crewId = people.find(p => p.email === 'crew@gloamline.test')!.id
    const levels = [{ name: 'Stay close', windChillC: -30, advice: 'Keep within 1 km of the hut; radio every 30 minutes.' }]
    expect((await coordinator.patch('/api/settings/holds', { levels })).status).toBe(200)
    const shift = await coordinator.post('/api/shifts', { siteId: site.id, title: 'Snow pit profile', start: iso(T0 + 60 * MIN), end: iso(T0 + 150 * MIN), light: 'any', assigneeIds: [crewId], travelMinutes: 20 })
    const id = shift.body.id as number
    // a reading relayed from the field for the hour on site: −25 °C in 30 km/h, wind chill −39 °C (ECCC chart, memory; the 2001 formula gives −39.1)
    expect((await coordinator.post(`/api/sites/${site.id}/observations`, { at: iso(T0 + 90 * MIN), temperature: -25, wind: 30, units: 'metric' })).status).toBe(201)
    const crewApi = await signedInClient(server, 'crew@gloamline.test')
    expect((await crewApi.patch('/api/me/preferences', { units: 'imperial' })).body.units).toBe('imperial')

    const crew = await phonePage(server, 'crew@gloamline.test')
    // the shift shows as the next shift and in today's list: the first card is enough
    const hold = crew.getByTestId(`field-buttons-${id}`).first().getByTestId('weather-hold')
    await hold.waitFor()
    const text = (await hold.textContent())!.replace(/\s+/g, ' ')
    expect(text).toContain('Weather hold: Stay close')
    // −39 °C is −38 °F (−38.2)
    expect(text).toContain('Wind chill −38 °F (this level: −22 °F or colder)')
    expect(text).toContain('Keep within 1 km of the hut')
    expect(text).toContain('your operator\'s')
    await keepScreenshot(crew, 'field-crew-hold-imperial-phone')
    await crew.getByTestId(`field-buttons-${id}`).first().screenshot({ path: resolve(ARTEFACTS_DIR, 'field-crew-hold-card.png') })
    await crew.context().close()

    const safety = await phonePage(server, 'safety@gloamline.test', 'dark')
    await safety.goto(`${server.url}/field`)
    await safety.getByTestId('holds-settings').locator('summary').click()
    await safety.getByTestId('hold-level-0').waitFor()
    expect(await safety.getByTestId('hold-level-0').locator('input').first().inputValue()).toBe('Stay close')
    await keepScreenshot(safety, 'field-holds-editor-phone-dark')
    await safety.context().close()
  }, 90_000)
})
