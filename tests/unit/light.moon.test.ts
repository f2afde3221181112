// The moon layer against an outside reference: astronomy-engine 2.1.19 (npm), topocentric moon from
// Equator(Body.Moon, date, observer, ofdate = true, aberration = true) then Horizon(...) WITHOUT
// refraction, and Illumination(Body.Moon, date).phase_fraction for the lit fraction (docs/references.md,
// "Moon"). The −0.833° rise and set altitude for the centre is the sun's convention (docs/api.md, "Light").
import { describe, expect, it } from 'vitest'
import { Body, Equator, Horizon, Illumination, Observer } from 'astronomy-engine'
import { MOON_HORIZON_DEG, attachMoonToDays, computeMoonDays, computeMoonDaysMs, summariseMoonDays, type MoonDayMs } from '../../server/core/light/moon'
import { localMidnightMs } from '../../server/core/time/zoned'
import { describeMoonDay } from '../../shared/moon'

interface Site { name: string, latitude: number, longitude: number, timezone: string }

// Two latitudes, one in each hemisphere, so that each month below is polar night at one and midnight sun at the other.
const SVALBARD: Site = { name: '78.2°N', latitude: 78.22, longitude: 15.65, timezone: 'Europe/Oslo' }
const QUEEN_MAUD: Site = { name: '72.0°S', latitude: -72.01, longitude: 2.53, timezone: 'Antarctica/Troll' }

const SAMPLE_STEP_MS = 5 * 60_000
// Near a rise or set two models a few thousandths of a degree apart may disagree for a sample or two.
const GRAZING_MARGIN_DEG = 0.05

function referenceMoonAltitude(ms: number, site: Site): number {
  const observer = new Observer(site.latitude, site.longitude, 0)
  const date = new Date(ms)
  const eq = Equator(Body.Moon, date, observer, true, true)
  return Horizon(date, observer, eq.ra, eq.dec).altitude
}

function isUp(days: MoonDayMs[], ms: number): boolean {
  return days.some(d => d.up.some(s => ms >= s.startMs && ms < s.endMs))
}

interface MonthCheck { samples: number, mismatches: number, maxEventError: number, events: number, fullDays: number, emptyDays: number }

function checkMonth(site: Site, from: string, to: string): MonthCheck {
  const days = computeMoonDaysMs({ ...site, from, to })
  const start = localMidnightMs(from, site.timezone)
  const end = localMidnightMs(to, site.timezone) + 86_400_000 + 2 * 3_600_000
  const result: MonthCheck = { samples: 0, mismatches: 0, maxEventError: 0, events: 0, fullDays: 0, emptyDays: 0 }
  for (let ms = start; ms < end - 2 * 3_600_000; ms += SAMPLE_STEP_MS) {
    const alt = referenceMoonAltitude(ms, site)
    if (Math.abs(alt - MOON_HORIZON_DEG) < GRAZING_MARGIN_DEG) continue
    result.samples++
    if ((alt >= MOON_HORIZON_DEG) !== isUp(days, ms)) result.mismatches++
  }
  for (const day of days) {
    for (const e of day.events) {
      result.events++
      result.maxEventError = Math.max(result.maxEventError, Math.abs(referenceMoonAltitude(e.atMs, site) - MOON_HORIZON_DEG))
    }
    const dayStart = localMidnightMs(day.date, site.timezone)
    if (day.up.length === 1 && day.up[0]!.startMs === dayStart && day.events.length === 0) result.fullDays++
    if (day.up.length === 0) result.emptyDays++
  }
  return result
}

describe('moon up spans against astronomy-engine (topocentric, unrefracted)', () => {
  const months = [
    { site: SVALBARD, from: '2026-12-01', to: '2026-12-31', season: 'polar night' },
    { site: SVALBARD, from: '2027-06-01', to: '2027-06-30', season: 'midnight sun' },
    { site: QUEEN_MAUD, from: '2027-06-01', to: '2027-06-30', season: 'polar night' },
    { site: QUEEN_MAUD, from: '2026-12-01', to: '2026-12-31', season: 'midnight sun' }
  ]
  for (const { site, from, to, season } of months) {
    it(`agrees at every 5-minute sample and puts each rise and set within 0.05° of −0.833° (${site.name}, ${season}, ${from.slice(0, 7)})`, () => {
      const r = checkMonth(site, from, to)
      expect(r.samples).toBeGreaterThan(8000)
      expect(r.mismatches).toBe(0)
      expect(r.events).toBeGreaterThan(10)
      // docs/references.md measured 0.005° at 74.5°N; the issue allows 0.05°
      expect(r.maxEventError).toBeLessThan(0.05)
      // at these latitudes the moon stays up all day for some days of each month and never rises on others
      expect(r.fullDays).toBeGreaterThan(2)
      expect(r.emptyDays).toBeGreaterThan(2)
    }, 60_000)
  }
})

describe('moon day shape', () => {
  it('cuts spans at local midnight, including across the two-hour clock change at Antarctica/Troll', () => {
    // Troll goes from UTC+00 to UTC+02 on the last Sunday of March (tz data)
    const days = computeMoonDaysMs({ ...QUEEN_MAUD, from: '2027-03-20', to: '2027-04-05' })
    for (const day of days) {
      const start = localMidnightMs(day.date, QUEEN_MAUD.timezone)
      const next = day === days[days.length - 1] ? localMidnightMs('2027-04-06', QUEEN_MAUD.timezone) : localMidnightMs(days[days.indexOf(day) + 1]!.date, QUEEN_MAUD.timezone)
      for (const span of day.up) {
        expect(span.startMs).toBeGreaterThanOrEqual(start)
        expect(span.endMs).toBeLessThanOrEqual(next)
        expect(span.endMs).toBeGreaterThan(span.startMs)
      }
    }
    // a span ending at midnight continues at the start of the next day, and vice versa
    for (let i = 1; i < days.length; i++) {
      const midnight = localMidnightMs(days[i]!.date, QUEEN_MAUD.timezone)
      const endsAtMidnight = days[i - 1]!.up.some(s => s.endMs === midnight)
      const startsAtMidnight = days[i]!.up.some(s => s.startMs === midnight)
      expect(endsAtMidnight).toBe(startsAtMidnight)
    }
  })

  it('gives the lit fraction at the middle of the local day within 0.001 of astronomy-engine\'s phase_fraction', () => {
    const days = computeMoonDaysMs({ ...SVALBARD, from: '2026-12-01', to: '2026-12-31' })
    let worst = 0
    for (const day of days) {
      const mid = (localMidnightMs(day.date, SVALBARD.timezone) + localMidnightMs(day.date, SVALBARD.timezone) + 86_400_000) / 2
      worst = Math.max(worst, Math.abs(day.illumination - Illumination(Body.Moon, new Date(mid)).phase_fraction))
    }
    expect(worst).toBeLessThan(0.001)
    // a full moon falls in every month: some day is over 95 % lit, some under 5 %
    expect(Math.max(...days.map(d => d.illumination))).toBeGreaterThan(0.95)
    expect(Math.min(...days.map(d => d.illumination))).toBeLessThan(0.05)
  })

  it('reports the highest altitude of each day within 0.05° of the reference sampled each 5 minutes', () => {
    const days = computeMoonDaysMs({ ...SVALBARD, from: '2026-12-10', to: '2026-12-16' })
    for (const day of days) {
      const start = localMidnightMs(day.date, SVALBARD.timezone)
      let best = -90
      for (let ms = start; ms <= start + 86_400_000; ms += SAMPLE_STEP_MS) best = Math.max(best, referenceMoonAltitude(ms, SVALBARD))
      expect(Math.abs(day.maxAltitude - best)).toBeLessThan(0.05)
    }
  })

  it('writes instants with the site zone\'s offset and attaches each day\'s moon by date', () => {
    const days = computeMoonDays({ ...SVALBARD, from: '2026-12-14', to: '2026-12-15' })
    for (const d of days) {
      for (const e of d.events) expect(e.at).toMatch(/^2026-12-1[45]T\d{2}:\d{2}:\d{2}\+01:00$/)
      for (const e of d.events) expect(e.azimuth).toBeGreaterThanOrEqual(0)
    }
    const attached = attachMoonToDays([{ date: '2026-12-14', x: 1 }, { date: '2026-12-15', x: 2 }], SVALBARD)
    expect(attached.map(d => d.moon)).toEqual(days.map(({ date: _date, ...moon }) => moon))
    expect(attached[1]!.x).toBe(2)
  })
})

describe('moon words for the crew screens', () => {
  const hhmm = (ms: number, zone: string) => new Intl.DateTimeFormat('en-GB', { timeZone: zone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(ms)

  it('joins a span across midnight into one "rise–set" and names whole days up or down (78.2°N, December 2026)', () => {
    const input = { ...SVALBARD, from: '2026-12-01', to: '2026-12-31', zone: SVALBARD.timezone, formatTime: hhmm }
    const words = summariseMoonDays(input)
    const raw = computeMoonDaysMs({ ...SVALBARD, from: '2026-12-01', to: '2027-01-02' })
    expect(words).toHaveLength(31)
    expect(words.some(w => w.words.startsWith('Moon up all day,'))).toBe(true)
    expect(words.some(w => w.words.startsWith('Moon below the horizon all day,'))).toBe(true)
    // a day whose only event is a rise and whose next day begins with a set reads "rise–set"
    const i = raw.findIndex((d, k) => k < 30 && d.events.length === 1 && d.events[0]!.type === 'moonrise' && raw[k + 1]!.events[0]?.type === 'moonset')
    expect(i).toBeGreaterThanOrEqual(0)
    const rise = hhmm(raw[i]!.events[0]!.atMs, SVALBARD.timezone)
    const set = hhmm(raw[i + 1]!.events[0]!.atMs, SVALBARD.timezone)
    expect(words[i]!.words).toBe(`Moon up ${rise}–${set}, ${Math.round(raw[i]!.illumination * 100)} % lit`)
    for (const w of words) expect(w.upMinutes).toBeLessThanOrEqual(25 * 60)
  })
})

describe('the moon of a day in words from the API shape', () => {
  it('writes each up span on the site\'s clock, 24:00 for a span cut at midnight, and the lit percentage', () => {
    const days = computeMoonDays({ ...SVALBARD, from: '2026-12-01', to: '2026-12-31' })
    const cut = days.find(d => d.up.length === 1 && d.up[0]!.start.slice(11, 16) !== '00:00' && d.up[0]!.end.slice(0, 10) > d.date)!
    expect(cut).toBeDefined()
    expect(describeMoonDay(cut, cut.date)).toBe(`Moon up ${cut.up[0]!.start.slice(11, 16)}–24:00, ${Math.round(cut.illumination * 100)} % lit`)
    const down = days.find(d => d.up.length === 0)!
    expect(describeMoonDay(down, down.date)).toMatch(/^Moon below the horizon all day, \d+ % lit$/)
    const all = days.find(d => d.up.length === 1 && d.up[0]!.start.slice(11, 16) === '00:00' && d.up[0]!.end.slice(0, 10) > d.date)!
    expect(describeMoonDay(all, all.date)).toMatch(/^Moon up all day, \d+ % lit$/)
  })
})
