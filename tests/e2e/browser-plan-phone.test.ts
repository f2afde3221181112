// The plan in headless Chromium. On a 390 × 844 phone a crew member's plan is a list of days that
// opens on the sites of their own shifts. On a desk screen, switching sites on the coordinator's
// calendar redraws the light lanes and the "today" column for the new site without a reload.
// The server's clock starts on Saturday 9 January 2027, 19:30 UTC (TEST_CLOCK.southernSummerSunday):
// 20:30 on Saturday in Arctic/Longyearbyen, already 08:30 on Sunday in Antarctica/McMurdo (tz data).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK, zonedDateOf } from '../support/clock'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

let server: AppServer
let browser: Browser
let sites: { id: number, name: string, timezone: string }[]

beforeAll(async () => {
  server = await startAppServer({ clockStart: TEST_CLOCK.southernSummerSunday, env: { REMINDER_TIMER: 'off' } })
  browser = await launchBrowser()
  sites = (await (await signedInClient(server, 'coordinator@gloamline.test')).get('/api/sites')).body
}, 60_000)

afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

async function open(email: string, viewport: { width: number, height: number }, theme: 'light' | 'dark' = 'light'): Promise<Page> {
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1, colorScheme: theme })
  const page = await context.newPage()
  await matchServerClock(page, server)
  await signInThroughPage(page, server.url, email)
  return page
}

describe('the crew\'s plan on a phone', () => {
  it('is a list of days with their own shifts first, opening on the sites where they work', async () => {
    const crew = await signedInClient(server, 'crew@gloamline.test')
    const now = server.clock.now()
    const own = (await crew.get(`/api/shifts?from=${new Date(now).toISOString()}&to=${new Date(now + 14 * 86_400_000).toISOString()}`)).body as { siteId: number, id: number }[]
    expect(own.length, 'the demo crew account has shifts in the next two weeks').toBeGreaterThan(0)
    const page = await open('crew@gloamline.test', { width: 390, height: 844 }, 'dark')
    await page.goto(`${server.url}/plan`)
    const agenda = page.getByTestId('crew-plan-agenda')
    await agenda.waitFor()
    expect(await page.getByTestId('plan-calendar').count()).toBe(0)
    const chosen = await page.locator('label:has(input[type=checkbox]:checked)').allTextContents()
    const expected = [...new Set(own.map(s => s.siteId))].map(id => sites.find(s => s.id === id)!.name)
    for (const name of expected) expect(chosen.join(' | ')).toContain(name)
    expect(chosen).toHaveLength(expected.length)
    // seven days, one under the other, each naming the light at the chosen sites with the moon
    expect(await agenda.locator(':scope > li').count()).toBe(7)
    await expect.poll(() => agenda.locator(':scope > li').first().textContent()).toMatch(/[Mm]oon (up|below)/)
    // nothing wider than the phone
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
    await page.screenshot({ path: `${process.cwd()}/test-results/screenshots/crew-plan-phone-dark-first-screen.png` })
    await keepScreenshot(page, 'crew-plan-phone-dark')
    await page.context().close()
  }, 60_000)
})

describe('switching sites on the coordinator\'s calendar', () => {
  it('redraws the light lanes and the today column for the sites now chosen, without a reload', async () => {
    const north = sites.find(s => s.timezone === 'Arctic/Longyearbyen')!
    const south = sites.find(s => s.timezone === 'Antarctica/McMurdo')!
    const page = await open('coordinator@gloamline.test', { width: 1280, height: 800 })
    await page.goto(`${server.url}/plan?site=${north.id}&view=week`)
    await page.getByTestId('plan-calendar').locator('.fc-bg-event').first().waitFor()
    const today = (zone: string) => zonedDateOf(server.clock.now(), zone)
    expect(today('Arctic/Longyearbyen')).not.toBe(today('Antarctica/McMurdo'))
    expect(await page.locator('.fc-col-header-cell.fc-day-today').getAttribute('data-date')).toBe(today('Arctic/Longyearbyen'))

    await page.getByRole('checkbox', { name: south.name }).check()
    await expect.poll(() => page.locator('.fc-bg-event[style*="left: 50%"]').count()).toBeGreaterThan(0)
    await page.getByRole('checkbox', { name: north.name }).uncheck()
    await expect.poll(() => page.getByTestId('calendar-zone').textContent()).toContain('Antarctica/McMurdo')
    // one site left: every band spans its whole day column again (the narrowest band's share of its column)
    const narrowest = () => page.locator('.fc-timegrid-col:not(.fc-timegrid-axis)').first().evaluate((col) => {
      const columnWidth = col.getBoundingClientRect().width
      const shares = [...col.querySelectorAll('.fc-bg-event')].map(el => el.getBoundingClientRect().width / columnWidth)
      return shares.length ? Math.min(...shares) : 0
    })
    await expect.poll(narrowest, { timeout: 15_000 }).toBeGreaterThan(0.9)
    expect(await page.locator('.fc-col-header-cell.fc-day-today').getAttribute('data-date')).toBe(today('Antarctica/McMurdo'))
    await page.context().close()
  }, 60_000)
})
