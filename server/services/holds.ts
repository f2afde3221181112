// The operator's weather holds in the database (settings key 'weather-holds') and each shift's hold
// from the forecast hours of its outing (readings from the field preferred where newer).
import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { settings, type Shift, type Site } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import { loadSiteHourlyWeather } from './site-weather'
import { evaluateWeatherHold, type HoldLevel } from '../core/cold/holds'
import { formatZonedIso } from '../core/time/zoned'
import type { ShiftReply } from '../../shared/types/shift'
import { describeHoldCause, describeOuting, HOLD_DEFERENCE_LINE } from '../../shared/field'
import type { FigureUnits } from '../../shared/units'

export const HOLDS_SETTING_KEY = 'weather-holds'
export const MAX_HOLD_LEVELS = 8

type Reader = Pick<AppDatabase, 'select'>

const figure = (label: string, min: number, max: number) => z.number({ error: `expected ${label}` })
  .min(min, `must be between ${min} and ${max}`).max(max, `must be between ${min} and ${max}`).nullable().optional()

const HoldLevelSchema = z.object({
  name: z.string({ error: 'expected a name' }).trim().min(1, 'required').max(60, 'must be at most 60 characters'),
  windKmh: figure('a wind speed in km/h', 0, 400),
  windChillC: figure('a wind chill in °C', -90, 20),
  visibilityM: figure('a visibility in metres', 0, 100_000),
  advice: z.string({ error: 'expected the advice' }).trim().min(1, 'required: what people should do at this level').max(1000)
}).strict().refine(l => l.windKmh != null || l.windChillC != null || l.visibilityM != null, { message: 'give at least one figure (windKmh, windChillC or visibilityM)', path: ['windKmh'] })

/** PATCH /api/settings/holds: the whole list, mildest first; names unique. */
export const HoldsBodySchema = z.object({
  levels: z.array(HoldLevelSchema, { error: 'expected a list of levels' }).max(MAX_HOLD_LEVELS, `at most ${MAX_HOLD_LEVELS} levels`)
}).strict().superRefine((body, ctx) => {
  const seen = new Set<string>()
  body.levels.forEach((l, i) => {
    const key = l.name.toLocaleLowerCase('en')
    if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['levels', i, 'name'], message: 'another level has this name' })
    seen.add(key)
  })
})

export interface HoldSettings { levels: HoldLevel[] }

/** The operator's levels; none until they set them (the product names no levels of its own). */
export function loadHoldSettings(db: Reader): HoldSettings {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, HOLDS_SETTING_KEY)).get()
  const parsed = HoldsBodySchema.safeParse(row?.value ?? { levels: [] })
  return parsed.success ? { levels: parsed.data.levels } : { levels: [] }
}

/** Replaces the levels and records who did, in one transaction. */
export function saveHoldSettings(db: AppDatabase, actorId: number, body: z.infer<typeof HoldsBodySchema>): HoldSettings {
  return db.transaction((tx) => {
    const before = loadHoldSettings(tx)
    const next = { levels: body.levels }
    tx.insert(settings).values({ key: HOLDS_SETTING_KEY, value: next }).onConflictDoUpdate({ target: settings.key, set: { value: next } }).run()
    recordAudit(tx, actorId, 'settings.holds', 'settings', null, { before, after: next })
    return next
  })
}

/**
 * Sets `weatherHold` on shift replies from the weather hours of each outing: one weather read per
 * site, one evaluation per shift. Null with no levels, no hours, or none reached.
 */
export function attachWeatherHolds<T extends Pick<ShiftReply, 'siteId' | 'start' | 'end' | 'timezone' | 'travelMinutes' | 'weatherHold'>>(db: Reader, views: T[], nowMs: number): T[] {
  const { levels } = loadHoldSettings(db)
  if (!levels.length || !views.length) return views
  const bySite = new Map<number, ReturnType<typeof loadSiteHourlyWeather>>()
  for (const view of views) {
    const travelMs = (view.travelMinutes ?? 0) * 60_000
    const fromMs = Date.parse(view.start) - travelMs
    const toMs = Date.parse(view.end) + travelMs
    if (!bySite.has(view.siteId)) bySite.set(view.siteId, loadSiteHourlyWeather(db, view.siteId, nowMs))
    const hold = evaluateWeatherHold(levels, bySite.get(view.siteId)!, fromMs, toMs)
    view.weatherHold = hold
      ? { level: hold.level, at: formatZonedIso(hold.atMs, view.timezone), cause: hold.cause, advice: hold.advice, value: Math.round(hold.value * 10) / 10, limit: hold.limit }
      : null
  }
  return views
}

/** What the evening-before reminder adds per shift: when to leave and be back, and its weather hold. */
export interface FieldReminderNote {
  outing: string | null
  caution: { title: string, figure: string | null, text: string, tone: 'caution' | 'stop' } | null
}

/** The reminder's field lines for a person's shifts, in their units. */
export function buildFieldReminderNotes(db: Reader, rows: Shift[], siteById: Map<number, Pick<Site, 'id' | 'timezone'>>, units: FigureUnits, nowMs: number): Map<number, FieldReminderNote> {
  const views = rows.map((row) => {
    const site = siteById.get(row.siteId)!
    return { id: row.id, siteId: row.siteId, timezone: site.timezone, start: formatZonedIso(row.startAt.getTime(), site.timezone), end: formatZonedIso(row.endAt.getTime(), site.timezone), travelMinutes: row.travelMinutes, weatherHold: null as ShiftReply['weatherHold'] }
  })
  attachWeatherHolds(db, views, nowMs)
  return new Map(views.map(v => [v.id, {
    outing: v.travelMinutes ? describeOuting(v.start, v.end, v.travelMinutes, v.timezone) : null,
    caution: v.weatherHold
      ? { title: `Weather hold: ${v.weatherHold.level}`, figure: describeHoldCause(v.weatherHold, units), text: `Your operator's advice: ${v.weatherHold.advice} ${HOLD_DEFERENCE_LINE}`, tone: 'caution' as const }
      : null
  }]))
}

/** Adds the field lines to one site's block of a reminder (its shifts in the view's order). */
export function addFieldReminderNotes<S extends { shifts: { span: string, cautions: FieldReminderNote['caution'][] }[] }>(site: S, shiftIds: number[], notes: Map<number, FieldReminderNote>): S {
  site.shifts.forEach((shift, i) => {
    const note = notes.get(shiftIds[i]!)
    if (!note) return
    if (note.outing) shift.span = `${shift.span} · ${note.outing}`
    if (note.caution) shift.cautions.push(note.caution)
  })
  return site
}
