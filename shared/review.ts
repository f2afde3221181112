// Safety review: decisions, mitigation keys, review reasons and the words the client and server
// share: one word per review state, the same on every screen, in mail, CSV and the calendar feed.
// Imports neither Vue nor Nitro.
import { formatDuration, formatLocalTime } from './format'
import type { LightRequirement } from './light'

export const REVIEW_DECISIONS = ['approved', 'rejected', 'changes-requested'] as const
export type ReviewDecision = typeof REVIEW_DECISIONS[number]

/**
 * The one rule for `current` wherever a decision is shown (the shift, its history, the feed): the
 * latest decision on a shift is current while the shift's review state is still that decision. A
 * change to time, site, requirement or people moves the state (back to pending), so the decision
 * stops being current; a new title or note does not. An earlier decision is never current.
 */
export function isReviewDecisionCurrent(shiftReviewState: string, decision: ReviewDecision, isLatest: boolean): boolean {
  return isLatest && shiftReviewState === decision
}

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

/** The review states, in the order people meet them. */
export const REVIEW_STATE_KEYS = ['not-needed', 'pending', 'approved', 'rejected', 'changes-requested'] as const
export type ReviewStateKey = typeof REVIEW_STATE_KEYS[number]

/** One word (or short phrase) per review state, used everywhere a state is named. */
export const REVIEW_STATE_WORDS: Record<ReviewStateKey, string> = {
  'not-needed': 'No review needed',
  'pending': 'Awaiting review',
  'approved': 'Approved',
  'rejected': 'Rejected',
  'changes-requested': 'Sent back'
}

/** The verb on the decision form for each decision (its state word is REVIEW_STATE_WORDS). */
export const REVIEW_DECISION_VERBS: Record<typeof REVIEW_DECISIONS[number], string> = {
  'approved': 'Approve',
  'rejected': 'Reject',
  'changes-requested': 'Send back'
}

/** Why a shift goes to safety review (docs/api.md): its light, the cold, one person alone in the dark, its length. */
export const REVIEW_REASONS = ['light', 'cold', 'lone', 'long'] as const
export type ReviewReason = typeof REVIEW_REASONS[number]

export const REVIEW_REASON_WORDS: Record<ReviewReason, string> = {
  light: 'Below its light',
  cold: 'Cold',
  lone: 'Alone in the dark',
  long: 'Long shift'
}

/** A review reason with the figures behind it, as stored on the shift and sent on every reply. */
export type ReviewReasonDetail
  = | { reason: 'light', minutesBelow: number, requirement: LightRequirement }
    | { reason: 'cold', windChillC: number | null, at: string | null, limitC: number, stopWork: boolean, temperatureC: number, windKmh: number, basis: 'forecast' | 'observations' }
    | { reason: 'lone', minutesDark: number }
    | { reason: 'long', minutes: number, maxMinutes: number }

const LIGHT_NEED_WORDS: Record<LightRequirement, string> = { daylight: 'daylight', civil: 'civil light', any: 'any light' }

/** The figure of a reason in words: `2 h 10 min below daylight`, `wind chill −46 at 14:00 (limit −27)`. */
export function describeReviewReasonFigure(detail: ReviewReasonDetail, timezone?: string): string {
  switch (detail.reason) {
    case 'light':
      return `${formatDuration(detail.minutesBelow)} below ${LIGHT_NEED_WORDS[detail.requirement]}`
    case 'cold': {
      const at = detail.at && timezone ? ` at ${formatLocalTime(detail.at, timezone)}` : ''
      const from = detail.basis === 'observations' ? ' (site reading)' : ''
      if (detail.windChillC !== null && detail.windChillC <= detail.limitC) {
        return `wind chill ${formatSigned(detail.windChillC)}${at}, limit ${formatSigned(detail.limitC)}${from}${detail.stopWork ? '; stop-work cold' : ''}`
      }
      return `stop-work cold: ${formatSigned(detail.temperatureC)} °C, wind ${detail.windKmh} km/h${at}${from}`
    }
    case 'lone':
      return `one person, ${formatDuration(detail.minutesDark)} with the sun below −6°`
    case 'long':
      return `${formatDuration(detail.minutes)}, over the ${formatDuration(detail.maxMinutes)} maximum`
  }
}

/** A reason as one line people read: `Cold: wind chill −46 at 14:00, limit −27`. */
export function describeReviewReason(detail: ReviewReasonDetail, timezone?: string): string {
  return `${REVIEW_REASON_WORDS[detail.reason]}: ${describeReviewReasonFigure(detail, timezone)}`
}

/** The shift as it was when a decision was made: compared with the shift now when it re-opens. */
export interface ReviewShiftSnapshot {
  title: string
  siteName: string
  start: string
  end: string
  light: LightRequirement
  travelMinutes: number
  assignees: string[]
}

interface DraftLike {
  siteId: number | null
  start: string
  end: string
  light: LightRequirement
  assigneeIds: number[]
  travelMinutes?: number | null
}

/** Whether a shift edit changes what a review decided on (time, site, light need, travel or people). */
export function wouldReopenReview(before: DraftLike, after: DraftLike): boolean {
  const ids = (list: number[]) => [...list].sort((a, b) => a - b).join(',')
  return before.siteId !== after.siteId || before.start !== after.start || before.end !== after.end
    || before.light !== after.light || ids(before.assigneeIds) !== ids(after.assigneeIds)
    || (before.travelMinutes ?? 0) !== (after.travelMinutes ?? 0)
}
