// Cold-exposure constants and wording shared by the server computation and the client.
// Imports neither Vue nor Nitro.

/** Unit systems accepted for cold figures: metric = °C and km/h at 10 m, imperial = °F and mph. */
export const COLD_UNITS = ['metric', 'imperial'] as const
export type ColdUnits = typeof COLD_UNITS[number]

/** Workloads the work/warm-up schedule distinguishes (its printed note: light work uses the next colder row). */
export const COLD_WORKLOADS = ['moderate-heavy', 'light'] as const
export type ColdWorkload = typeof COLD_WORKLOADS[number]

export const COLD_UNIT_SYMBOLS: Record<ColdUnits, { temperature: string, wind: string }> = {
  metric: { temperature: '°C', wind: 'km/h' },
  imperial: { temperature: '°F', wind: 'mph' }
}

// 2001 North American wind chill index (NWS; Environment and Climate Change Canada):
// defined only for air at or below 10 °C / 50 °F and wind above 4.8 km/h / 3 mph.
export const WIND_CHILL_LIMITS: Record<ColdUnits, { maxTemperature: number, minWindExclusive: number }> = {
  metric: { maxTemperature: 10, minWindExclusive: 4.8 },
  imperial: { maxTemperature: 50, minWindExclusive: 3 }
}

/** Accepted input ranges for GET /api/cold, per unit system (imperial = the metric range converted). */
export const COLD_INPUT_LIMITS: Record<ColdUnits, { minTemperature: number, maxTemperature: number, maxWind: number }> = {
  metric: { minTemperature: -90, maxTemperature: 60, maxWind: 400 },
  imperial: { minTemperature: -130, maxTemperature: 140, maxWind: 250 }
}

export const WIND_CHILL_REASONS = ['too-warm', 'too-calm'] as const
export type WindChillReason = typeof WIND_CHILL_REASONS[number]

export const FROSTBITE_RISK_KEYS = ['low', 'moderate', 'high', 'very-high', 'severe', 'extreme'] as const
export type FrostbiteRiskKey = typeof FROSTBITE_RISK_KEYS[number]

export interface FrostbiteBand {
  key: FrostbiteRiskKey
  label: string
  /** Warmest whole-degree wind chill (°C) in the band; null = open-ended on the warm side. */
  warmestC: number | null
  /** Coldest whole-degree wind chill (°C) in the band; null = open-ended on the cold side. */
  coldestC: number | null
  /** Minutes in which exposed skin can freeze, as the band states it; null where the band gives none. */
  minMinutes: number | null
  maxMinutes: number | null
}

// Bands of the Environment and Climate Change Canada wind chill table, on the whole-degree
// wind chill in °C: 0 to −9, −10 to −27, −28 to −39, −40 to −47, −48 to −54, −55 and colder.
// The table starts at 0; a wind chill above 0 is put in its warmest band. Labels are our own words.
export const FROSTBITE_BANDS: readonly FrostbiteBand[] = [
  { key: 'low', label: 'Frostbite unlikely', warmestC: null, coldestC: -9, minMinutes: null, maxMinutes: null },
  { key: 'moderate', label: 'Uncomfortable; frostbite risk still low', warmestC: -10, coldestC: -27, minMinutes: null, maxMinutes: null },
  { key: 'high', label: 'Bare skin can freeze within 10 to 30 minutes', warmestC: -28, coldestC: -39, minMinutes: 10, maxMinutes: 30 },
  { key: 'very-high', label: 'Bare skin can freeze within 5 to 10 minutes', warmestC: -40, coldestC: -47, minMinutes: 5, maxMinutes: 10 },
  { key: 'severe', label: 'Bare skin can freeze within 2 to 5 minutes', warmestC: -48, coldestC: -54, minMinutes: 2, maxMinutes: 5 },
  { key: 'extreme', label: 'Bare skin can freeze in less than 2 minutes', warmestC: -55, coldestC: null, minMinutes: 0, maxMinutes: 2 }
]

/**
 * What the work/warm-up schedule says for a case:
 * `outside-table` (warmer than the table's first row: normal breaks), `normal-breaks` (a "normal / 1" cell),
 * `limited` (a maximum work period with a number of warm-up breaks), `stop` (non-emergency work should cease).
 */
export const WARMUP_SCHEDULE_KINDS = ['outside-table', 'normal-breaks', 'limited', 'stop'] as const
export type WarmupScheduleKind = typeof WARMUP_SCHEDULE_KINDS[number]

export const WARMUP_SCHEDULE_LABELS: Record<WarmupScheduleKind, string> = {
  'outside-table': 'Normal breaks (warmer than the schedule covers)',
  'normal-breaks': 'Normal breaks',
  'limited': 'Limited work periods with warm-up breaks',
  'stop': 'Non-emergency work should stop'
}

/** Length of one warm-up break in the 4-hour work/warm-up schedule, in minutes. */
export const WARMUP_BREAK_MINUTES = 10

export const COLD_CAUTION_KEYS = [
  'planning-aid',
  'exposed-skin-only',
  'index-not-defined',
  'frostbite-signs',
  'hypothermia-signs',
  'wet-clothing',
  'working-alone',
  'warm-shelter',
  'sunshine-assumed',
  'wind-beyond-table',
  'outside-table'
] as const
export type ColdCautionKey = typeof COLD_CAUTION_KEYS[number]

// Our own wording. Substance: OSHA cold stress guidance, NIOSH and CCOHS (hypothermia below 35 °C core,
// work in pairs, warm dry shelter, acclimatisation, wet clothing is an emergency), several Canadian
// provinces' check-in rules for people working alone, and the notes printed with the ACGIH schedule.
export const COLD_CAUTIONS: Record<ColdCautionKey, string> = {
  'planning-aid': 'These figures are planning aids worked out from published formulas and guidelines. They do not replace the law that applies at the site, the employer\'s procedures, what people see on site, or the judgement of a competent supervisor; where a local rule is stricter, it wins. Nothing here says that conditions are safe.',
  'exposed-skin-only': 'Wind chill describes how fast bare skin loses heat. It does not cool equipment, vehicles or water below the air temperature, and it does not describe skin under dry, windproof clothing.',
  'index-not-defined': 'The wind chill index is not defined here (air warmer than 10 °C / 50 °F, or wind at or below 4.8 km/h / 3 mph), so the air temperature is shown instead. Cold still injures in still air.',
  'frostbite-signs': 'Watch each other for frostbite: skin turning white, grey or waxy, feeling hard, or going numb. Cheeks, nose, ears, fingers and toes go first. Get the person to warmth and follow your first-aid procedures.',
  'hypothermia-signs': 'Hypothermia sets in when core body temperature drops below 35 °C. Shivering, tiredness, clumsiness, slurred speech and confusion are warning signs; shivering can stop as it gets worse. Treat it as an emergency.',
  'wet-clothing': 'Wet clothing in the cold is an emergency: it draws heat from the body far faster than dry clothing. Get the person into shelter and dry clothes at once.',
  'working-alone': 'Avoid working alone in the cold: work in pairs or keep to a check-in schedule. Several jurisdictions require check-in procedures for people who work alone.',
  'warm-shelter': 'Plan a warm, dry shelter for every warm-up break, and give new and returning workers time to get used to the cold.',
  'sunshine-assumed': 'The work/warm-up schedule assumes a sunny sky. With the sun down or under heavy cloud, the same temperature and wind can be harder on people than the schedule allows for.',
  'wind-beyond-table': 'The wind is stronger than the schedule\'s last column (32 km/h / 20 mph). The last column is used, and it may not protect enough.',
  'outside-table': 'The work/warm-up schedule starts at −26 °C (−15 °F); warmer than that it sets no limit, but cold, wind and wet can still injure.'
}
