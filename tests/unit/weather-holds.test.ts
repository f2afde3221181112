// Weather holds at each figure's boundary (docs/api.md: a level is reached in an hour when any one of
// its figures is reached: wind at or above, wind chill at or below, visibility at or below; the most
// severe level reached over the outing wins, `at` is its first hour). Levels here are invented for the
// test, as an operator would set its own. Wind chill: the 2001 North American index (ECCC/NWS), whole
// degrees as published; the chart values used are from ECCC's wind chill table (memory), and checked
// against the formula in docs/references.md by the cold tests.
import { afterEach, describe, expect, it } from 'vitest'
import { evaluateWeatherHold, findHoldCause, hourWindChillC, type HoldHour, type HoldLevel } from '../../server/core/cold/holds'
import { loadSiteHourlyWeather } from '../../server/services/site-weather'
import { forecasts, observations, sites } from '../../server/db/schema'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

const H = 3_600_000
const T = Date.parse('2027-01-12T08:00:00Z')
const hour = (i: number, over: Partial<HoldHour> = {}): HoldHour => ({ atMs: T + i * H, temperatureC: -5, windKmh: 10, visibilityM: 10_000, ...over })
const LEVELS: HoldLevel[] = [
  { name: 'Amber watch', windKmh: 45, windChillC: -35, visibilityM: 1000, advice: 'Travel in pairs, radio every hour.' },
  { name: 'Red stand-down', windKmh: 70, windChillC: -45, visibilityM: 100, advice: 'No travel; stay in shelter.' }
]

describe('each hold figure at its boundary', () => {
  it('wind: reached at the figure itself, not 0.1 km/h below', () => {
    expect(findHoldCause(LEVELS[0]!, hour(0, { windKmh: 45 }))).toMatchObject({ cause: 'windKmh', value: 45, limit: 45 })
    expect(findHoldCause(LEVELS[0]!, hour(0, { windKmh: 44.9 }))).toBeNull()
  })

  it('wind chill: −10 °C in 20 km/h is −18 on the chart (ECCC, memory): a −18 level is reached, a −19 level is not', () => {
    expect(hourWindChillC({ temperatureC: -10, windKmh: 20 })).toBe(-18)
    const at = (figure: number): HoldLevel => ({ name: 'L', windChillC: figure, advice: 'a' })
    expect(findHoldCause(at(-18), hour(0, { temperatureC: -10, windKmh: 20 }))).toMatchObject({ cause: 'windChillC', value: -18 })
    expect(findHoldCause(at(-19), hour(0, { temperatureC: -10, windKmh: 20 }))).toBeNull()
  })

  it('wind chill: −20 °C in 30 km/h is −33 on the chart (ECCC, memory): reached at −33, not at −34', () => {
    const at = (figure: number): HoldLevel => ({ name: 'L', windChillC: figure, advice: 'a' })
    expect(findHoldCause(at(-33), hour(0, { temperatureC: -20, windKmh: 30 }))?.cause).toBe('windChillC')
    expect(findHoldCause(at(-34), hour(0, { temperatureC: -20, windKmh: 30 }))).toBeNull()
  })

  it('wind chill is not reached where the index is not defined (air above 10 °C, or wind at or below 4.8 km/h)', () => {
    // a level any defined wind chill would reach
    const any: HoldLevel = { name: 'L', windChillC: 10, advice: 'a' }
    expect(findHoldCause(any, hour(0, { temperatureC: 11, windKmh: 40 }))).toBeNull()
    expect(findHoldCause(any, hour(0, { temperatureC: -30, windKmh: 4.8 }))).toBeNull()
  })

  it('visibility: reached at the figure itself, not 1 m above', () => {
    expect(findHoldCause(LEVELS[1]!, hour(0, { visibilityM: 100 }))).toMatchObject({ cause: 'visibilityM', value: 100 })
    expect(findHoldCause(LEVELS[1]!, hour(0, { visibilityM: 101 }))).toBeNull()
  })

  it('a missing figure reaches nothing', () => {
    expect(findHoldCause(LEVELS[1]!, hour(0, { windKmh: null, temperatureC: null, visibilityM: null }))).toBeNull()
  })
})

describe('the hold over an outing', () => {
  it('names the most severe level reached, its first hour and its cause', () => {
    const hours = [hour(0, { windKmh: 50 }), hour(1, { windKmh: 50 }), hour(2, { visibilityM: 80 }), hour(3, { windKmh: 75 })]
    expect(evaluateWeatherHold(LEVELS, hours, T, T + 4 * H)).toMatchObject({ level: 'Red stand-down', atMs: T + 2 * H, cause: 'visibilityM', advice: 'No travel; stay in shelter.' })
    expect(evaluateWeatherHold(LEVELS, hours.slice(0, 2), T, T + 4 * H)).toMatchObject({ level: 'Amber watch', atMs: T, cause: 'windKmh' })
  })

  it('counts hours that overlap the outing only: an hour ending at the departure or starting at the return is out', () => {
    const hours = [hour(0, { windKmh: 80 }), hour(1), hour(2, { windKmh: 80 })]
    expect(evaluateWeatherHold(LEVELS, hours, T + H, T + 2 * H)).toBeNull()
    expect(evaluateWeatherHold(LEVELS, hours, T + H - 1, T + 2 * H)?.level).toBe('Red stand-down')
  })

  it('is null with no levels, no hours, or none reached', () => {
    expect(evaluateWeatherHold([], [hour(0, { windKmh: 200 })], T, T + H)).toBeNull()
    expect(evaluateWeatherHold(LEVELS, [], T, T + H)).toBeNull()
    expect(evaluateWeatherHold(LEVELS, [hour(0)], T, T + H)).toBeNull()
  })
})

describe('readings from the field against the forecast', () => {
  afterEach(removeTestDatabases)

  it('a reading entered after the forecast was fetched replaces it for its hour; an older one does not; a future one counts', () => {
    const db = createTestDatabase()
    const site = db.insert(sites).values({ name: 'Test Ridge', latitude: 74.5, longitude: 19, timezone: 'Arctic/Longyearbyen' }).returning().get()
    const fetchedAt = new Date(T - 2 * H)
    const hours = [0, 1, 2, 3].map(i => ({ at: new Date(T + i * H).toISOString(), temperatureC: -12, windKmh: 20, gustKmh: null }))
    db.insert(forecasts).values({ siteId: site.id, source: 'test', status: 'ok', fetchedAt, hours }).run()
    // measured at 08:10, entered before the forecast came: the forecast keeps the hour
    db.insert(observations).values({ siteId: site.id, at: new Date(T + 10 * 60_000), temperatureC: -28, windKmh: 30, source: 'manual', createdAt: new Date(T - 3 * H) }).run()
    // measured at 09:20, entered after the forecast: it wins its hour
    db.insert(observations).values({ siteId: site.id, at: new Date(T + H + 20 * 60_000), temperatureC: -28, windKmh: 30, visibilityM: 200, source: 'manual', createdAt: new Date(T + H + 25 * 60_000) }).run()
    // relayed from the field for 11:00, ahead of time
    db.insert(observations).values({ siteId: site.id, at: new Date(T + 3 * H), temperatureC: -35, windKmh: 50, source: 'manual', createdAt: new Date(T + H + 30 * 60_000) }).run()
    const merged = loadSiteHourlyWeather(db, site.id, T + 2 * H)
    expect(merged.map(h => [h.atMs - T, h.source, h.temperatureC])).toEqual([
      [0, 'forecast', -12], [H, 'reading', -28], [2 * H, 'forecast', -12], [3 * H, 'reading', -35]
    ])
    expect(merged[1]!.visibilityM).toBe(200)
  })

  it('a forecast hour with visibility exactly at a level\'s figure reaches it; 1 m above does not', () => {
    const db = createTestDatabase()
    const site = db.insert(sites).values({ name: 'Test Ridge', latitude: 74.5, longitude: 19, timezone: 'Arctic/Longyearbyen' }).returning().get()
    // Wind and wind chill stay below every level (−5 °C, 10 km/h), so only visibility can reach one.
    const at = (i: number) => new Date(T + i * H).toISOString()
    const hours = [
      { at: at(0), temperatureC: -5, windKmh: 10, gustKmh: null, visibilityM: 1001 },
      { at: at(1), temperatureC: -5, windKmh: 10, gustKmh: null, visibilityM: 1000 },
      { at: at(2), temperatureC: -5, windKmh: 10, gustKmh: null, visibilityM: 101 },
      { at: at(3), temperatureC: -5, windKmh: 10, gustKmh: null, visibilityM: 100 }
    ]
    db.insert(forecasts).values({ siteId: site.id, source: 'test', status: 'ok', fetchedAt: new Date(T - 2 * H), hours }).run()
    const merged = loadSiteHourlyWeather(db, site.id, T)
    expect(merged.map(h => [h.source, h.visibilityM])).toEqual([['forecast', 1001], ['forecast', 1000], ['forecast', 101], ['forecast', 100]])
    // 1001 m is 1 m above Amber's 1000 m: nothing reached in that hour alone
    expect(evaluateWeatherHold(LEVELS, merged, T, T + H)).toBeNull()
    expect(evaluateWeatherHold(LEVELS, merged, T, T + 2 * H)).toMatchObject({ level: 'Amber watch', atMs: T + H, cause: 'visibilityM', value: 1000, limit: 1000 })
    // 101 m is 1 m above Red's 100 m: Amber only
    expect(evaluateWeatherHold(LEVELS, merged, T + 2 * H, T + 3 * H)).toMatchObject({ level: 'Amber watch', cause: 'visibilityM', value: 101 })
    expect(evaluateWeatherHold(LEVELS, merged, T + 2 * H, T + 4 * H)).toMatchObject({ level: 'Red stand-down', atMs: T + 3 * H, cause: 'visibilityM', value: 100, limit: 100 })
  })

  it('a newer reading\'s visibility replaces the forecast\'s for its hour; a forecast stored without visibility reads as none', () => {
    const db = createTestDatabase()
    const site = db.insert(sites).values({ name: 'Test Ridge', latitude: 74.5, longitude: 19, timezone: 'Arctic/Longyearbyen' }).returning().get()
    const hours = [
      { at: new Date(T).toISOString(), temperatureC: -5, windKmh: 10, gustKmh: null, visibilityM: 80 },
      // stored before visibility was asked for: no visibilityM key at all
      { at: new Date(T + H).toISOString(), temperatureC: -5, windKmh: 10, gustKmh: null }
    ]
    db.insert(forecasts).values({ siteId: site.id, source: 'test', status: 'ok', fetchedAt: new Date(T - 2 * H), hours }).run()
    db.insert(observations).values({ siteId: site.id, at: new Date(T + 15 * 60_000), temperatureC: -5, windKmh: 10, visibilityM: 5000, source: 'manual', createdAt: new Date(T + 20 * 60_000) }).run()
    const merged = loadSiteHourlyWeather(db, site.id, T + H)
    expect(merged.map(h => [h.source, h.visibilityM])).toEqual([['reading', 5000], ['forecast', null]])
    expect(evaluateWeatherHold(LEVELS, merged, T, T + 2 * H)).toBeNull()
  })
})
