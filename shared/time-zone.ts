// The one test of a time-zone name, shared by the server's schemas, the light engine and the forms.
// Pure: no imports, only Intl (the IANA tz database bundled with the runtime).

const KNOWN_ZONES = new Set<string>()

/**
 * True for an IANA time zone name the runtime knows (Europe/Oslo, Antarctica/Troll, UTC, Etc/GMT+2,
 * EST5EDT); false for bare offsets (+02:00, -0300) and text with spaces, which newer Intl versions
 * accept but which carry no clock-change rules, and for names longer than 64 characters.
 */
export function isValidTimeZone(tz: unknown): tz is string {
  if (typeof tz !== 'string' || tz.length === 0 || tz.length > 64) return false
  if (KNOWN_ZONES.has(tz)) return true
  if (/^[+-]/.test(tz) || /\s/.test(tz)) return false
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz })
  } catch {
    return false
  }
  if (KNOWN_ZONES.size < 1_000) KNOWN_ZONES.add(tz)
  return true
}
