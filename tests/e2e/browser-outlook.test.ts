import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

// What a coordinator clicks on the outlook pages, in headless Chromium against the built server and
// the demo scenario (invented sites and people). Screenshots are kept in test-results/screenshots.

let server: AppServer
let browser: Browser
let sites: { id: number, name: string }[]
const idOf = (name: string) => sites.find(s => s.name === name)!.id

beforeAll(async () => {
  server = await startAppServer()
  browser = await launchBrowser()
  sites = (await (await signedInClient(server, 'coordinator@gloamline.test')).get('/api/sites')).body
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

// Server-rendered markup is visible before Vue takes it over: wait for the app and the network to settle.
async function openPage(page: Page, path: string) {
  await page.goto(`${server.url}${path}`)
  await page.waitForLoadState('networkidle')
  await page.waitForFunction(() => Boolean((document.querySelector('#__nuxt') as { __vue_app__?: unknown } | null)?.__vue_app__))
}

async function coordinatorPage(options: { dark?: boolean } = {}): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } })
  if (options.dark) await context.addCookies([{ name: 'gl-theme', value: 'dark', url: server.url }])
  const page = await context.newPage()
  await matchServerClock(page, server)
  await signInThroughPage(page, server.url, 'coordinator@gloamline.test')
  return page
}

describe('the site light page at 78° N', () => {
  it('shows the week, the season, the run-up and the year chart, and a tapped day\'s figures', async () => {
    const page = await coordinatorPage()
    await openPage(page, `/sites/${idOf('Kvitfjell Ice Camp')}?week=2027-01-11`)
    await page.getByTestId('year-chart').waitFor()
    expect(await page.getByTestId('week-strips').locator('li[data-date]').count()).toBe(7)
    expect(await page.getByTestId('season-summary').textContent()).toContain('Polar night')
    // tap a column in late June: the panel shows that day, and keeps it when the pointer leaves
    const chart = page.getByTestId('year-chart')
    await chart.scrollIntoViewIfNeeded()
    const box = (await chart.boundingBox())!
    // the chart's viewBox is 794 × 492 with one row per day from y = 30 to 468; 26 June is day 177 of 365
    await chart.click({ position: { x: box.width * (344 / 794), y: box.height * ((30 + (176.5 / 365) * 438) / 492) } })
    await page.mouse.move(box.x + 5, box.y - 40)
    const panel = await page.getByTestId('day-panel').textContent()
    expect(panel).toMatch(/Jun/)
    expect(panel).toContain('Midnight sun')
    expect(panel).toContain('Chosen day')
    await keepScreenshot(page, 'outlook-site-78n')
    // keyboard: the arrow keys move the chosen day
    await chart.focus()
    await page.keyboard.press('ArrowRight')
    expect(await page.getByTestId('day-panel').textContent()).not.toBe(panel)
    await page.context().close()
  })

  it('reads in the dark theme', async () => {
    const page = await coordinatorPage({ dark: true })
    await openPage(page, `/sites/${idOf('Kvitfjell Ice Camp')}?week=2027-01-11`)
    await page.getByTestId('year-chart').waitFor()
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true)
    await keepScreenshot(page, 'outlook-site-78n-dark')
    await page.context().close()
  })

  it('prints without the navigation and with the band colours', async () => {
    const page = await coordinatorPage()
    await openPage(page, `/sites/${idOf('Kvitfjell Ice Camp')}?week=2027-01-11`)
    await page.getByTestId('year-chart').waitFor()
    await page.emulateMedia({ media: 'print' })
    expect(await page.locator('header').first().isVisible()).toBe(false)
    expect(await page.getByTestId('week-picker').isVisible()).toBe(false)
    expect(await page.getByTestId('page-head').textContent()).toContain('Kvitfjell Ice Camp')
    const adjust = await page.getByTestId('year-chart').evaluate(el => getComputedStyle(el).printColorAdjust)
    expect(adjust).toBe('exact')
    await keepScreenshot(page, 'outlook-site-78n-print')
    await page.context().close()
  })
})

describe('the light board', () => {
  it('lists every site with today, tomorrow and the next change', async () => {
    const page = await coordinatorPage()
    await openPage(page, `/board`)
    await page.getByTestId('light-board').waitFor()
    expect(await page.locator('article[data-site]').count()).toBe(sites.length)
    expect(await page.getByTestId('board-next').first().textContent()).toMatch(/Next change/)
    await keepScreenshot(page, 'outlook-board')
    await page.context().close()
  })
})

describe('the slot finder', () => {
  it('proposes slots and plans one as a shift with one click', async () => {
    const page = await coordinatorPage()
    await openPage(page, `/slots?siteId=${idOf('Ravnvik Pipeline Yard')}`)
    await page.getByTestId('slot-form').waitFor()
    await page.getByLabel('Task', { exact: true }).fill('Valve inspection')
    await page.getByLabel('Hours').fill('1')
    await page.getByLabel('civil light').check()
    await page.getByLabel('Find a person by name').fill('Aputsiaq')
    await page.getByRole('checkbox', { name: /Aputsiaq/ }).check()
    await page.getByRole('button', { name: 'Find slots' }).click()
    await page.getByTestId('slot').first().waitFor()
    await keepScreenshot(page, 'outlook-slots')
    await page.getByRole('button', { name: 'Plan this shift' }).first().click()
    await page.getByText('Planned as “Valve inspection”').waitFor()
    expect(await page.getByRole('status').textContent()).toContain('Valve inspection')
    await page.context().close()
  })

  it('says why when nothing fits', async () => {
    const page = await coordinatorPage()
    await openPage(page, `/slots?siteId=${idOf('Kvitfjell Ice Camp')}`)
    await page.getByTestId('slot-form').waitFor()
    // next year's December at 78° N: the sun does not rise, so daylight work has no slot
    const y = new Date(server.clock.now()).getUTCFullYear() + 1
    await page.getByLabel('From (site\'s date)').fill(`${y}-12-10`)
    await page.getByLabel('To, including that day').fill(`${y}-12-20`)
    await page.getByLabel('daylight', { exact: true }).check()
    await page.getByRole('button', { name: /Whole Rime crew/ }).click()
    await page.getByRole('button', { name: 'Find slots' }).click()
    await page.getByTestId('slot-results').waitFor()
    const text = await page.getByTestId('slot-results').textContent()
    expect(text).toContain('No slot fits')
    expect(text).toContain('No usable light long enough')
    await page.context().close()
  })
})

describe('the daily briefing', () => {
  it('shows tomorrow\'s light, shifts and people, says "no forecast" honestly, and prints', async () => {
    const page = await coordinatorPage()
    await openPage(page, `/sites/${idOf('Ravnvik Pipeline Yard')}/briefing`)
    await page.getByTestId('briefing-page').waitFor()
    const text = await page.getByTestId('briefing-page').textContent()
    expect(text).toContain('Civil dawn')
    expect(text).toContain('Shifts')
    // the test server's forecast service is unreachable: the page must not invent one
    await page.getByTestId('no-forecast').waitFor()
    await keepScreenshot(page, 'outlook-briefing')
    await page.emulateMedia({ media: 'print' })
    expect(await page.getByRole('button', { name: 'Print or save as PDF' }).isVisible()).toBe(false)
    expect(await page.getByTestId('page-head').isVisible()).toBe(true)
    await keepScreenshot(page, 'outlook-briefing-print')
    await page.context().close()
  })
})
