// A person's day at a site, as the crew home (GET /api/me/today) and the evening-before reminder show
// it: the light window from the light engine, their shifts with light state and review decision, the
// weather from the stored forecast, and the cautions. Explicit imports only (no Nitro auto-imports),
// so unit tests can run it against a fresh database.
import { formatTemperature, formatWind, type FigureUnits } from '../../shared/units'
import { and, asc, eq, gt, inArray, isNull, lt } from 'drizzle-orm'
import { people, shiftAssignees, shifts, sites, type Person, type Shift, type Site } from '../db/schema'
import type { LightPeriod, LightPeriodMs, LightRequirement } from '../../shared/light'
import { COLD_CAUTIONS } from '../../shared/cold'
import { REQUIREMENT_NAMES, describeRequirement } from '../../shared/planning'
import { addDays, formatDate, formatDuration, formatLocalTime, formatUtcOffset } from '../../shared/format'
import { REVIEW_STATE_WORDS, describeMitigation, describeReviewReason } from '../../shared/review'
import type { AppDatabase } from '../utils/db'
import { computeLightDaysMs, computeLightPeriodsInRange } from '../core/light/index'
import { MAX_SHIFT_MS, loadAssignees, loadLatestReviews, type ShiftReviewSummary } from './shifts'
import { describeWindowWeather, loadSiteForecast, loadSiteObservations, type SiteForecastState } from './site-weather'
import { sumBandMinutes, type ColdWindowFigures, type WindowWeather } from '../core/review/queue'
import { formatZonedIso } from '../core/time/zoned'
import { localDateOf, localMidnightMs } from '../core/time/zone-table'
import { summariseMoonDays, type MoonDaySummary } from '../core/light/moon'
import { nowDate, nowMs as clockNowMs } from '../core/time/clock'

const DAY_MS = 86_400_000
// the crew home lists the sites where the person works within this horizon
const CREW_HOME_HORIZON_MS = 7 * DAY_MS
// ECCC wind chill bands from which bare skin can freeze within 30 minutes
const FREEZING_KEYS = ['high', 'very-high', 'severe', 'extreme']

export interface CrewMoment { at: string, time: string, offset: string }

export interface CrewLightDay {
  date: string
  dateLabel: string
  status: 'midnight-sun' | 'polar-night' | 'rises-and-sets'
  statusWords: string
  sunrise: CrewMoment[]
  sunset: CrewMoment[]
  civilDawn: CrewMoment[]
  civilDusk: CrewMoment[]
  solarNoon: CrewMoment
  noonAltitude: number
  daylightMinutes: number
  civilLightMinutes: number
  /** Minutes more (+) or less (−) than the day before. */
  daylightChange: number
  civilLightChange: number
  daylightText: string
  civilLightText: string
  daylightChangeText: string
  civilLightChangeText: string
  periods: LightPeriod[]
  /** The light window as labelled rows, in the order the home screen and the reminder show them. */
  rows: CrewLightRow[]
  /** The moon over the day: spans for the strip (site zone), words with times in the display zone. */
  moon: MoonDaySummary
}

export interface CrewLightRow {
  key: 'civil-dawn' | 'sunrise' | 'solar-noon' | 'sunset' | 'civil-dusk' | 'daylight' | 'civil-light'
  label: string
  /** The instants of a time row (none on a day without that crossing; two when a band is entered twice). */
  moments: CrewMoment[]
  /** What a person reads: `09:40 UTC+01:00`, `3 h 25 min`, or why there is no such time. */
  value: string
  note: string | null
}

export interface CrewCaution { key: string, tone: 'caution' | 'stop', title: string, figure: string | null, text: string }

export interface CrewShift {
  id: number
  siteId: number
  title: string
  start: string
  end: string
  span: string
  /** The span's clock times and its zone offset separately, for big type on the home screen. */
  timeText: string
  offsetText: string
  requirement: LightRequirement
  requirementWords: string
  minutesBelow: number
  flagged: boolean
  lightState: string
  bandMinutes: { day: number, civil: number, dark: number }
  profileText: string
  reviewState: Shift['reviewState']
  reviewWords: string
  /** Why the shift went to safety review, each in words with its figure. */
  reviewReasons: string[]
  /** A decision was recorded but the shift changed after it. */
  reviewChanged: boolean
  reviewNote: string
  mitigations: string[]
  crewmates: string[]
  alone: boolean
  notes: string
  weather: string
  cautions: CrewCaution[]
}

export interface CrewDay extends CrewLightDay {
  which: 'today' | 'tomorrow' | 'day'
  shifts: CrewShift[]
  weather: string
}

export interface CrewSiteView {
  id: number
  name: string
  latitude: number
  longitude: number
  timezone: string
  /** The zone the times are written in (the site's, or the person's own choice). */
  zone: string
  zoneNote: string
  forecastNote: string
  days: CrewDay[]
}

/** The zone a person's times are written in: the site's own, or the one they chose in settings. */
export function resolveDisplayZone(preference: string, siteZone: string): string {
  return preference && preference !== 'site' ? preference : siteZone
}

// Shown to the nearest minute, as almanacs print rise and set times (09:18:45 reads 09:19).
function toMoment(ms: number, zone: string): CrewMoment {
  const minute = Math.round(ms / 60_000) * 60_000
  return { at: formatZonedIso(ms, zone), time: formatLocalTime(minute, zone), offset: formatUtcOffset(minute, zone) }
}

/** Plain words for a day's status (polar night, midnight sun), with how much civil light is left. */
export function describeDayStatus(status: CrewLightDay['status'], civilLightMinutes: number): string {
  if (status === 'midnight-sun') return 'Midnight sun: the sun stays above the horizon all day and night'
  if (status === 'rises-and-sets') return 'The sun rises and sets'
  return civilLightMinutes > 0
    ? `Polar night: the sun stays below the horizon all day; civil twilight for ${formatDuration(civilLightMinutes)} around noon`
    : 'Polar night: the sun stays below the horizon, and there is no civil light at all'
}

function momentsValue(moments: CrewMoment[], empty: string): string {
  return moments.length ? moments.map(m => `${m.time} ${m.offset}`).join(' and ') : empty
}

// Why a crossing is missing: the whole day is on one side of its threshold, or it falls on another date.
function describeMissing(kind: 'sun' | 'civil', day: Omit<CrewLightDay, 'rows' | 'moon'>): string {
  if (kind === 'sun' && day.status === 'polar-night') return 'none: polar night'
  if (kind === 'sun' && day.status === 'midnight-sun') return 'none: the sun is up all day'
  if (kind === 'civil' && day.civilLightMinutes === 0) return 'none: no civil light'
  if (kind === 'civil' && day.periods.every(p => p.kind === 'day' || p.kind === 'civil')) return 'none: civil light all day'
  return 'none on this date'
}

/** The light window as rows: civil dawn, sunrise, solar noon, sunset, civil dusk, daylight, civil light. */
export function describeLightRows(day: Omit<CrewLightDay, 'rows' | 'moon'>): CrewLightRow[] {
  const time = (key: CrewLightRow['key'], label: string, moments: CrewMoment[], kind: 'sun' | 'civil'): CrewLightRow =>
    ({ key, label, moments, value: momentsValue(moments, describeMissing(kind, day)), note: null })
  const altitude = Math.round(day.noonAltitude * 10) / 10
  return [
    time('civil-dawn', 'Civil dawn', day.civilDawn, 'civil'),
    time('sunrise', 'Sunrise', day.sunrise, 'sun'),
    { key: 'solar-noon', label: 'Solar noon', moments: [day.solarNoon], value: momentsValue([day.solarNoon], ''), note: `sun ${Math.abs(altitude)}° ${altitude >= 0 ? 'above' : 'below'} the horizon` },
    time('sunset', 'Sunset', day.sunset, 'sun'),
    time('civil-dusk', 'Civil dusk', day.civilDusk, 'civil'),
    { key: 'daylight', label: 'Daylight', moments: [], value: day.daylightText, note: day.daylightChangeText },
    { key: 'civil-light', label: 'Civil light', moments: [], value: day.civilLightText, note: day.civilLightChangeText }
  ]
}

/** `−27 min since yesterday`, `+1 h 4 min since yesterday`, `same as yesterday`. */
export function describeMinutesChange(delta: number, since: string): string {
  if (delta === 0) return `same as ${since}`
  return `${delta < 0 ? '−' : '+'}${formatDuration(Math.abs(delta))} since ${since}`
}

// How the day before is named: relative to the site's today when it is near, else plainly.
function nameDayBefore(date: string, today: string | undefined): string {
  if (date === today) return 'yesterday'
  if (today && date === addDays(today, 1)) return 'today'
  return 'the day before'
}

/** The light of each local date from..to at a site, times written in `zone`, with the change from the day before. */
export function summariseCrewLightDays(site: Pick<Site, 'latitude' | 'longitude' | 'timezone'>, from: string, to: string, zone: string, today?: string): CrewLightDay[] {
  const days = computeLightDaysMs({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, from: addDays(from, -1), to })
  const moons = summariseMoonDays({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, from, to, zone, formatTime: formatLocalTime })
  return days.slice(1).map((day, i) => {
    const before = days[i]!
    const events = (type: string) => day.events.filter(e => e.type === type).map(e => toMoment(e.atMs, zone))
    const since = nameDayBefore(day.date, today)
    const summary: Omit<CrewLightDay, 'rows' | 'moon'> = {
      date: day.date,
      dateLabel: formatDate(day.date),
      status: day.status,
      statusWords: describeDayStatus(day.status, day.civilLightMinutes),
      sunrise: events('sunrise'),
      sunset: events('sunset'),
      civilDawn: events('civil-dawn'),
      civilDusk: events('civil-dusk'),
      solarNoon: toMoment(day.solarNoonMs, zone),
      noonAltitude: day.maxAltitude,
      daylightMinutes: day.daylightMinutes,
      civilLightMinutes: day.civilLightMinutes,
      daylightChange: day.daylightMinutes - before.daylightMinutes,
      civilLightChange: day.civilLightMinutes - before.civilLightMinutes,
      daylightText: formatDuration(day.daylightMinutes),
      civilLightText: formatDuration(day.civilLightMinutes),
      daylightChangeText: describeMinutesChange(day.daylightMinutes - before.daylightMinutes, since),
      civilLightChangeText: describeMinutesChange(day.civilLightMinutes - before.civilLightMinutes, since),
      // the bands of the site's local day, on the site's wall clock (a strip runs midnight to midnight there)
      periods: day.periods.map(p => ({ kind: p.kind, start: formatZonedIso(p.startMs, site.timezone), end: formatZonedIso(p.endMs, site.timezone) }))
    }
    const { date: _date, ...moon } = moons[i]!
    return { ...summary, rows: describeLightRows(summary), moon }
  })
}

/** A shift's clock times (`08:00–14:00`, the end's date added when it falls on another local day) and offset (both across a clock change). */
export function splitCrewSpan(startMs: number, endMs: number, zone: string): { timeText: string, offsetText: string } {
  const sameDay = localDateOf(startMs, zone) === localDateOf(endMs, zone)
  const end = sameDay ? formatLocalTime(endMs, zone) : `${formatDate(localDateOf(endMs, zone))} ${formatLocalTime(endMs, zone)}`
  const a = formatUtcOffset(startMs, zone)
  const b = formatUtcOffset(endMs, zone)
  return { timeText: `${formatLocalTime(startMs, zone)}–${end}`, offsetText: a === b ? a : `${a} → ${b} (clocks change)` }
}

/** `08:00–14:00 UTC+01:00`, with the end's date when it falls on another local day, and both offsets across a clock change. */
export function describeCrewSpan(startMs: number, endMs: number, zone: string): string {
  const { timeText, offsetText } = splitCrewSpan(startMs, endMs, zone)
  return `${timeText} ${offsetText}`
}

function describeLightState(requirement: LightRequirement, minutesBelow: number, darkMinutes: number): string {
  if (requirement === 'any') {
    return darkMinutes > 0 ? `Lit work area: ${formatDuration(darkMinutes)} of it after civil dusk or before civil dawn` : 'Lit work area: all of it in daylight or civil twilight'
  }
  if (minutesBelow >= 1) return `Short of its light need for ${formatDuration(minutesBelow)}`
  return 'The sun gives the light this work needs for the whole shift (cloud and terrain can still make it darker)'
}

function describeProfile(minutes: { day: number, civil: number, dark: number }): string {
  const parts = [
    minutes.day ? `daylight ${formatDuration(minutes.day)}` : '',
    minutes.civil ? `civil twilight ${formatDuration(minutes.civil)}` : '',
    minutes.dark ? `darker ${formatDuration(minutes.dark)}` : ''
  ].filter(Boolean)
  return parts.length ? parts.join(' · ') : 'no light figures'
}

/** Plain words for a shift's review state and latest decision. */
// Each begins with the state's one word (REVIEW_STATE_WORDS), the same as on every other screen.
export function describeReviewWords(state: Shift['reviewState'], review: ShiftReviewSummary | null): string {
  const who = review ? ` by ${review.reviewerName}` : ''
  const word = REVIEW_STATE_WORDS[state]
  switch (state) {
    case 'not-needed': return word
    case 'pending': return review && !review.current ? `${word} again: the shift changed after the last decision` : word
    case 'approved': return `${word}${who}`
    case 'rejected': return `${word}${who}: speak to your coordinator before any of this work starts`
    case 'changes-requested': return `${word}${who}: speak to your coordinator before starting`
  }
}

// in the person's units (metric: °C and km/h as computed; imperial: converted for display)
function describeWeatherWords(weather: WindowWeather, units: FigureUnits = 'metric'): string {
  const f = weather.figures
  if (!f) return weather.basis === 'none' ? `${weather.label}.` : weather.label
  const gust = f.strongestGustKmh !== null ? `, gusts ${formatWind(f.strongestGustKmh, units)}` : ''
  const chill = f.worstWindChill ? `; wind chill down to ${units === 'imperial' ? formatTemperature(f.worstWindChill.roundedC, units) : signed(f.worstWindChill.roundedC)}` : ''
  return `Coldest ${formatTemperature(f.coldestTemperatureC, units)}, wind up to ${formatWind(f.strongestWindKmh, units)}${gust}${chill}. ${f.frostbite.label}. (${weather.label})`
}

function signed(value: number): string {
  return value < 0 ? `−${Math.abs(value)}` : String(value)
}

function collectColdCrewCautions(f: ColdWindowFigures | null): CrewCaution[] {
  if (!f) return []
  const out: CrewCaution[] = []
  const at = `${signed(Math.round(f.warmup.temperatureC))} °C, wind ${Math.round(f.warmup.windKmh)} km/h at ${f.warmup.at.slice(11, 16)}`
  if (f.warmup.stopWork) {
    out.push({ key: 'cold-stop', tone: 'stop', title: 'Cold: the schedule says non-emergency work should stop', figure: at, text: 'At this air temperature and wind the 4-hour work/warm-up schedule (ACGIH, moderate to heavy work) lists no work period. Check with your supervisor before going out.' })
  } else if (f.warmup.kind === 'limited') {
    out.push({ key: 'cold-warmup', tone: 'caution', title: `Cold: work at most ${f.warmup.maxWorkMinutes} min between warm-up breaks`, figure: `${f.warmup.breaks} warm-up breaks of 10 min in 4 hours · ${at}`, text: `From the 4-hour work/warm-up schedule (ACGIH) for moderate to heavy work, read at the hardest hour. Light work or standing still needs more breaks.${f.warmup.sunUp ? '' : ' ' + COLD_CAUTIONS['sunshine-assumed']}` })
  }
  if (FREEZING_KEYS.includes(f.frostbite.key)) {
    const figure = f.worstWindChill ? `Wind chill ${signed(f.worstWindChill.roundedC)}` : `Air ${signed(Math.round(f.coldestTemperatureC))} °C`
    out.push({ key: 'frostbite', tone: 'caution', title: f.frostbite.label, figure, text: `Cover all skin and check each other's faces and hands. ${COLD_CAUTIONS['frostbite-signs']}` })
  }
  return out
}

function collectLightCrewCautions(requirement: LightRequirement, minutesBelow: number, darkMinutes: number): CrewCaution[] {
  // USNO: beyond civil twilight outdoor work normally needs artificial light; AMS glossary and OSHA
  // 29 CFR 1926.56: natural light is below task lighting well before civil dusk.
  const text = 'Past civil dusk, outdoor work normally needs artificial light, and even in civil twilight natural light is far below task lighting. Bring and check your lights, wear high-visibility clothing, and keep to the measures the safety review set.'
  const litText = 'The work area is meant to be lit, but getting there and back, and anything outside the lit area, is in the dark. Check the lighting before you start, carry a head torch, and wear high-visibility clothing.'
  if (requirement !== 'any' && minutesBelow >= 1) {
    const need = REQUIREMENT_NAMES[requirement]
    return [{ key: 'below-light', tone: 'caution', title: `${formatDuration(minutesBelow)} of this shift without the ${need} it needs`, figure: darkMinutes ? `${formatDuration(darkMinutes)} in nautical twilight or darker` : null, text }]
  }
  if (requirement === 'any' && darkMinutes >= 1) {
    return [{ key: 'dark-work', tone: 'caution', title: 'Work in the dark, under artificial light', figure: `${formatDuration(darkMinutes)} after civil dusk or before civil dawn`, text: litText }]
  }
  return []
}

const ALONE_CAUTION: CrewCaution = {
  key: 'working-alone',
  tone: 'caution',
  title: 'You are the only person on this shift',
  figure: null,
  text: 'Agree a check-in schedule with your coordinator before you start, carry a way to call for help, and follow your employer\'s procedure for working alone; several jurisdictions require one.'
}

export interface ShiftDescriptionInput {
  row: Shift
  site: Pick<Site, 'latitude' | 'longitude'>
  zone: string
  personId: number
  assignees: { id: number, name: string }[]
  review: ShiftReviewSummary | null
  forecast: SiteForecastState
  observations: ReturnType<typeof loadSiteObservations>
  /** The shift's light bands when the caller has them already (the feed slices one trace per site). */
  bands?: LightPeriodMs[]
  /** The reader's units for the weather words (metric when absent). */
  units?: FigureUnits
}

/** One shift as a crew member reads it: when, what light it needs and gets, the review, weather and cautions. */
export function describeCrewShift(input: ShiftDescriptionInput): CrewShift {
  const { row, site, zone } = input
  const startMs = row.startAt.getTime()
  const endMs = row.endAt.getTime()
  const bands: LightPeriodMs[] = input.bands ?? computeLightPeriodsInRange(site.latitude, site.longitude, startMs, endMs)
  const sums = sumBandMinutes(bands)
  const bandMinutes = { day: sums.day, civil: sums.civil, dark: sums.nautical + sums.astronomical + sums.night }
  const weather = describeWindowWeather(input.forecast, input.observations, { startMs, endMs, bands, timezone: zone })
  const alone = input.assignees.length === 1
  return {
    id: row.id, siteId: row.siteId, title: row.title,
    start: formatZonedIso(startMs, zone), end: formatZonedIso(endMs, zone), span: describeCrewSpan(startMs, endMs, zone), ...splitCrewSpan(startMs, endMs, zone),
    requirement: row.light, requirementWords: `Needs ${describeRequirement(row.light)}`,
    minutesBelow: row.minutesBelow, flagged: row.flagged,
    lightState: describeLightState(row.light, row.minutesBelow, bandMinutes.dark),
    bandMinutes, profileText: describeProfile(bandMinutes),
    reviewState: row.reviewState, reviewWords: describeReviewWords(row.reviewState, input.review),
    reviewReasons: (row.reviewReasons ?? []).map(r => describeReviewReason(r, zone)),
    reviewChanged: row.reviewState === 'pending' && input.review !== null && !input.review.current,
    reviewNote: input.review?.current ? input.review.note : '',
    mitigations: input.review?.current ? input.review.mitigations.map(describeMitigation) : [],
    crewmates: input.assignees.filter(a => a.id !== input.personId).map(a => a.name),
    alone, notes: row.notes, weather: describeWeatherWords(weather, input.units),
    cautions: [
      ...collectColdCrewCautions(weather.figures),
      ...collectLightCrewCautions(row.light, row.minutesBelow, bandMinutes.dark),
      ...(alone ? [ALONE_CAUTION] : [])
    ].sort((a, b) => (a.tone === 'stop' ? 0 : 1) - (b.tone === 'stop' ? 0 : 1))
  }
}

/** The person's shifts (not cancelled) overlapping [fromMs, toMs), soonest first. */
export function loadPersonShifts(db: AppDatabase, personId: number, fromMs: number, toMs: number): Shift[] {
  // a join, not a list of the person's shift ids (SQLite binds at most 32,766 parameters); no shift
  // lasts longer than MAX_SHIFT_MS, which bounds the start so the time index reads the range alone
  return db.select({ shift: shifts }).from(shiftAssignees)
    .innerJoin(shifts, eq(shifts.id, shiftAssignees.shiftId))
    .where(and(eq(shiftAssignees.personId, personId), isNull(shifts.cancelledAt), lt(shifts.startAt, new Date(toMs)), gt(shifts.startAt, new Date(fromMs - MAX_SHIFT_MS)), gt(shifts.endAt, new Date(fromMs))))
    .orderBy(asc(shifts.startAt)).all().map(r => r.shift)
}

export interface SiteDaysInput {
  site: Site
  dates: { date: string, which: CrewDay['which'] }[]
  person: Pick<Person, 'id' | 'displayZone'> & { units?: FigureUnits }
  shifts: Shift[]
  /** Which shifts belong to a date: those starting on it (reminders) or overlapping it (home). */
  match: 'starts' | 'overlaps'
  nowMs: number
}

/** The days of one site for one person: light window, their shifts, weather and cautions. */
export function buildCrewSiteView(db: AppDatabase, input: SiteDaysInput): CrewSiteView {
  const { site, dates, person } = input
  const zone = resolveDisplayZone(person.displayZone, site.timezone)
  const first = dates[0]!.date
  const last = dates[dates.length - 1]!.date
  const light = summariseCrewLightDays(site, first, last, zone, localDateOf(input.nowMs, site.timezone))
  const forecast = loadSiteForecast(db, site.id, input.nowMs)
  const rangeStart = localMidnightMs(first, site.timezone)
  const rangeEnd = localMidnightMs(addDays(last, 1), site.timezone)
  const observations = loadSiteObservations(db, site.id, rangeStart - 3 * 3_600_000, rangeEnd)
  const siteShifts = input.shifts.filter(s => s.siteId === site.id)
  const assignees = loadAssignees(db, siteShifts.map(s => s.id))
  const reviews = loadLatestReviews(db, siteShifts)
  const days = dates.map(({ date, which }, i) => {
    const dayStart = localMidnightMs(date, site.timezone)
    const dayEnd = localMidnightMs(addDays(date, 1), site.timezone)
    const onDay = siteShifts.filter(s => input.match === 'starts'
      ? s.startAt.getTime() >= dayStart && s.startAt.getTime() < dayEnd
      : s.startAt.getTime() < dayEnd && s.endAt.getTime() > dayStart)
    // A forecast starts at the hour it was fetched, not at midnight: for the day under way, read the
    // hours still ahead (from the start of the current hour), which is what a person plans with.
    const aheadMs = Math.max(dayStart, Math.floor(input.nowMs / 3_600_000) * 3_600_000)
    const underWay = aheadMs > dayStart && aheadMs < dayEnd
    const dayWeather = describeWindowWeather(forecast, observations, { startMs: underWay ? aheadMs : dayStart, endMs: dayEnd, bands: [], timezone: zone })
    return {
      ...light[i]!, which,
      shifts: onDay.map(row => describeCrewShift({ row, site, zone, personId: person.id, assignees: assignees.get(row.id) ?? [], review: reviews.get(row.id) ?? null, forecast, observations, units: person.units })),
      // with no forecast at all the site's forecast note says so once; no need to repeat it per day
      weather: forecast.latest ? `${underWay ? `From ${formatLocalTime(aheadMs, zone)} to midnight: ` : ''}${describeWeatherWords(dayWeather, person.units)}` : ''
    }
  })
  return {
    id: site.id, name: site.name, latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, zone,
    zoneNote: zone === site.timezone ? `Times in the site's zone, ${zone}` : `Times in your chosen zone, ${zone} (the site keeps ${site.timezone})`,
    forecastNote: describeForecastNote(forecast, zone),
    days
  }
}

function describeForecastNote(forecast: SiteForecastState, zone: string): string {
  if (!forecast.latest) return 'No forecast for this site yet.'
  const at = Date.parse(forecast.latest.fetchedAt)
  const when = `${formatDate(localDateOf(at, zone))} ${formatLocalTime(at, zone)} ${formatUtcOffset(at, zone)}`
  return forecast.state === 'stale' ? `Forecast from ${when}: more than 6 hours old, conditions may have changed.` : `Forecast fetched ${when} (${forecast.latest.source}).`
}

export interface CrewToday {
  generatedAt: string
  person: { id: number, name: string }
  displayZone: string
  basis: 'shifts' | 'all-sites'
  basisNote: string
  sites: CrewSiteView[]
  /** The person's shift under way or next within 7 days, with the light of its day; null when none. */
  next: CrewNextShift | null
}

export interface CrewNextShift {
  siteId: number
  siteName: string
  zoneNote: string
  /** The shift had started when the reply was made. */
  underWay: boolean
  day: Omit<CrewDay, 'shifts'>
  shift: CrewShift
}

// The next shift with its site's light on the local date it starts, built as a one-day site view.
function buildCrewNext(db: AppDatabase, person: Person, row: Shift | undefined, site: Site | undefined, nowMs: number): CrewNextShift | null {
  if (!row || !site) return null
  const today = localDateOf(nowMs, site.timezone)
  const date = localDateOf(row.startAt.getTime(), site.timezone)
  const which = date === today ? 'today' as const : date === addDays(today, 1) ? 'tomorrow' as const : 'day' as const
  const view = buildCrewSiteView(db, { site, dates: [{ date, which }], person, shifts: [row], match: 'overlaps', nowMs })
  const { shifts: dayShifts, ...day } = view.days[0]!
  return { siteId: site.id, siteName: site.name, zoneNote: view.zoneNote, underWay: row.startAt.getTime() <= nowMs, day, shift: dayShifts[0]! }
}

/** Today and tomorrow at each site where the person works in the next 7 days (or every site when none). */
export function buildCrewToday(db: AppDatabase, personId: number, nowMs = clockNowMs()): CrewToday {
  const person = db.select().from(people).where(eq(people.id, personId)).get()
  if (!person) throw new RangeError(`no person ${personId}`)
  const upcoming = loadPersonShifts(db, personId, nowMs, nowMs + CREW_HOME_HORIZON_MS)
  const siteIds = [...new Set(upcoming.map(s => s.siteId))]
  const basis = siteIds.length ? 'shifts' : 'all-sites'
  const siteRows = basis === 'shifts'
    ? db.select().from(sites).where(inArray(sites.id, siteIds)).orderBy(asc(sites.name)).all()
    : db.select().from(sites).where(isNull(sites.archivedAt)).orderBy(asc(sites.name)).all()
  // the day before today too, so a night shift that started yesterday still shows today
  const nearby = loadPersonShifts(db, personId, nowMs - 2 * DAY_MS, nowMs + 3 * DAY_MS)
  const views = siteRows.map((site) => {
    const today = localDateOf(nowMs, site.timezone)
    const dates = [{ date: today, which: 'today' as const }, { date: addDays(today, 1), which: 'tomorrow' as const }]
    return buildCrewSiteView(db, { site, dates, person, shifts: nearby, match: 'overlaps', nowMs })
  })
  return {
    generatedAt: new Date(nowMs).toISOString(),
    person: { id: person.id, name: person.name },
    displayZone: person.displayZone,
    basis,
    basisNote: basis === 'shifts'
      ? 'The sites where you have shifts in the next 7 days.'
      : 'You have no shifts in the next 7 days, so every site is shown.',
    sites: views,
    next: buildCrewNext(db, person, upcoming[0], siteRows.find(s => s.id === upcoming[0]?.siteId), nowMs)
  }
}

export interface PersonPreferences {
  remindersEnabled: boolean
  /** 'site' (each site's own zone) or an IANA zone name. */
  displayZone: string
  feedIncludeSun: boolean
  /** Cold and wind figures in °C, km/h, m (metric) or °F, mph, ft (imperial). */
  units: 'metric' | 'imperial'
}

/** A person's own preferences. */
export function readPersonPreferences(db: AppDatabase, personId: number): PersonPreferences {
  const row = db.select({ remindersEnabled: people.remindersEnabled, displayZone: people.displayZone, feedIncludeSun: people.feedIncludeSun, units: people.units })
    .from(people).where(eq(people.id, personId)).get()
  if (!row) throw new RangeError(`no person ${personId}`)
  return row
}

/** Changes the given preferences and returns them all. */
export function updatePersonPreferences(db: AppDatabase, personId: number, changes: Partial<PersonPreferences>): PersonPreferences {
  if (Object.keys(changes).length) db.update(people).set({ ...changes, updatedAt: nowDate() }).where(eq(people.id, personId)).run()
  return readPersonPreferences(db, personId)
}
