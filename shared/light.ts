// Light bands, thresholds and requirement kinds shared by the server's light engine and the client.
// Pure constants and types: imports neither Vue nor Nitro.

/** Light bands from brightest to darkest (docs/light-model.md). */
export const BAND_KINDS = ['day', 'civil', 'nautical', 'astronomical', 'night'] as const
export type BandKind = typeof BAND_KINDS[number]

/**
 * Lower edge of each band, as the GEOMETRIC altitude of the sun's centre in degrees (USNO "Rise, Set,
 * and Twilight Definitions"; Almanac for Computers zeniths 90°50′, 96°, 102°, 108°). −0.833° is
 * 34′ standard refraction + 16′ semidiameter. `night` has no lower edge.
 */
export const BAND_LOWER_ALTITUDE_DEG = {
  day: -0.833,
  civil: -6,
  nautical: -12,
  astronomical: -18
} as const

/** Thresholds from darkest to brightest, so that band index = number of thresholds at or below h. */
export const BAND_THRESHOLDS_ASCENDING_DEG = [-18, -12, -6, -0.833] as const

/** Band kinds from darkest (index 0) to brightest (index 4), matching BAND_THRESHOLDS_ASCENDING_DEG. */
export const BAND_KINDS_ASCENDING = ['night', 'astronomical', 'nautical', 'civil', 'day'] as const

/** Sun events: dawn = rising through a threshold, dusk = setting through it. */
export const SUN_EVENT_TYPES = [
  'astronomical-dawn', 'nautical-dawn', 'civil-dawn', 'sunrise',
  'sunset', 'civil-dusk', 'nautical-dusk', 'astronomical-dusk'
] as const
export type SunEventType = typeof SUN_EVENT_TYPES[number]

/** Rising event per threshold, in the order of BAND_THRESHOLDS_ASCENDING_DEG. */
export const RISING_EVENT_BY_THRESHOLD = ['astronomical-dawn', 'nautical-dawn', 'civil-dawn', 'sunrise'] as const
/** Setting event per threshold, in the order of BAND_THRESHOLDS_ASCENDING_DEG. */
export const SETTING_EVENT_BY_THRESHOLD = ['astronomical-dusk', 'nautical-dusk', 'civil-dusk', 'sunset'] as const

/** What a shift's task needs (docs/light-model.md, "Requirements"): `any` means the work area is artificially lit. */
export const LIGHT_REQUIREMENT_KINDS = ['daylight', 'civil', 'any'] as const
export type LightRequirement = typeof LIGHT_REQUIREMENT_KINDS[number]

/** Bands that satisfy each requirement. */
export const BANDS_MEETING_REQUIREMENT: Record<LightRequirement, readonly BandKind[]> = {
  daylight: ['day'],
  civil: ['day', 'civil'],
  any: BAND_KINDS
}

/** A shift is flagged from this many minutes below its requirement (docs/light-model.md). */
export const FLAG_MINUTES_BELOW = 1

export const DAY_STATUSES = ['midnight-sun', 'polar-night', 'rises-and-sets'] as const
export type DayStatus = typeof DAY_STATUSES[number]

/** Longest range one light request may cover, in local days (docs/light-model.md: at most 366). */
export const MAX_LIGHT_RANGE_DAYS = 366
/**
 * The years the light engine answers for (its zone table and season search: 1901–2149, where the
 * runtime's zone data is exact and every year has its solstices and equinoxes). Every date and
 * instant the product takes in is held to this range (shared/schemas/calendar.ts).
 */
export const LIGHT_FIRST_YEAR = 1901
export const LIGHT_LAST_YEAR = 2149

/** Default N for "days with at least N hours of civil light" in the season summary. */
export const DEFAULT_MIN_CIVIL_HOURS = 4

export interface LightPeriod {
  kind: BandKind
  /** ISO 8601 with the site zone's offset, to the second. */
  start: string
  end: string
}

export interface SunEvent {
  type: SunEventType
  at: string
  /** Degrees from true north, clockwise, to 0.1°. */
  azimuth: number
}

export interface LightDay {
  /** Local date, YYYY-MM-DD. */
  date: string
  periods: LightPeriod[]
  events: SunEvent[]
  /** Instant of the day's highest geometric altitude. */
  solarNoon: string
  /** Geometric altitudes in degrees, to 0.01°. */
  maxAltitude: number
  minAltitude: number
  /** Whole minutes of `day`. */
  daylightMinutes: number
  /** Whole minutes of `day` + `civil`. */
  civilLightMinutes: number
  status: DayStatus
}

export interface LightPeriodMs {
  kind: BandKind
  startMs: number
  endMs: number
}

export interface SunEventMs {
  type: SunEventType
  atMs: number
  azimuth: number
}

export interface LightDayMs {
  date: string
  startMs: number
  endMs: number
  periods: LightPeriodMs[]
  events: SunEventMs[]
  solarNoonMs: number
  maxAltitude: number
  minAltitude: number
  daylightMinutes: number
  civilLightMinutes: number
  status: DayStatus
}

export interface ShiftLightCheck {
  requirement: LightRequirement
  /** Whole minutes (rounded) of the shift in bands that do not meet the requirement. */
  minutesBelow: number
  flagged: boolean
  /** The light profile of the shift, clipped to it. */
  bands: LightPeriodMs[]
}

export interface LocalDateSpan {
  /** Inclusive local dates, YYYY-MM-DD. */
  from: string
  to: string
}

export interface SunriseBearing {
  azimuth: number
  date: string
}

export interface SeasonSummary {
  latitude: number
  longitude: number
  timezone: string
  year: number
  minCivilHours: number
  midnightSun: LocalDateSpan[]
  polarNight: LocalDateSpan[]
  noCivilLight: LocalDateSpan[]
  firstDayWithCivilHours: string | null
  lastDayWithCivilHours: string | null
  marchEquinox: string
  juneSolstice: string
  septemberEquinox: string
  decemberSolstice: string
  northernmostSunrise: SunriseBearing | null
  southernmostSunrise: SunriseBearing | null
}

/** Next change of each seasonal state after a given local date (null when none within a year). */
export interface LightTransitions {
  today: string
  minCivilHours: number
  status: DayStatus
  civilLightMinutes: number
  /** First date of the next polar night. */
  polarNightBegins: string | null
  /** First date after polar night on which the sun rises again. */
  polarNightEnds: string | null
  /** First date of the next stretch of midnight sun. */
  midnightSunBegins: string | null
  /** First date after midnight sun on which the sun sets again. */
  midnightSunEnds: string | null
  /** First date with less than minCivilHours of civil light, after a date with at least that. */
  civilLightFallsBelow: string | null
  /** First date with at least minCivilHours of civil light, after a date with less. */
  civilLightReaches: string | null
}
