// What a crew member sees in headless Chromium on a phone-sized screen (390 × 844): tomorrow's light
// window and shifts, in the light and the dark theme; and the coordinator's outbox. Screenshots are
// kept under test-results/screenshots for a person to look at.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { signedInClient, startAppServer, type AppServer } from '../support/app-server'
import { TEST_CLOCK, utcDateOf } from '../support/clock'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

const PHONE = { width: 390, height: 844 }
let server: AppServer
let browser: Browser
let sink: { url: string, messages: { to: string[], text: string }[], close: () => Promise<void> }

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  // a Saturday evening: the crew member's tomorrow is a Sunday, which the demo plans work on too
  server = await startAppServer({ clockStart: TEST_CLOCK.saturdayEveningBeforeChange, env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off' } })
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
  await sink?.close()
})

async function crewPage(theme: 'light' | 'dark'): Promise<Page> {
  const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 1, colorScheme: theme })
  const page = await context.newPage()
  await matchServerClock(page, server)
  await signInThroughPage(page, server.url, 'crew@gloamline.test')
  await page.getByTestId('home-crew').waitFor()
  return page
}

describe('the crew home on a phone', () => {
  it('shows tomorrow\'s light window and the person\'s shifts, as the server computed them', async () => {
    const page = await crewPage('light')
    const today = await (await page.request.get(`${server.url}/api/me/today`)).json()
    const site = today.sites.find((s: any) => s.days[1].shifts.length > 0)
    expect(site, 'the demo crew account has work tomorrow').toBeDefined()
    const tomorrow = site.days[1]
    const panel = page.getByTestId(`crew-site-${site.id}`).getByTestId('crew-day-tomorrow')
    await panel.waitFor()
    await expect.poll(() => panel.locator('h3').textContent()).toContain(`Tomorrow · ${tomorrow.dateLabel}`)
    // every row of the light window is on screen with its value, the times with the zone's offset
    for (const row of tomorrow.rows) {
      const text = (await panel.locator(`[data-row="${row.key}"]`).textContent())!.replace(/\s+/g, ' ')
      expect(text).toContain(row.label)
      if (row.moments.length) {
        for (const m of row.moments) expect(text).toContain(`${m.time} ${m.offset}`)
      } else {
        expect(text).toContain(row.value)
      }
    }
    // the shifts shown for tomorrow are exactly the person's shifts that day at this site
    const shown = await panel.locator('[data-testid^="crew-shift-"]').evaluateAll(els => els.map(e => e.getAttribute('data-testid')))
    expect(shown).toEqual(tomorrow.shifts.map((s: any) => `crew-shift-${s.id}`))
    for (const shift of tomorrow.shifts) {
      const card = panel.getByTestId(`crew-shift-${shift.id}`)
      expect(await card.textContent()).toContain(shift.span)
      expect(await card.getByTestId('review-badge').getAttribute('data-review-state')).toBe(shift.reviewState)
    }
    // each caution of tomorrow's shifts is on the screen once, gathered under the days, not inside each shift
    const titles = [...new Set(tomorrow.shifts.flatMap((s: any) => s.cautions.map((c: any) => c.title)))]
    if (titles.length) {
      const gathered = await page.getByTestId('crew-cautions').locator('aside[role="note"]').allTextContents()
      for (const title of titles) expect(gathered.filter(t => t.includes(title as string))).toHaveLength(1)
    }
    expect(await panel.locator('aside[role="note"]').count()).toBe(0)
    await panel.scrollIntoViewIfNeeded()
    await keepScreenshot(page, 'crew-home-phone-light')
    await page.context().close()
  })

  it('reads in the dark theme too', async () => {
    const page = await crewPage('dark')
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true)
    await page.getByTestId('crew-day-tomorrow').first().waitFor()
    const colours = await page.evaluate(() => {
      const body = getComputedStyle(document.documentElement).backgroundColor
      const figure = document.querySelector('[data-row="sunset"] dd, [data-row="daylight"] dd') as HTMLElement
      return { body, text: getComputedStyle(figure).color }
    })
    // dusk background (#0f1526) with light text (tailwind.config.ts tokens)
    expect(colours.body).toBe('rgb(15, 21, 38)')
    expect(colours.text).not.toBe('rgb(22, 33, 58)')
    await keepScreenshot(page, 'crew-home-phone-dark')
    await page.context().close()
  })

  it('shows the settings with reminders, time zone and the calendar link', async () => {
    const page = await crewPage('light')
    await page.goto(`${server.url}/settings`)
    await page.getByTestId('preferences-form').waitFor()
    await page.getByRole('button', { name: 'Show my calendar link' }).click()
    await expect.poll(async () => page.getByTestId('feed-url').inputValue()).toMatch(/\/feed\/[A-Za-z0-9_-]{43}\.ics$/)
    await keepScreenshot(page, 'crew-settings-phone')
    await page.context().close()
  })
})

describe('an invitation link', () => {
  it('lets the invited person choose a password on a phone and lands them on their home', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const email = 'eira.nes@northwake.test'
    expect((await coordinator.post('/api/invitations', { name: 'Eira Nes', email, role: 'crew' })).status).toBe(201)
    const link = /(http:\/\/\S+\/welcome\?token=\S+)/.exec(sink.messages.find(m => m.to.includes(email))!.text)![1]!
    const context = await browser.newContext({ viewport: PHONE })
    const page = await context.newPage()
    await matchServerClock(page, server)
    await page.goto(link)
    await expect.poll(() => page.getByTestId('welcome').textContent()).toContain('Hello Eira Nes')
    await page.getByLabel('Choose a password').fill('moraine-kettle-dusk-31')
    await page.getByLabel('The same password again').fill('moraine-kettle-dusk-31')
    await keepScreenshot(page, 'crew-welcome-phone')
    await page.getByRole('button', { name: 'Save my password and sign in' }).click()
    await page.getByTestId('home-crew').waitFor()
    expect(await page.getByTestId('crew-basis').textContent()).toContain('no shifts in the next 7 days')
    // the link is spent: opening it again says so
    await page.goto(link)
    await expect.poll(() => page.getByTestId('welcome').textContent()).toContain('already been used')
    await context.close()
  })
})

describe('the outbox', () => {
  it('lists the reminders sent and shows a message\'s HTML in a sandboxed frame and its text', async () => {
    const coordinator = await signedInClient(server, 'coordinator@gloamline.test')
    const date = utcDateOf(server.clock.now(), 1)
    expect((await coordinator.post(`/api/reminders/run?date=${date}`)).status).toBe(200)
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await context.newPage()
    await matchServerClock(page, server)
    await signInThroughPage(page, server.url, 'coordinator@gloamline.test')
    await page.goto(`${server.url}/outbox`)
    const first = page.getByTestId('outbox-list').locator('button').first()
    await first.click()
    const frame = page.getByTestId('outbox-html')
    await frame.waitFor()
    expect(await frame.getAttribute('sandbox')).toBe('')
    await expect.poll(async () => (await frame.contentFrame().locator('body').textContent()) ?? '').toContain('Gloamline')
    await keepScreenshot(page, 'outbox-desktop')
    await page.getByRole('button', { name: 'Plain-text part' }).click()
    expect(await page.getByTestId('outbox-text').textContent()).toContain('Hello ')
    await context.close()
  })
})
