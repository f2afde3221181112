// A party's state in the field and the alert step it has reached. Pure: plain inputs and outputs.
//
// Common practice in field programmes and in Canadian working-alone rules (docs/references.md, "Work
// hours and people"): the party leaves with an expected return; a later, pre-set
// alert time starts the response; a person working alone checks in on a schedule; escalation comes
// in steps. The figures are the operator's settings (docs/api.md: overdueGraceMinutes,
// soloCheckInMinutes, escalateEveryMinutes).
//
// A call from the field (a check-in) is word that the party is alive: it clears a missed check-in at
// once, and for a party past its expected return it starts the grace period again from the call, so
// the alert comes back if no further word or return follows. Only the return ends the outing.
import type { FieldSettings, FieldState } from '../../../shared/field'

const MINUTE_MS = 60_000

export interface PartyTimes {
  departedAtMs: number
  expectedBackAtMs: number
  lastCheckInAtMs: number | null
  returnedAtMs: number | null
  /** People on the shift: one person is a lone worker, held to the check-in schedule. */
  peopleCount: number
}

export interface PartyAssessment {
  state: FieldState
  /** The alert's kind while overdue or check-in-missed. */
  alert: 'overdue' | 'check-in-missed' | null
  /** When the alert began (its step 1). */
  alertSinceMs: number | null
  /** 1 at alertSinceMs, 2 after escalateEveryMinutes, and so on; 0 without an alert. */
  step: number
  /** When the next check would raise an alert if nothing changes (for the board's "next call due"). */
  nextDeadlineMs: number | null
}

/** The party's state at `nowMs` under the operator's settings. */
export function assessParty(party: PartyTimes, settings: FieldSettings, nowMs: number): PartyAssessment {
  if (party.returnedAtMs !== null) return { state: 'back', alert: null, alertSinceMs: null, step: 0, nextDeadlineMs: null }
  const lastWord = party.lastCheckInAtMs ?? party.departedAtMs
  // overdue: no return by the expected time + grace, counted again from any call after the expected time
  const overdueAt = Math.max(party.expectedBackAtMs, party.lastCheckInAtMs ?? -Infinity) + settings.overdueGraceMinutes * MINUTE_MS
  const soloAt = party.peopleCount === 1 ? lastWord + settings.soloCheckInMinutes * MINUTE_MS : null
  const overdue = nowMs >= overdueAt
  const missed = soloAt !== null && nowMs >= soloAt
  if (overdue) return withStep('overdue', overdueAt, settings, nowMs)
  if (missed) return withStep('check-in-missed', soloAt!, settings, nowMs)
  return { state: 'out', alert: null, alertSinceMs: null, step: 0, nextDeadlineMs: Math.min(overdueAt, soloAt ?? Infinity) }
}

function withStep(kind: 'overdue' | 'check-in-missed', sinceMs: number, settings: FieldSettings, nowMs: number): PartyAssessment {
  const everyMs = Math.max(1, settings.escalateEveryMinutes) * MINUTE_MS
  const step = Math.floor((nowMs - sinceMs) / everyMs) + 1
  return { state: kind, alert: kind, alertSinceMs: sinceMs, step, nextDeadlineMs: null }
}

/**
 * The outbox key of one alert step for one recipient: unique in the database, so however many
 * processes check and however often they restart, each step goes to each person once.
 */
export function fieldAlertKey(outingId: number, assessment: PartyAssessment, personId: number): string {
  return `field-alert:${outingId}:${assessment.alert}:${assessment.alertSinceMs}:${assessment.step}:${personId}`
}
