// Accounts as people use them, in headless Chromium against the built server with a real SMTP sink:
// a coordinator adds a person who then signs in through the mailed link; someone who forgot their
// password gets a new one through the mailed link; a cookie copied out of the browser stops working
// when its owner signs out. Screenshots of the pages at desk and phone sizes, light and dark.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { ApiClient, startAppServer, type AppServer } from '../support/app-server'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

interface SinkMessage { to: string[], subject: string, text: string }
let sink: { url: string, messages: SinkMessage[], close: () => Promise<void> }
let server: AppServer
let browser: Browser

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
  server = await startAppServer({ env: { SMTP_URL: sink.url, REMINDER_TIMER: 'off' } })
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
  await sink?.close()
})

// the link of the `count`-th such mail (each new link retires the earlier ones)
async function mailedLink(email: string, path: 'welcome' | 'reset', count = 1): Promise<string> {
  const pattern = new RegExp(`(http://[^\\s]+/${path}\\?token=[A-Za-z0-9_%-]+)`)
  for (let i = 0; i < 100; i++) {
    const mails = sink.messages.filter(m => m.to.includes(email) && pattern.test(m.text))
    if (mails.length >= count) return pattern.exec(mails[count - 1]!.text)![1]!
    await new Promise(r => setTimeout(r, 50))
  }
  throw new Error(`no ${path} link mailed to ${email}`)
}

async function newPage(size: 'desk' | 'phone' = 'desk', colorScheme: 'light' | 'dark' = 'light'): Promise<Page> {
  const viewport = size === 'desk' ? { width: 1280, height: 800 } : { width: 390, height: 844 }
  const context = await browser.newContext({ viewport, colorScheme })
  const page = await context.newPage()
  await matchServerClock(page, server)
  return page
}

describe('a way in, in the browser', () => {
  it('lets a person added by a coordinator sign in through the mailed link', async () => {
    const coordinator = await newPage()
    await signInThroughPage(coordinator, server.url, 'coordinator@gloamline.test')
    await coordinator.goto(`${server.url}/people`)
    await coordinator.locator('#person-name').fill('Signe Lyng')
    await coordinator.locator('#person-email').fill('signe.lyng@northwake.test')
    await coordinator.getByRole('button', { name: 'Add person' }).click()
    const row = coordinator.getByRole('row').filter({ hasText: 'Signe Lyng' })
    await expect.poll(() => row.getByTestId('person-pending').textContent()).toContain('Waiting for first sign-in')
    await keepScreenshot(coordinator, 'accounts-people-pending-desk')
    await coordinator.context().close()

    const link = await mailedLink('signe.lyng@northwake.test', 'welcome')
    const person = await newPage('phone')
    await person.goto(link)
    await person.getByLabel('Choose a password').fill('moraine-kettle-lichen-27')
    await person.getByLabel('The same password again').fill('moraine-kettle-lichen-27')
    await keepScreenshot(person, 'accounts-welcome-phone')
    await person.getByRole('button', { name: 'Save my password and sign in' }).click()
    await person.waitForURL(url => url.pathname === '/')
    await expect.poll(() => person.getByTestId('signed-in-as').textContent()).toContain('crew')
    await person.context().close()

    // and the password works on a fresh browser, through the ordinary sign-in page
    const later = await newPage()
    await signInThroughPage(later, server.url, 'signe.lyng@northwake.test', 'moraine-kettle-lichen-27')
    expect(new URL(later.url()).pathname).toBe('/')
    await later.context().close()
  })

  it('resets a forgotten password through the mailed link', async () => {
    for (const [size, scheme] of [['desk', 'light'], ['phone', 'dark']] as const) {
      const page = await newPage(size, scheme)
      await page.goto(`${server.url}/login`)
      await page.getByRole('link', { name: 'Forgot your password?' }).click()
      await page.waitForURL(/\/forgot/)
      await page.getByLabel('E-mail').fill('nora.tuktu@gloamline.test')
      await page.getByRole('button', { name: 'Send me a link' }).click()
      await page.getByTestId('forgot-sent').waitFor()
      await keepScreenshot(page, `accounts-forgot-${size}-${scheme}`)
      await page.context().close()
    }
    // asked twice (desk, then phone): the second link is the one that works
    const link = await mailedLink('nora.tuktu@gloamline.test', 'reset', 2)
    const page = await newPage('phone', 'dark')
    await page.goto(link)
    await page.getByLabel('New password').fill('aurora-scree-walrus-64')
    await page.getByLabel('The same password again').fill('aurora-scree-walrus-64')
    await keepScreenshot(page, 'accounts-reset-phone-dark')
    await page.getByRole('button', { name: 'Save and sign in' }).click()
    await page.waitForURL(url => url.pathname === '/')
    await page.context().close()
    expect((await new ApiClient(server.url).post('/api/auth/login', { email: 'nora.tuktu@gloamline.test', password: 'gloamline-demo' })).status).toBe(401)
    expect((await new ApiClient(server.url).post('/api/auth/login', { email: 'nora.tuktu@gloamline.test', password: 'aurora-scree-walrus-64' })).status).toBe(200)
  })

  it('refuses a cookie copied out of the browser once its owner signs out', async () => {
    const page = await newPage()
    await signInThroughPage(page, server.url, 'crew@gloamline.test')
    const cookies = await page.context().cookies()
    const header = cookies.map(c => `${c.name}=${c.value}`).join('; ')
    const thief = new ApiClient(server.url)
    thief.cookie = header
    expect((await thief.get('/api/me/today')).status).toBe(200)
    await page.getByRole('button', { name: 'Sign out' }).first().click()
    await page.waitForURL(/\/login/)
    expect((await thief.get('/api/me/today')).status).toBe(401)
    // the copy opened in another browser lands on the sign-in page too
    const other = await browser.newContext()
    await other.addCookies(cookies)
    const stolen = await other.newPage()
    await matchServerClock(stolen, server)
    await stolen.goto(`${server.url}/settings`)
    await stolen.waitForURL(/\/login/)
    await other.close()
    await page.context().close()
  })

  it('shows the account parts of settings at desk and phone sizes', async () => {
    for (const [size, scheme] of [['desk', 'light'], ['phone', 'dark']] as const) {
      const page = await newPage(size, scheme)
      await signInThroughPage(page, server.url, 'safety@gloamline.test')
      await page.goto(`${server.url}/settings`)
      await expect.poll(() => page.getByTestId('sessions-count').textContent()).toMatch(/Signed in on \d+ device/)
      await page.getByRole('heading', { name: 'Password' }).scrollIntoViewIfNeeded()
      await keepScreenshot(page, `accounts-settings-${size}-${scheme}`)
      await page.context().close()
    }
  })
})
