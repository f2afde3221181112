import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { chromium, type Browser, type Page } from 'playwright-core'
import { DEMO_PASSWORD, type AppServer } from './app-server'

export const ARTEFACTS_DIR = resolve(import.meta.dirname, '../../test-results/screenshots')

/** Debian's Chromium, headless, with the flags this machine's closed network needs. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']
  })
}

/** Signs in through the sign-in page, as a person would. */
export async function signInThroughPage(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl}/login`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(url => !url.pathname.startsWith('/login'))
}

/** Saves a screenshot under test-results/screenshots as an artefact of the run. */
export async function keepScreenshot(page: Page, name: string) {
  mkdirSync(ARTEFACTS_DIR, { recursive: true })
  const path = resolve(ARTEFACTS_DIR, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}

/**
 * Sets the page's clock to the server's (Playwright's page.clock, installed before the first
 * navigation): the app then calls the same instant "now" as the server under test, whatever the
 * machine's date. Time runs on from there.
 */
export async function matchServerClock(page: Page, server: Pick<AppServer, 'clock'>) {
  await page.clock.install({ time: server.clock.now() })
}
