import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { startAppServer, type AppServer } from '../support/app-server'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'

let server: AppServer
let browser: Browser

beforeAll(async () => {
  server = await startAppServer()
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

describe('signing in from the browser', () => {
  it('sends a signed-out person to the sign-in page', async () => {
    const page = await browser.newPage()
    await matchServerClock(page, server)
    await page.goto(`${server.url}/plan`)
    await page.waitForURL(/\/login/)
    expect(new URL(page.url()).searchParams.get('redirect')).toBe('/plan')
    await page.close()
  })

  for (const role of ['coordinator', 'safety', 'crew'] as const) {
    it(`signs in as the ${role} demo account and sees the ${role} home`, async () => {
      const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
      await matchServerClock(page, server)
      await signInThroughPage(page, server.url, `${role}@gloamline.test`)
      await page.getByTestId(`home-${role}`).waitFor()
      expect(await page.getByTestId('signed-in-as').textContent()).toContain(role)
      await keepScreenshot(page, `home-${role}`)
      await page.close()
    })
  }

  it('shows the same message for a wrong password', async () => {
    const page = await browser.newPage()
    await matchServerClock(page, server)
    await page.goto(`${server.url}/login`)
    await page.getByLabel('E-mail').fill('crew@gloamline.test')
    await page.getByLabel('Password').fill('not-this-one')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('Wrong e-mail or password')
    await page.close()
  })
})
