// The crew home's weather line for today reads the forecast hours still ahead: a forecast fetched
// this morning starts at the hour it was fetched, not at midnight, and still covers the rest of the day.
// Invented site and forecast figures (demo data only); the line's wording is the product's own.
import { afterEach, describe, expect, it } from 'vitest'
import { forecasts, people, sites } from '../../server/db/schema'
import { buildCrewToday } from '../../server/services/crew-day'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

const HOUR_MS = 3_600_000
// Wednesday 18 November 2026, 09:30 UTC (10:30 in Europe/Oslo): a fixed instant, never the machine's date
const NOW_MS = Date.parse('2026-11-18T09:30:00Z')

afterEach(() => removeTestDatabases())

function seedForecast(firstHourMs: number, hours: number) {
  const db = createTestDatabase()
  const site = db.insert(sites).values({ name: 'Invented fjord camp', latitude: 78.22, longitude: 15.63, timezone: 'Europe/Oslo' }).returning().get()
  const person = db.insert(people).values({ name: 'Invented Crew', email: 'crew@example.test', role: 'crew' }).returning().get()
  const rows = Array.from({ length: hours }, (_, i) => ({ at: new Date(firstHourMs + i * HOUR_MS).toISOString(), temperatureC: -18 - (i % 5), windKmh: 20, gustKmh: 30 }))
  db.insert(forecasts).values({ siteId: site.id, source: 'invented-test', status: 'ok', fetchedAt: new Date(NOW_MS - 20 * 60_000), hours: rows }).run()
  return { db, personId: person.id, siteId: site.id }
}

describe('today\'s forecast line on the crew home', () => {
  it('gives the figures for the rest of today when the forecast starts at this hour and runs past midnight', () => {
    const { db, personId, siteId } = seedForecast(NOW_MS - 30 * 60_000, 48)
    const site = buildCrewToday(db, personId, NOW_MS).sites.find(s => s.id === siteId)!
    const today = site.days.find(d => d.which === 'today')!
    expect(today.weather).not.toContain('No forecast for these hours')
    expect(today.weather).toMatch(/^From 10:00 to midnight: Coldest −22 °C/)
    expect(site.days.find(d => d.which === 'tomorrow')!.weather).toMatch(/^Coldest −22 °C/)
  })

  it('still says so when the forecast ends before the day does', () => {
    const { db, personId, siteId } = seedForecast(NOW_MS - 30 * 60_000, 6)
    const site = buildCrewToday(db, personId, NOW_MS).sites.find(s => s.id === siteId)!
    expect(site.days.find(d => d.which === 'today')!.weather).toContain('No forecast for these hours')
  })
})
