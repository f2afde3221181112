import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { startFakeForecastServer } from '../../scripts/fake-forecast.mjs'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'
import { runningClock, TEST_CLOCK } from '../support/clock'

// The daily briefing with a stored forecast: the local fake forecast server (scripts/fake-forecast.mjs,
// invented but deterministic figures) stands in for the forecast service, so no test reaches the network.
// The cold figures themselves are checked against the NWS/ECCC/ACGIH tables in tests/unit.

let server: AppServer
let fake: Awaited<ReturnType<typeof startFakeForecastServer>>
let browser: Browser
let siteId: number

beforeAll(async () => {
  // the forecast fake and the server share one test clock, so the forecast covers the briefing's day
  const clockStart = TEST_CLOCK.weekdayMorning
  fake = await startFakeForecastServer({ port: 0, now: runningClock(clockStart) })
  server = await startAppServer({ clockStart, env: { FORECAST_BASE_URL: fake.url, FORECAST_TIMEOUT_MS: '2000' } })
  browser = await launchBrowser()
  const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
  siteId = (await coordinator.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Ravnvik Pipeline Yard').id
  const refreshed = await coordinator.post(`/api/sites/${siteId}/forecast/refresh`)
  expect(refreshed.status).toBeLessThan(300)
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
  await fake?.close()
})

describe('the daily briefing with a forecast', () => {
  it('shows the forecast hours, the coldest case with wind chill and the work/warm-up line, and the cold cautions', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await matchServerClock(page, server)
    await signInThroughPage(page, server.url, 'coordinator@gloamline.test')
    await page.goto(`${server.url}/sites/${siteId}/briefing`)
    // wait for what is checked, not for an idle network (the offline bar's /health probe can stay open)
    const forecast = page.locator('section[aria-labelledby="brief-forecast"]')
    await forecast.locator('thead th').first().waitFor()
    await page.locator('section[aria-labelledby="brief-cautions"]').waitFor()
    expect(await page.getByTestId('no-forecast').count()).toBe(0)
    // every third hour of the local day, as columns
    expect(await forecast.locator('thead th').count()).toBe(1 + 8)
    const text = await forecast.textContent()
    expect(text).toContain('Forecast from')
    expect(text).toContain('Wind chill')
    expect(text).toContain('Work/warm-up schedule')
    expect(await page.locator('section[aria-labelledby="brief-cautions"]').textContent()).toContain('Cold')
    await keepScreenshot(page, 'outlook-briefing-forecast')
    // printed (Chromium's own PDF), the briefing fits on one A4 page
    await page.emulateMedia({ media: 'print' })
    const pdf = (await page.pdf({ format: 'A4', printBackground: true })).toString('latin1')
    expect(pdf.match(/\/Type\s*\/Page[^s]/g)?.length).toBe(1)
    await page.close()
  })
})
