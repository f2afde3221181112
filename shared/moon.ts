// The moon of one local day in words, from the light routes' `moon` (docs/api.md, "Light"): times on the
// site's wall clock as the reply writes them, a span cut at midnight shown as ending at 24:00.
// Pure: no imports.

export interface MoonDayShape {
  up: { start: string, end: string }[]
  illumination: number
  maxAltitude: number
}

/** `Moon up 14:10–24:00, 92 % lit` or `Moon below the horizon all day, 3 % lit`. */
export function describeMoonDay(moon: MoonDayShape, date: string): string {
  const lit = `${Math.round(moon.illumination * 100)} % lit`
  if (!moon.up.length) return `Moon below the horizon all day, ${lit}`
  const clock = (iso: string) => (iso.slice(0, 10) > date ? '24:00' : iso.slice(11, 16))
  const spans = moon.up.map(s => (s.start.slice(11, 16) === '00:00' && s.end.slice(0, 10) > date ? 'all day' : `${clock(s.start)}–${clock(s.end)}`))
  return `Moon up ${spans.join(', ')}, ${lit}`
}
