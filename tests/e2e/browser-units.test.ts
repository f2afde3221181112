// An imperial person sees cold, wind and distance in °F, mph and ft on a phone. Conversions by the
// exact factors (1959 international yard and pound agreement): 812 m = 2664.04 ft.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { keepScreenshot, launchBrowser, matchServerClock } from '../support/browser'
import { DEMO_PASSWORD } from '../support/app-server'
import { createDarkShift, createDarkSite, findPeopleIds, startSafetyWorld, type SafetyWorld } from '../support/safety-fixtures'

let world: SafetyWorld
let browser: Browser
let shiftId: number
let elevatedId: number

async function signInInPage(page: import('playwright-core').Page, email: string) {
  // through the API in the page's own context (the sign-in page has its own browser test)
  const reply = await page.request.post(`${world.server.url}/api/auth/login`, { data: { email, password: DEMO_PASSWORD }, headers: { origin: world.server.url } })
  expect(reply.status()).toBeLessThan(300)
}

beforeAll(async () => {
  world = await startSafetyWorld()
  browser = await launchBrowser()
  const site = await createDarkSite(world.coordinator, 'Invented Tallow Fell')
  const elevated = await world.coordinator.post('/api/sites', { name: 'Invented Cairn Shoulder', latitude: 61, longitude: 1, timezone: 'UTC', elevation: 812 })
  expect(elevated.status).toBe(201)
  elevatedId = elevated.body.id
  const { crew } = await findPeopleIds(world.coordinator)
  shiftId = (await createDarkShift(world.coordinator, site.id, { daysAhead: 1, assigneeIds: crew.slice(0, 1), title: 'Fell mast survey' })).id
  await world.safety.post(`/api/sites/${site.id}/forecast/refresh`)
  const holds = await world.safety.patch('/api/settings/holds', { levels: [{ name: 'Invented Amber Watch', windKmh: 45, windChillC: -40, visibilityM: 200, advice: 'Stay within sight of camp.' }] })
  expect(holds.status).toBe(200)
  const prefs = await world.safety.patch('/api/me/preferences', { units: 'imperial' })
  expect(prefs.status).toBe(200)
})
afterAll(async () => {
  await browser?.close()
  await world?.stop()
})

describe('figures in an imperial person\'s units on a phone', () => {
  it('enters a site reading in °F and mph by default, and lists elevation in feet', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await matchServerClock(page, world.server)
    await signInInPage(page, 'safety@gloamline.test')
    await page.goto(`${world.server.url}/review/${shiftId}`)
    await page.getByRole('button', { name: 'Enter site readings' }).click()
    const form = page.getByTestId('reading-form')
    await form.waitFor()
    await expect.poll(() => form.locator('#reading-units').inputValue()).toBe('imperial')
    expect(await form.locator('label[for="reading-temperature"]').textContent()).toContain('°F')
    expect(await form.locator('label[for="reading-wind"]').textContent()).toContain('mph')

    await form.locator('#reading-temperature').fill('-4')
    await form.locator('#reading-wind').fill('25')
    await form.getByRole('button', { name: 'Add this reading' }).click()
    await expect.poll(() => form.getByRole('status').textContent()).toContain('1 reading stored.')
    await keepScreenshot(page, 'units-reading-form-phone')

    await page.goto(`${world.server.url}/sites`)
    const table = page.getByTestId('site-table')
    await table.waitFor()
    await expect.poll(() => table.textContent()).toContain('2664 ft elevation')
    expect(await table.textContent()).not.toContain('812 m')
    await keepScreenshot(page, 'units-sites-phone')

    // hold levels stay metric as stored; each figure's imperial equivalent shows under its field
    await page.goto(`${world.server.url}/field`)
    await page.getByTestId('holds-settings').locator('summary').click()
    await page.getByTestId('holds-form').waitFor()
    await expect.poll(() => page.getByTestId('hold-figure-imperial').allTextContents()).toEqual(['≈ 28 mph', '≈ −40 °F', '≈ 656 ft'])
    await keepScreenshot(page, 'units-holds-phone')
    await page.close()
  })

  it('edits a site\'s elevation in feet and stores metres (1000 ft = 304.8 m), and shows the review cold limit in °F', async () => {
    expect((await world.coordinator.patch('/api/me/preferences', { units: 'imperial' })).status).toBe(200)
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await matchServerClock(page, world.server)
    await signInInPage(page, 'coordinator@gloamline.test')
    await page.goto(`${world.server.url}/sites/${elevatedId}/edit`)
    const field = page.locator('#site-elevation')
    await field.waitFor()
    await expect.poll(() => field.inputValue()).toBe('2664')
    expect(await page.locator('label[for="site-elevation"]').textContent()).toContain('feet')
    await keepScreenshot(page, 'units-site-edit-phone')

    // left as shown, the stored metres do not drift through rounding
    await page.getByRole('button', { name: 'Save the site' }).click()
    await page.waitForURL(/\/sites$/)
    expect((await world.coordinator.get(`/api/sites/${elevatedId}`)).body.elevation).toBe(812)

    await page.goto(`${world.server.url}/sites/${elevatedId}/edit`)
    await field.waitFor()
    await expect.poll(() => field.inputValue()).toBe('2664')
    await field.fill('1000')
    await page.getByRole('button', { name: 'Save the site' }).click()
    await page.waitForURL(/\/sites$/)
    expect((await world.coordinator.get(`/api/sites/${elevatedId}`)).body.elevation).toBeCloseTo(304.8, 9)

    // the review cold limit stays in °C as stored; −27 °C = −16.6 °F
    const limitC = (await world.coordinator.get('/api/settings/work-rules')).body.reviewWindChillC
    expect(limitC).toBe(-27)
    await page.goto(`${world.server.url}/settings`)
    await expect.poll(() => page.getByTestId('rules-cold-limit-imperial').textContent()).toContain('≈ −17 °F')
    await page.close()
  })
})
