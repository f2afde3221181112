// The instants the tests start the built server's clock at (GLOAMLINE_TEST_MODE=1 +
// GLOAMLINE_CLOCK_START, see server/plugins/0.clock.ts). No test reads the machine's date to decide
// what to expect: each starts the server at one of these and derives "today" and "tomorrow" from it.
// Weekdays checked with Date.prototype.getUTCDay; clock-change dates from the IANA tz database
// (EU: last Sunday of March 01:00 UTC; New Zealand: first Sunday of April 03:00 NZDT).

export const TEST_CLOCK = {
  /** Wednesday 18 November 2026, 09:30 UTC: an ordinary working day, polar night in Svalbard. */
  weekdayMorning: '2026-11-18T09:30:00.000Z',
  /** Saturday 27 March 2027, 21:40 UTC: the evening before Europe's clocks go forward (28 March 01:00 UTC). */
  saturdayEveningBeforeChange: '2027-03-27T21:40:00.000Z',
  /** Sunday 10 January 2027, 08:30 in New Zealand time (19:30 UTC the day before): southern summer. */
  southernSummerSunday: '2027-01-09T19:30:00.000Z',
  /** Friday 4 June 2027, 14:00 UTC: midnight sun in the north, a Friday before a weekend. */
  fridayMidnightSun: '2027-06-04T14:00:00.000Z'
} as const

export type TestClockName = keyof typeof TEST_CLOCK

/** The UTC calendar date (YYYY-MM-DD) of an instant, `days` later. */
export function utcDateOf(ms: number, days = 0): string {
  return new Date(ms + days * 86_400_000).toISOString().slice(0, 10)
}

/** The calendar date (YYYY-MM-DD) of an instant in an IANA zone, `days` later (calendar days). */
export function zonedDateOf(ms: number, timezone: string, days = 0): string {
  const local = new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(ms))
  return addCalendarDays(local, days)
}

/** A calendar date plus whole days. */
export function addCalendarDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}

/** The weekday of a calendar date, 0 = Sunday. */
export function weekdayOf(date: string): number {
  return new Date(`${date}T12:00:00Z`).getUTCDay()
}

/** A clock for a test helper (a fake service beside the server): starts at `iso` and runs on (monotonic). */
export function runningClock(iso: string): () => number {
  const startMs = Date.parse(iso)
  const origin = performance.now()
  return () => startMs + (performance.now() - origin)
}
