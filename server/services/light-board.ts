// The light board: every active site side by side, today and tomorrow in each site's own zone, with
// its shift counts and the next change of season. The light comes from the light engine and the
// run-up; this file only gathers and shapes. Explicit imports, so a test or benchmark can call it.
import { and, gt, isNull, lt } from 'drizzle-orm'
import { shifts, sites, type Site } from '../db/schema'
import type { LightDay } from '../../shared/light'
import type { BoardData, BoardDay, BoardSite } from '../../shared/outlook'
import type { AppDatabase } from '../utils/db'
import { computeLightDays } from '../core/light/index'
import { formatInstantInZone, shiftLocalDate } from '../core/time/zone-table'
import { findNextTransition } from '../core/light/runup'
import { findNextTransitions } from '../core/light/seasons'

// The next transition changes once a day: keep recent answers (site place, date, N) for repeat visits.
const TRANSITION_CACHE = new Map<string, ReturnType<typeof findNextTransition>>()
const MAX_CACHED_TRANSITIONS = 500

type ShiftSpan = { siteId: number, startMs: number, endMs: number, flagged: boolean }

function firstEvent(day: LightDay, type: string): string | null {
  return day.events.find(e => e.type === type)?.at ?? null
}

function lastEvent(day: LightDay, type: string): string | null {
  return day.events.filter(e => e.type === type).pop()?.at ?? null
}

/** One board column from the engine's day, the day before it, and the shifts that overlap it. */
export function composeBoardDay(day: LightDay, previous: LightDay, spans: ShiftSpan[]): BoardDay {
  const startMs = Date.parse(day.periods[0]!.start)
  const endMs = Date.parse(day.periods[day.periods.length - 1]!.end)
  const overlapping = spans.filter(s => s.startMs < endMs && s.endMs > startMs)
  return {
    date: day.date,
    status: day.status,
    periods: day.periods,
    sunrise: firstEvent(day, 'sunrise'),
    sunset: lastEvent(day, 'sunset'),
    civilDawn: firstEvent(day, 'civil-dawn'),
    civilDusk: lastEvent(day, 'civil-dusk'),
    daylightMinutes: day.daylightMinutes,
    civilLightMinutes: day.civilLightMinutes,
    civilLightChange: day.civilLightMinutes - previous.civilLightMinutes,
    shifts: overlapping.length,
    flaggedShifts: overlapping.filter(s => s.flagged).length
  }
}

function findTransitionCached(site: Site, today: string, minCivilHours: number) {
  const key = `${site.latitude}|${site.longitude}|${site.timezone}|${today}|${minCivilHours}`
  if (!TRANSITION_CACHE.has(key)) {
    if (TRANSITION_CACHE.size >= MAX_CACHED_TRANSITIONS) TRANSITION_CACHE.clear()
    const next = findNextTransitions({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, today, minCivilHours })
    TRANSITION_CACHE.set(key, findNextTransition(next))
  }
  return TRANSITION_CACHE.get(key)!
}

/** The board entry of one site at an instant. */
export function composeBoardSite(site: Site, nowMs: number, minCivilHours: number, spans: ShiftSpan[]): BoardSite {
  const nowIso = formatInstantInZone(nowMs, site.timezone)
  const today = nowIso.slice(0, 10)
  const [yesterday, todayLight, tomorrowLight] = computeLightDays({
    latitude: site.latitude, longitude: site.longitude, timezone: site.timezone,
    from: shiftLocalDate(today, -1), to: shiftLocalDate(today, 1)
  }) as [LightDay, LightDay, LightDay]
  return {
    siteId: site.id,
    name: site.name,
    latitude: site.latitude,
    longitude: site.longitude,
    timezone: site.timezone,
    offset: nowIso.slice(19),
    today: composeBoardDay(todayLight, yesterday, spans),
    tomorrow: composeBoardDay(tomorrowLight, todayLight, spans),
    next: findTransitionCached(site, today, minCivilHours)
  }
}

/** The light board for every site that is not archived, by name. */
export function loadLightBoard(db: AppDatabase, nowMs: number, minCivilHours: number): BoardData {
  const rows = db.select().from(sites).where(isNull(sites.archivedAt)).orderBy(sites.name).all()
  // Today and tomorrow lie within a day and a half of now in every zone (offsets span −12 h to +14 h).
  const fromMs = nowMs - 2 * 86_400_000
  const toMs = nowMs + 3 * 86_400_000
  const spans: ShiftSpan[] = db.select({ siteId: shifts.siteId, startAt: shifts.startAt, endAt: shifts.endAt, flagged: shifts.flagged })
    .from(shifts).where(and(isNull(shifts.cancelledAt), lt(shifts.startAt, new Date(toMs)), gt(shifts.endAt, new Date(fromMs)))).all()
    .map(r => ({ siteId: r.siteId, startMs: r.startAt.getTime(), endMs: r.endAt.getTime(), flagged: r.flagged }))
  return {
    generatedAt: new Date(nowMs).toISOString(),
    minCivilHours,
    sites: rows.map(site => composeBoardSite(site, nowMs, minCivilHours, spans.filter(s => s.siteId === site.id)))
  }
}
