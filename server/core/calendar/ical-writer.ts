// A small iCalendar (RFC 5545) writer for the calendar feed: one VCALENDAR of VEVENTs, built line by
// line into chunks, with TEXT escaped (§3.3.11) and content lines folded at 75 octets (§3.1).
// ical-generator wrote the feed before; its folding encodes every character with a new TextEncoder,
// which made a 2,000-shift feed take about a second. The event fields keep its names (and its status
// and transparency enums are plain strings), so the feed service describes events the same way.
// Pure TypeScript: no framework imports.

export interface ICalEventData {
  id: string
  sequence?: number
  stamp?: Date
  created?: Date
  lastModified?: Date
  /** An instant, or a local date YYYY-MM-DD with allDay. */
  start: Date | string
  end?: Date | null
  allDay?: boolean
  summary: string
  description?: string | null
  location?: { title: string, geo?: { lat: number, lon: number } } | null
  /** CONFIRMED, TENTATIVE or CANCELLED (RFC 5545 §3.8.1.11). */
  status?: string | null
  /** OPAQUE or TRANSPARENT (§3.8.2.7). */
  transparency?: string | null
  url?: string | null
}

export interface ICalCalendarOptions {
  name: string
  prodId: { company: string, product: string, language?: string }
  /** Suggested refresh interval, seconds (REFRESH-INTERVAL, RFC 7986 §5.7, and X-PUBLISHED-TTL). */
  ttl?: number
  /** DTSTAMP of events that give none. */
  stampMs: number
}

/** Escapes TEXT (RFC 5545 §3.3.11): backslash, semicolon, comma, line breaks; drops other control characters. */
export function escapeICalValue(value: string): string {
  return value.replace(/[\\;,]/g, ch => `\\${ch}`).replace(/\r\n|\r|\n/g, '\\n').replace(/\p{Cc}/gu, '')
}

// UTF-8 length of one UTF-16 code unit at i (a surrogate pair counts 4 on its first unit, 0 on its second).
function utf8Units(code: number): number {
  if (code < 0x80) return 1
  if (code < 0x800) return 2
  if (code >= 0xD800 && code <= 0xDBFF) return 4
  if (code >= 0xDC00 && code <= 0xDFFF) return 0
  return 3
}

/** One content line, folded so that no line exceeds 75 octets (RFC 5545 §3.1), with its CRLF. */
export function foldICalLine(line: string): string {
  // ASCII lines (nearly all of them) are cut by length alone
  if (line.length <= 75 && !/[^\x20-\x7E]/.test(line)) return line + '\r\n'
  let out = ''
  let start = 0
  let octets = 0
  for (let i = 0; i < line.length; i++) {
    const size = utf8Units(line.charCodeAt(i))
    // a continuation line starts with one space, which counts towards its 75
    if (octets + size > 75) {
      out += line.slice(start, i) + '\r\n '
      start = i
      octets = 1
    }
    octets += size
  }
  return out + line.slice(start) + '\r\n'
}

const pad = (n: number, width = 2) => String(n).padStart(width, '0')

/** A UTC DATE-TIME (RFC 5545 §3.3.5, form 2): 20270327T220000Z. */
export function formatICalUtc(ms: number): string {
  const d = new Date(ms)
  return `${pad(d.getUTCFullYear(), 4)}${pad(d.getUTCMonth() + 1)}${pad(d.getUTCDate())}T${pad(d.getUTCHours())}${pad(d.getUTCMinutes())}${pad(d.getUTCSeconds())}Z`
}

function formatStart(name: 'DTSTART' | 'DTEND', value: Date | string, allDay: boolean): string {
  if (allDay) {
    const date = typeof value === 'string' ? value : new Date(value).toISOString().slice(0, 10)
    return `${name};VALUE=DATE:${date.replaceAll('-', '')}`
  }
  return `${name}:${formatICalUtc(typeof value === 'string' ? Date.parse(value) : value.getTime())}`
}

/** The lines of one VEVENT, folded, as one string. */
export function writeICalEvent(event: ICalEventData, defaultStampMs: number): string {
  const allDay = event.allDay === true
  const lines = [
    'BEGIN:VEVENT',
    `UID:${escapeICalValue(event.id)}`,
    ...(event.sequence !== undefined ? [`SEQUENCE:${Math.trunc(event.sequence)}`] : []),
    `DTSTAMP:${formatICalUtc(event.stamp?.getTime() ?? defaultStampMs)}`,
    formatStart('DTSTART', event.start, allDay),
    ...(event.end ? [formatStart('DTEND', event.end, allDay)] : []),
    `SUMMARY:${escapeICalValue(event.summary)}`,
    ...(event.location ? [`LOCATION:${escapeICalValue(event.location.title)}`] : []),
    ...(event.location?.geo ? [`GEO:${event.location.geo.lat};${event.location.geo.lon}`] : []),
    ...(event.description ? [`DESCRIPTION:${escapeICalValue(event.description)}`] : []),
    ...(event.status ? [`STATUS:${event.status.toUpperCase()}`] : []),
    ...(event.transparency ? [`TRANSP:${event.transparency.toUpperCase()}`] : []),
    ...(event.url ? [`URL:${event.url}`] : []),
    ...(event.created ? [`CREATED:${formatICalUtc(event.created.getTime())}`] : []),
    ...(event.lastModified ? [`LAST-MODIFIED:${formatICalUtc(event.lastModified.getTime())}`] : []),
    'END:VEVENT'
  ]
  let out = ''
  for (const line of lines) out += foldICalLine(line)
  return out
}

/** A calendar being written: events go in one at a time; `toString()` gives the whole text. */
export function createICalCalendar(options: ICalCalendarOptions) {
  const { company, product, language = 'EN' } = options.prodId
  const header = [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    `PRODID:-//${escapeICalValue(company)}//${escapeICalValue(product)}//${language}`,
    'CALSCALE:GREGORIAN',
    `NAME:${escapeICalValue(options.name)}`,
    `X-WR-CALNAME:${escapeICalValue(options.name)}`,
    ...(options.ttl ? [`REFRESH-INTERVAL;VALUE=DURATION:PT${Math.round(options.ttl)}S`, `X-PUBLISHED-TTL:PT${Math.round(options.ttl)}S`] : [])
  ].map(foldICalLine).join('')
  const events: string[] = []
  return {
    createEvent(event: ICalEventData) {
      events.push(writeICalEvent(event, options.stampMs))
    },
    get length() {
      return events.length
    },
    toString() {
      return header + events.join('') + 'END:VCALENDAR\r\n'
    }
  }
}

export type ICalCalendar = ReturnType<typeof createICalCalendar>
