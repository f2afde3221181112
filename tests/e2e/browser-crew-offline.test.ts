// The crew member's phone with no connection, in headless Chromium at 390 × 844 in the dark theme:
// after one visit with a connection the service worker and the saved copy reopen the crew home
// offline, with the next shift first, tomorrow's light, their shifts and the moon, stamped "as of"
// and with the offline notice; signing out clears what the phone kept. The server's clock starts in
// polar night at the Svalbard demo site (TEST_CLOCK.weekdayMorning); a service worker runs on
// 127.0.0.1 without HTTPS. Screenshots are kept under test-results/screenshots.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK } from '../support/clock'
import { ARTEFACTS_DIR, keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

const PHONE = { width: 390, height: 844 }
const CREW = 'crew@gloamline.test'
let server: AppServer
let browser: Browser
let context: BrowserContext
let page: Page
let expected: any

beforeAll(async () => {
  server = await startAppServer({ clockStart: TEST_CLOCK.weekdayMorning, env: { REMINDER_TIMER: 'off' } })
  browser = await launchBrowser()
  const api = await signedInClient(server, CREW)
  expected = (await api.get('/api/me/today')).body
  context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 1, colorScheme: 'dark' })
  page = await context.newPage()
  await matchServerClock(page, server)
  await signInThroughPage(page, server.url, CREW)
  await page.getByTestId('crew-next').waitFor()
  // the service worker has installed (the app's files are cached) and the page has stored the home page
  await page.evaluate(() => navigator.serviceWorker.ready)
  await page.waitForFunction(async () => Boolean(await (await caches.open('gloamline-own-pages')).match('/')), undefined, { timeout: 15_000, polling: 200 })
}, 60_000)

afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

async function reopenOffline(): Promise<Page> {
  await context.setOffline(true)
  const reopened = await context.newPage()
  await matchServerClock(reopened, server)
  await reopened.goto(`${server.url}/`)
  await reopened.getByTestId('crew-offline').waitFor({ timeout: 15_000 })
  return reopened
}

// What the reopened offline page must show, against the reply the server gave while online.
async function checkOfflineHome(offline: Page) {
  await keepScreenshot(offline, 'crew-offline-phone-dark')
  await offline.screenshot({ path: `${ARTEFACTS_DIR}/crew-offline-phone-dark-first-screen.png` })
  const notice = (await offline.getByTestId('crew-offline').textContent())!.replace(/\s+/g, ' ')
  expect(notice).toContain('No connection')
  expect(notice).toMatch(/as of \w{3} \d{1,2} \w{3} \d{2}:\d{2} UTC/)

  const next = offline.getByTestId('crew-next')
  expect(await next.textContent()).toContain(expected.next.shift.title)
  expect(await next.textContent()).toContain(expected.next.shift.timeText)
  // the next shift is the first thing after the notice: its top is within the first screen
  const box = await next.boundingBox()
  expect(box!.y).toBeLessThan(PHONE.height / 2)

  for (const site of expected.sites) {
    const tomorrow = site.days.find((d: any) => d.which === 'tomorrow')
    const panel = offline.getByTestId(`crew-site-${site.id}`).getByTestId('crew-day-tomorrow')
    expect(await panel.locator('h3').textContent()).toContain(tomorrow.dateLabel)
    expect(await panel.getByTestId('crew-moon').textContent()).toContain(tomorrow.moon.words)
    expect(await panel.locator('[data-layer="moon"]').count()).toBe(tomorrow.moon.up.length)
    const shown = await panel.locator('[data-testid^="crew-shift-"]').evaluateAll(els => els.map(e => e.getAttribute('data-testid')))
    expect(shown).toEqual(tomorrow.shifts.map((s: any) => `crew-shift-${s.id}`))
  }
  await offline.getByTestId('crew-day-tomorrow').first().scrollIntoViewIfNeeded()
  await offline.screenshot({ path: `${ARTEFACTS_DIR}/crew-offline-phone-dark-tomorrow.png` })
  await offline.getByTestId('crew-next').getByTestId('crew-moon').scrollIntoViewIfNeeded()
  await offline.screenshot({ path: `${ARTEFACTS_DIR}/crew-offline-phone-dark-next-light.png` })
  // the moon's words follow the contract's form, e.g. "Moon up 14:10–02:30, 92 % lit"
  expect(await offline.getByTestId('crew-moon').first().textContent()).toMatch(/Moon (up .+|below the horizon all day), \d{1,3} % lit/)
  // cautions once for the screen, not inside each shift
  expect(await offline.locator('[data-testid^="crew-shift-"] aside[role="note"]').count()).toBe(0)
  // what needs the server says so
  expect(await offline.getByRole('link', { name: /Reminders and calendar/ }).textContent()).toContain('Needs a connection')
  expect(await offline.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true)
  expect(await offline.getByTestId('offline-bar').count()).toBe(0)
  // any other page says it needs the server rather than showing an empty answer as if it were true
  await offline.getByRole('link', { name: 'Plan', exact: true }).click()
  await offline.waitForURL(url => url.pathname === '/plan')
  expect(await offline.getByTestId('offline-bar').textContent()).toContain('this page needs the server')
  await offline.screenshot({ path: `${ARTEFACTS_DIR}/crew-offline-phone-dark-plan.png` })
}

describe('the crew home with no connection', () => {
  it('reopens offline after one visit, leading with the next shift, tomorrow\'s light, the shifts and the moon', async () => {
    expect(expected.next).not.toBeNull()
    const offline = await reopenOffline()
    try {
      await checkOfflineHome(offline)
    } finally {
      await offline.close()
      await context.setOffline(false)
    }
  }, 60_000)

  it('reads at desk size in the light theme too, with the next shift first and the moon in words', async () => {
    const desk = await browser.newContext({ viewport: { width: 1280, height: 800 }, deviceScaleFactor: 1, colorScheme: 'light' })
    const deskPage = await desk.newPage()
    await matchServerClock(deskPage, server)
    await signInThroughPage(deskPage, server.url, CREW)
    const next = deskPage.getByTestId('crew-next')
    await next.waitFor()
    expect(await next.getByTestId('crew-moon').textContent()).toContain(expected.next.day.moon.words)
    expect(await deskPage.getByTestId('crew-as-of').textContent()).toMatch(/^\s*As of \w{3} \d{1,2} \w{3} \d{2}:\d{2} UTC/)
    expect(await deskPage.getByTestId('offline-bar').count()).toBe(0)
    await keepScreenshot(deskPage, 'crew-home-desk-light')
    await desk.close()
  }, 60_000)

  it('keeps only the signed-in person\'s own copy, and signing out deletes it and the stored page', async () => {
    const saved = await page.evaluate(() => Object.keys(localStorage).filter(k => k.startsWith('gloamline-own:')).map(k => JSON.parse(localStorage.getItem(k)!)))
    expect(saved).toHaveLength(1)
    expect(saved[0].personId).toBe(expected.person.id)
    expect(saved[0].data.person.id).toBe(expected.person.id)
    await page.reload()
    await page.getByTestId('crew-next').waitFor()
    await page.getByRole('button', { name: /sign out/i }).click()
    await page.waitForURL(url => url.pathname.startsWith('/login'), { waitUntil: 'commit' })
    expect(await page.evaluate(() => Object.keys(localStorage).filter(k => k.startsWith('gloamline-own:')).length)).toBe(0)
    expect(await page.evaluate(() => caches.has('gloamline-own-pages'))).toBe(false)
  }, 60_000)
})
