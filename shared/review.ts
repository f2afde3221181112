// Safety review: decisions, mitigation keys and the words the client and server share.
// Imports neither Vue nor Nitro.

export const REVIEW_DECISIONS = ['approved', 'rejected', 'changes-requested'] as const
export type ReviewDecision = typeof REVIEW_DECISIONS[number]

/** Our fixed mitigation keys; 'check-in-interval' is stored with its minutes as 'check-in-interval:30'. */
export const MITIGATION_KEYS = ['portable-lighting', 'two-person-minimum', 'warmup-breaks', 'check-in-interval'] as const
export type MitigationKey = typeof MITIGATION_KEYS[number]

export const MITIGATION_LABELS: Record<MitigationKey, string> = {
  'portable-lighting': 'Portable work lighting on site',
  'two-person-minimum': 'At least two people on the task at all times',
  'warmup-breaks': 'Warm-up breaks scheduled as the cold figures direct',
  'check-in-interval': 'Check-in at a fixed interval'
}

/** Free text entered as a mitigation is stored with this prefix. */
export const OTHER_MITIGATION_PREFIX = 'other:'
export const CHECK_IN_PREFIX = 'check-in-interval:'
export const CHECK_IN_MINUTES = { min: 5, max: 240 } as const
export const MAX_MITIGATION_TEXT = 300
export const MAX_REVIEW_NOTE = 2000

/** Queue filters: which review state to list. */
export const REVIEW_QUEUE_STATES = ['pending', 'changes-requested', 'rejected', 'approved'] as const
export type ReviewQueueState = typeof REVIEW_QUEUE_STATES[number]

export const REVIEW_STATE_LABELS: Record<'not-needed' | ReviewQueueState, string> = {
  'not-needed': 'No review needed',
  'pending': 'Waiting for review',
  'approved': 'Approved',
  'rejected': 'Rejected',
  'changes-requested': 'Changes asked'
}

/** Turns a stored mitigation into the sentence people read. */
export function describeMitigation(item: string): string {
  if (item.startsWith(OTHER_MITIGATION_PREFIX)) return item.slice(OTHER_MITIGATION_PREFIX.length).trim()
  if (item.startsWith(CHECK_IN_PREFIX)) return `Check-in every ${item.slice(CHECK_IN_PREFIX.length)} min`
  return MITIGATION_LABELS[item as MitigationKey] ?? item
}

/** Formats a duration in minutes as '3 h 25 min' (LOOK.md). */
export function formatDurationMinutes(minutes: number): string {
  const whole = Math.round(minutes)
  const h = Math.floor(whole / 60)
  const m = whole % 60
  if (h === 0) return `${m} min`
  return m === 0 ? `${h} h` : `${h} h ${m} min`
}

/** The offset of an ISO instant written with an offset, as 'UTC+01:00' ('UTC' for Z). */
export function formatOffsetLabel(iso: string): string {
  const match = /(Z|[+-]\d{2}:\d{2})$/.exec(iso)
  if (!match || match[1] === 'Z' || match[1] === '+00:00') return 'UTC'
  return `UTC${match[1]}`
}

/** The 24-hour wall time of an ISO instant written in the site's offset: '07:45'. */
export function formatWallTime(iso: string): string {
  return iso.slice(11, 16)
}

const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat']
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']

/** The local date of an ISO instant written in the site's offset: 'Tue 14 Jan'. */
export function formatWallDate(iso: string): string {
  const [y, m, d] = iso.slice(0, 10).split('-').map(Number) as [number, number, number]
  const weekday = new Date(Date.UTC(y, m - 1, d)).getUTCDay()
  return `${WEEKDAYS[weekday]} ${d} ${MONTHS[m - 1]}`
}

/** A span of two ISO instants in one offset: 'Tue 14 Jan 07:45–11:45 UTC+01:00' (the end date added when it differs). */
export function formatWallSpan(startIso: string, endIso: string): string {
  const sameDay = startIso.slice(0, 10) === endIso.slice(0, 10)
  const end = sameDay ? formatWallTime(endIso) : `${formatWallDate(endIso)} ${formatWallTime(endIso)}`
  const zone = formatOffsetLabel(startIso) === formatOffsetLabel(endIso) ? formatOffsetLabel(startIso) : `${formatOffsetLabel(startIso)}/${formatOffsetLabel(endIso)}`
  return `${formatWallDate(startIso)} ${formatWallTime(startIso)}–${end} ${zone}`
}

/** Writes a signed whole number with a true minus sign, as the published charts print it. */
export function formatSigned(value: number): string {
  const rounded = Math.round(value)
  return rounded < 0 ? `−${Math.abs(rounded)}` : String(rounded)
}
