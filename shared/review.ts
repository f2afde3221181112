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

/** Turns a stored mitigation into the sentence people read. */
export function describeMitigation(item: string): string {
  if (item.startsWith(OTHER_MITIGATION_PREFIX)) return item.slice(OTHER_MITIGATION_PREFIX.length).trim()
  if (item.startsWith(CHECK_IN_PREFIX)) return `Check-in every ${item.slice(CHECK_IN_PREFIX.length)} min`
  return MITIGATION_LABELS[item as MitigationKey] ?? item
}

/** Writes a signed whole number with a true minus sign, as the published charts print it. */
export function formatSigned(value: number): string {
  const rounded = Math.round(value)
  return rounded < 0 ? `−${Math.abs(rounded)}` : String(rounded)
}
