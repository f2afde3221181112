import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { keepScreenshot, launchBrowser, matchServerClock, signInThroughPage } from '../support/browser'
import { createDarkShift, createDarkSite, findPeopleIds, startSafetyWorld, type SafetyWorld } from '../support/safety-fixtures'

let world: SafetyWorld
let browser: Browser
let shiftId: number

beforeAll(async () => {
  world = await startSafetyWorld()
  browser = await launchBrowser()
  const site = await createDarkSite(world.coordinator, 'Invented Lantern Ridge')
  const { crew } = await findPeopleIds(world.coordinator)
  shiftId = (await createDarkShift(world.coordinator, site.id, { daysAhead: 1, assigneeIds: crew.slice(0, 2), title: 'Ridge beacon check' })).id
  await world.safety.post(`/api/sites/${site.id}/forecast/refresh`)
})
afterAll(async () => {
  await browser?.close()
  await world?.stop()
})

describe('safety review in the browser', () => {
  it('lets the safety officer read the queue and its cautions, and approve with two mitigations', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await matchServerClock(page, world.server)
    await signInThroughPage(page, world.server.url, 'safety@gloamline.test')
    await page.getByTestId('home-safety-counts').waitFor()
    await keepScreenshot(page, 'review-home-safety')

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click()
    await page.waitForURL(/\/review$/)
    const card = page.locator(`[data-testid="queue-item"][data-shift-id="${shiftId}"]`)
    await card.waitFor()
    await expect.poll(() => card.locator('[data-caution="below-light"]').textContent()).toContain('below the light this task needs')
    expect(await card.getByTestId('weather-label').textContent()).toContain('Forecast fetched at')
    await keepScreenshot(page, 'review-queue')

    await card.getByRole('link', { name: /Review Ridge beacon check/ }).click()
    await page.waitForURL(new RegExp(`/review/${shiftId}$`))
    // client-side navigation: wait for the shift's own page, not just its address
    await page.getByTestId('decision-form').waitFor()
    const cautions = page.getByTestId('caution-list')
    expect(await cautions.textContent()).toContain('Signs of hypothermia')
    expect(await cautions.textContent()).toContain('a competent supervisor decide')
    expect(await page.getByTestId('light-strip').textContent()).toContain('UTC')

    await page.getByRole('radio', { name: /^Approve/ }).check()
    await page.getByRole('checkbox', { name: 'Portable work lighting on site' }).check()
    await page.getByRole('checkbox', { name: 'Warm-up breaks scheduled as the cold figures direct' }).check()
    await page.getByLabel('Note (optional)').fill('Head torches and the beacon mast floodlight.')
    await keepScreenshot(page, 'review-decision-filled')
    await page.getByRole('button', { name: 'Record decision' }).click()
    await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Decision recorded: Approved')
    await expect.poll(() => page.getByTestId('review-badge').getAttribute('data-review-state')).toBe('approved')
    await keepScreenshot(page, 'review-decided')
    await page.close()
  })

  it('shows the coordinator the shift cleared, with the two mitigations', async () => {
    const shift = (await world.coordinator.get(`/api/shifts/${shiftId}`)).body
    expect(shift.reviewState).toBe('approved')
    expect(shift.review).toMatchObject({ decision: 'approved', mitigations: ['portable-lighting', 'warmup-breaks'], reviewerName: 'Tomas Reyes', current: true })

    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await matchServerClock(page, world.server)
    await signInThroughPage(page, world.server.url, 'coordinator@gloamline.test')
    await page.goto(`${world.server.url}/review/${shiftId}`)
    const badge = page.getByTestId('review-badge')
    await badge.waitFor()
    expect(await badge.textContent()).toContain('Approved')
    expect(await badge.textContent()).toContain('Portable work lighting on site')
    expect(await page.getByTestId('decision-form').count()).toBe(0)
    await keepScreenshot(page, 'review-coordinator-sees-approval')
    await page.close()
  })

  it('reads in the dark theme', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, colorScheme: 'dark' })
    const page = await context.newPage()
    await matchServerClock(page, world.server)
    await signInThroughPage(page, world.server.url, 'safety@gloamline.test')
    await page.goto(`${world.server.url}/review`)
    await page.getByTestId('queue-item').first().waitFor()
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true)
    await keepScreenshot(page, 'review-queue-dark')
    await context.close()
  })
})
