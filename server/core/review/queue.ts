// Shaping of the safety review queue: the light strip of a shift, the cold figures over its hours,
// who is on it, and the cautions that go with them. Pure TypeScript (no framework or database
// imports), so it is unit-tested directly; server/utils/reviews.ts loads the rows and calls it.
import { BANDS_MEETING_REQUIREMENT, BAND_KINDS, type BandKind, type LightPeriodMs, type LightRequirement } from '../../../shared/light'
import { COLD_CAUTIONS, type FrostbiteRiskKey } from '../../../shared/cold'
import { formatSigned } from '../../../shared/review'
import { formatDuration, formatLocalTime, formatUtcOffset } from '../../../shared/format'
import { classifyFrostbiteRisk, computeWindChill, lookupWarmupSchedule, type WarmupSchedule } from '../cold/index'
import type { ShiftReply } from '../../../shared/types/shift'
import { formatZonedIso } from '../time/zoned'
import { findLowestBy, findWindowExtremes } from '../../../shared/weather-window'

const MINUTE_MS = 60_000
// Frostbite bands from which exposed skin can freeze within 30 minutes (ECCC wind chill table).
const FREEZING_BANDS: readonly FrostbiteRiskKey[] = ['high', 'very-high', 'severe', 'extreme']
// The wind chill index applies at or below 10 °C (NWS / ECCC 2001): from there on, cold cautions apply.
const COLD_CAUTION_FROM_C = 10

export interface LightStripSegment {
  kind: BandKind
  start: string
  end: string
  minutes: number
  /** Whether this band gives the light the shift's requirement asks for. */
  meetsRequirement: boolean
}

/** One weather reading: a forecast hour or an observation, metric. */
export interface WeatherSample {
  atMs: number
  temperatureC: number
  windKmh: number
  gustKmh: number | null
}

export interface WorstWarmupHour extends WarmupSchedule {
  at: string
  temperatureC: number
  windKmh: number
  sunUp: boolean
}

export interface ColdWindowFigures {
  samples: number
  first: string
  last: string
  coldestTemperatureC: number
  strongestWindKmh: number
  strongestGustKmh: number | null
  /** Whole-degree °C, as the charts print it; null where the index is defined in no sample. */
  worstWindChill: { roundedC: number, exactC: number, at: string } | null
  frostbite: { key: FrostbiteRiskKey, label: string, minMinutes: number | null, maxMinutes: number | null, basis: 'wind-chill' | 'air-temperature' }
  /** The most restrictive hour of the 4-hour work/warm-up schedule (moderate to heavy work). */
  warmup: WorstWarmupHour
  /** The same hour for light work or little movement (the schedule's next colder row). */
  warmupLightWork: Pick<WarmupSchedule, 'kind' | 'maxWorkMinutes' | 'breaks' | 'stopWork'>
}

export type ForecastAvailability = 'fresh' | 'stale' | 'none' | 'not-covered'

export interface WindowWeather {
  basis: 'forecast' | 'observations' | 'none'
  /** What a person reads first: where the figures come from, or that there are none. */
  label: string
  forecast: {
    state: ForecastAvailability
    fetchedAt: string | null
    source: string | null
    lastAttempt: { at: string, status: string } | null
  }
  observations: { count: number, first: string | null, last: string | null }
  figures: ColdWindowFigures | null
}

export interface ReviewCaution {
  key: string
  tone: 'caution' | 'stop'
  title: string
  figure?: string
  text: string
  /** General cold guidance, shown in full on the shift's page rather than in the queue list. */
  general: boolean
}

export interface ReviewCrew {
  count: number
  names: string[]
  alone: boolean
  nobody: boolean
}

export interface ReviewQueueItem {
  shift: ShiftReply
  /** An earlier decision exists but the shift changed after it (ShiftReply.review.current is false). */
  changedSinceReview: boolean
  light: {
    requirement: LightRequirement
    minutesBelow: number
    bandMinutes: Record<BandKind, number>
    /** Minutes of the shift with the sun's centre below −0.833° (not `day`). */
    sunDownMinutes: number
    strip: LightStripSegment[]
  }
  minutesBelow: number
  weather: WindowWeather
  crew: ReviewCrew
  cautions: ReviewCaution[]
}

/** Turns a shift's clipped light bands into strip segments with times in the site's zone. */
export function buildLightStrip(bands: LightPeriodMs[], requirement: LightRequirement, timezone: string): LightStripSegment[] {
  const meeting = BANDS_MEETING_REQUIREMENT[requirement]
  return bands.filter(b => b.endMs > b.startMs).map(b => ({
    kind: b.kind,
    start: formatZonedIso(b.startMs, timezone),
    end: formatZonedIso(b.endMs, timezone),
    minutes: Math.round((b.endMs - b.startMs) / MINUTE_MS),
    meetsRequirement: meeting.includes(b.kind)
  }))
}

/** Adds up the minutes of each band (rounded to whole minutes per band). */
export function sumBandMinutes(bands: LightPeriodMs[]): Record<BandKind, number> {
  const exact = Object.fromEntries(BAND_KINDS.map(k => [k, 0])) as Record<BandKind, number>
  for (const b of bands) exact[b.kind] += (b.endMs - b.startMs) / MINUTE_MS
  // Round the total, not each band (largest remainder): the bands of a 10:00–14:00 shift add up to
  // 4 h exactly, never "4 h 1 min" from three bands each rounded up.
  const totals = Object.fromEntries(BAND_KINDS.map(k => [k, Math.floor(exact[k])])) as Record<BandKind, number>
  let left = Math.round(BAND_KINDS.reduce((n, k) => n + exact[k], 0)) - BAND_KINDS.reduce((n, k) => n + totals[k], 0)
  for (const k of [...BAND_KINDS].sort((a, b) => (exact[b] - Math.floor(exact[b])) - (exact[a] - Math.floor(exact[a])))) {
    if (left <= 0) break
    totals[k]++
    left--
  }
  return totals
}

/** Whether the sun is up (band `day`) at an instant, read on the shift's bands clipped to the shift. */
export function isSunUpAt(bands: LightPeriodMs[], ms: number): boolean {
  if (!bands.length) return false
  const first = bands[0]!.startMs
  const last = bands[bands.length - 1]!.endMs
  // A bracketing sample just outside the shift is judged by the shift's nearest minute.
  const at = Math.min(Math.max(ms, first), last - 1)
  return bands.some(b => b.kind === 'day' && at >= b.startMs && at < b.endMs)
}

// Severity of a schedule cell, for picking the worst hour: stop > shorter work period > normal.
function rankWarmup(w: WarmupSchedule): number {
  if (w.stopWork) return 10_000
  if (w.kind === 'limited') return 1_000 - (w.maxWorkMinutes ?? 0)
  return w.kind === 'normal-breaks' ? 1 : 0
}

function pickWorstWarmupHour(samples: WeatherSample[], bands: LightPeriodMs[], timezone: string): WorstWarmupHour {
  let worst: WorstWarmupHour | null = null
  let worstRank = -1
  for (const s of samples) {
    const sunUp = isSunUpAt(bands, s.atMs)
    const schedule = lookupWarmupSchedule(s.temperatureC, s.windKmh, 'moderate-heavy', { sunUp })
    const rank = rankWarmup(schedule)
    // Ties go to the colder hour: the cautious reading.
    if (rank > worstRank || (rank === worstRank && worst && s.temperatureC < worst.temperatureC)) {
      worst = { ...schedule, at: formatZonedIso(s.atMs, timezone), temperatureC: s.temperatureC, windKmh: s.windKmh, sunUp }
      worstRank = rank
    }
  }
  return worst!
}

function findWorstWindChill(samples: WeatherSample[], timezone: string): ColdWindowFigures['worstWindChill'] {
  const worst = findLowestBy(samples, s => computeWindChill(s.temperatureC, s.windKmh, 'metric').exact)
  if (!worst) return null
  const chill = computeWindChill(worst.sample.temperatureC, worst.sample.windKmh, 'metric')
  return { roundedC: chill.rounded!, exactC: worst.value, at: formatZonedIso(worst.sample.atMs, timezone) }
}

/** Cold figures over the samples of a shift's window: coldest, windiest, worst wind chill, frostbite band, worst warm-up hour. */
export function summariseColdForWindow(samples: WeatherSample[], bands: LightPeriodMs[], timezone: string): ColdWindowFigures | null {
  if (!samples.length) return null
  const sorted = [...samples].sort((a, b) => a.atMs - b.atMs)
  const extremes = findWindowExtremes(sorted)!
  const coldest = extremes.coldestTemperatureC
  const worstWindChill = findWorstWindChill(sorted, timezone)
  // ECCC bands are read on the wind chill; where the index is undefined, on the air temperature (as cold.ts does).
  const band = classifyFrostbiteRisk(worstWindChill ? worstWindChill.exactC : coldest)
  const warmup = pickWorstWarmupHour(sorted, bands, timezone)
  const light = lookupWarmupSchedule(warmup.temperatureC, warmup.windKmh, 'light', { sunUp: warmup.sunUp })
  return {
    samples: sorted.length,
    first: formatZonedIso(sorted[0]!.atMs, timezone),
    last: formatZonedIso(sorted[sorted.length - 1]!.atMs, timezone),
    ...extremes,
    worstWindChill,
    frostbite: { key: band.key, label: band.label, minMinutes: band.minMinutes, maxMinutes: band.maxMinutes, basis: worstWindChill ? 'wind-chill' : 'air-temperature' },
    warmup,
    warmupLightWork: { kind: light.kind, maxWorkMinutes: light.maxWorkMinutes, breaks: light.breaks, stopWork: light.stopWork }
  }
}

/** Who is on the shift, with the two cases a reviewer must not miss: nobody, or one person alone. */
export function describeReviewCrew(assignees: { id: number, name: string }[]): ReviewCrew {
  return { count: assignees.length, names: assignees.map(a => a.name), alone: assignees.length === 1, nobody: assignees.length === 0 }
}

function describeWarmupFigure(w: WorstWarmupHour, timezone: string): string {
  const at = `${formatLocalTime(w.at, timezone)} ${formatUtcOffset(w.at, timezone)}`
  return `${formatSigned(w.temperatureC)} °C, wind ${Math.round(w.windKmh)} km/h at ${at}`
}

function collectColdCautions(weather: WindowWeather, timezone: string): ReviewCaution[] {
  const figures = weather.figures
  const out: ReviewCaution[] = []
  if (figures?.warmup.stopWork) {
    out.push({ key: 'stop-work', tone: 'stop', general: false, title: 'Non-emergency work should stop at the forecast cold and wind', figure: describeWarmupFigure(figures.warmup, timezone), text: 'At this air temperature and wind the 4-hour work/warm-up schedule (ACGIH, moderate to heavy work) lists no work period: only emergency work should go ahead.' })
  } else if (figures?.warmupLightWork.stopWork) {
    out.push({ key: 'stop-work-light', tone: 'caution', general: false, title: 'Light work or little movement: the schedule says stop at the worst hour', figure: describeWarmupFigure(figures.warmup, timezone), text: 'For light work or standing still the schedule uses the next colder row, which lists no work period at the coldest hour.' })
  }
  if (figures && FREEZING_BANDS.includes(figures.frostbite.key)) {
    const chill = figures.worstWindChill ? `Wind chill ${formatSigned(figures.worstWindChill.roundedC)}` : `Air ${formatSigned(figures.coldestTemperatureC)} °C`
    out.push({ key: 'frostbite-time', tone: 'caution', general: false, title: figures.frostbite.label, figure: chill, text: 'Cover all skin, watch each other\'s faces and hands, and plan how someone gets to warmth quickly.' })
  }
  if (figures && !figures.warmup.sunUp && figures.warmup.kind !== 'outside-table') {
    out.push({ key: 'sunshine-assumed', tone: 'caution', general: false, title: 'The sun is down in the hour the schedule was read for', text: COLD_CAUTIONS['sunshine-assumed'] })
  }
  if (figures?.warmup.windBeyondTable && figures.warmup.kind !== 'outside-table') {
    out.push({ key: 'wind-beyond-table', tone: 'caution', general: false, title: 'Wind beyond the schedule', text: COLD_CAUTIONS['wind-beyond-table'] })
  }
  return out
}

function collectWeatherGapCautions(weather: WindowWeather): ReviewCaution[] {
  if (weather.basis === 'none') {
    return [{ key: 'no-forecast', tone: 'caution', general: false, title: 'No forecast for these hours', text: 'The cold figures are unknown. Fetch a forecast or enter readings from the site before deciding, and plan for the cold the season can bring.' }]
  }
  if (weather.basis === 'forecast' && weather.forecast.state === 'stale') {
    return [{ key: 'forecast-stale', tone: 'caution', general: false, title: 'Forecast stale', figure: weather.label, text: 'The weather may have changed since. Fetch a new forecast before deciding if you can.' }]
  }
  if (weather.basis === 'observations') {
    return [{ key: 'observations-only', tone: 'caution', general: false, title: 'Figures from site readings, not a forecast', figure: weather.label, text: 'Readings show what was measured, not what the shift will meet. Check conditions again before work starts.' }]
  }
  return []
}

function collectDarkCautions(minutesBelow: number, requirement: LightRequirement, bandMinutes: Record<BandKind, number>): ReviewCaution[] {
  if (minutesBelow < 1) return []
  const darker = bandMinutes.nautical + bandMinutes.astronomical + bandMinutes.night
  const needs = requirement === 'daylight' ? 'daylight' : 'at least civil twilight'
  const figure = darker > 0 ? `${formatDuration(darker)} in nautical twilight or darker` : `${formatDuration(minutesBelow)} in civil twilight`
  return [{
    key: 'below-light', tone: 'caution', general: false,
    title: `${formatDuration(minutesBelow)} below the light this task needs (${needs})`,
    figure,
    // USNO: beyond civil twilight, outdoor work normally needs artificial light; AMS and OSHA 29 CFR 1926.56:
    // natural light falls below the construction minimum well before civil dusk.
    text: 'Before civil dawn and after civil dusk, outdoor work normally needs artificial light; even in civil twilight natural light is far below what task work needs. Plan area and task lighting, and make sure people can see hazards and each other.'
  }]
}

function collectCrewCautions(crew: ReviewCrew): ReviewCaution[] {
  if (crew.nobody) {
    return [{ key: 'nobody-assigned', tone: 'caution', general: false, title: 'Nobody is assigned yet', text: 'The review cannot see who will be exposed. Check the shift again once people are named.' }]
  }
  if (crew.alone) {
    return [{ key: 'working-alone', tone: 'caution', general: false, title: 'One person alone in the dark or cold', figure: crew.names[0], text: COLD_CAUTIONS['working-alone'] }]
  }
  return []
}

function collectWorkRuleCautions(conflicts: ShiftReply['conflicts']): ReviewCaution[] {
  if (!conflicts?.length) return []
  return [{
    key: 'work-rules', tone: 'caution', general: false,
    title: `${conflicts.length} work-rule warning${conflicts.length === 1 ? '' : 's'} on this shift`,
    figure: conflicts[0]!.message,
    text: `${conflicts.map(c => c.message).join(' ')} Long hours and short rest add to the strain of cold and dark work; check the plan against your working-time procedures.`
  }]
}

const GENERAL_COLD_KEYS = ['exposed-skin-only', 'frostbite-signs', 'hypothermia-signs', 'wet-clothing', 'warm-shelter'] as const

/** The cautions for a queue item, most pressing first; general cold guidance last, flagged as general. */
export function collectReviewCautions(input: { minutesBelow: number, requirement: LightRequirement, bandMinutes: Record<BandKind, number>, crew: ReviewCrew, weather: WindowWeather, timezone: string, conflicts?: ShiftReply['conflicts'] }): ReviewCaution[] {
  const cold = input.weather.figures === null || input.weather.figures.coldestTemperatureC <= COLD_CAUTION_FROM_C
  const general: ReviewCaution[] = cold
    ? GENERAL_COLD_KEYS.map(key => ({ key, tone: 'caution' as const, general: true, title: GENERAL_TITLES[key], text: COLD_CAUTIONS[key] }))
    : []
  const specific = [
    ...collectColdCautions(input.weather, input.timezone),
    ...collectCrewCautions(input.crew),
    ...collectDarkCautions(input.minutesBelow, input.requirement, input.bandMinutes),
    ...collectWeatherGapCautions(input.weather),
    ...collectWorkRuleCautions(input.conflicts ?? [])
  ]
  const stops = specific.filter(c => c.tone === 'stop')
  return [...stops, ...specific.filter(c => c.tone !== 'stop'), ...general]
}

const GENERAL_TITLES: Record<typeof GENERAL_COLD_KEYS[number], string> = {
  'exposed-skin-only': 'Wind chill is about bare skin',
  'frostbite-signs': 'Signs of frostbite',
  'hypothermia-signs': 'Signs of hypothermia',
  'wet-clothing': 'Wet clothing',
  'warm-shelter': 'Warm shelter and getting used to the cold'
}

/** Assembles one queue item from a shift, its light profile and the weather over its window. */
export function shapeReviewQueueItem(shift: ShiftReply, check: { minutesBelow: number, bands: LightPeriodMs[] }, weather: WindowWeather): ReviewQueueItem {
  const bandMinutes = sumBandMinutes(check.bands)
  const crew = describeReviewCrew(shift.assignees)
  const requirement = shift.light
  return {
    shift,
    changedSinceReview: shift.review !== null && !shift.review.current,
    light: {
      requirement,
      minutesBelow: check.minutesBelow,
      bandMinutes,
      sunDownMinutes: BAND_KINDS.filter(k => k !== 'day').reduce((sum, k) => sum + bandMinutes[k], 0),
      strip: buildLightStrip(check.bands, requirement, shift.timezone)
    },
    minutesBelow: check.minutesBelow,
    weather,
    crew,
    cautions: collectReviewCautions({ minutesBelow: check.minutesBelow, requirement, bandMinutes, crew, weather, timezone: shift.timezone, conflicts: shift.conflicts })
  }
}

/** Soonest first; at the same start, the one with more minutes below its requirement first. */
export function compareReviewQueueItems(a: ReviewQueueItem, b: ReviewQueueItem): number {
  const byStart = Date.parse(a.shift.start) - Date.parse(b.shift.start)
  return byStart !== 0 ? byStart : b.minutesBelow - a.minutesBelow
}
