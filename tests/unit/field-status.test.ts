// A party's field state and alert steps at their boundaries. The rules are those of docs/api.md ("Travel, weather
// holds, check-out and return"): overdue from expectedBackAt + overdueGraceMinutes, a lone worker's
// missed check-in after soloCheckInMinutes without word, one alert step at once and one more every
// escalateEveryMinutes. Expected return, a later alert time and stepped escalation are common practice
// in field programmes; interval check-ins for people working alone follow the Canadian working-alone
// rules (e.g. BC OHS Regulation ss. 4.20.1–4.23), whose figures are the employer's to set.
// The instants below are invented.
import { describe, expect, it } from 'vitest'
import { assessParty, fieldAlertKey, type PartyTimes } from '../../server/core/field/status'
import { DEFAULT_FIELD_SETTINGS } from '../../shared/field'

const MIN = 60_000
const LEFT = Date.parse('2027-02-20T08:30:00+01:00')
const BACK = Date.parse('2027-02-20T14:30:00+01:00')
const SETTINGS = { overdueGraceMinutes: 30, soloCheckInMinutes: 120, escalateEveryMinutes: 30 }
const party = (over: Partial<PartyTimes> = {}): PartyTimes => ({ departedAtMs: LEFT, expectedBackAtMs: BACK, lastCheckInAtMs: null, returnedAtMs: null, peopleCount: 3, ...over })

describe('a party that is late back', () => {
  it('is out until one minute before the grace runs out, overdue at the grace exactly', () => {
    expect(assessParty(party(), SETTINGS, BACK + 29 * MIN).state).toBe('out')
    expect(assessParty(party(), SETTINGS, BACK + 30 * MIN - 1).state).toBe('out')
    const at = assessParty(party(), SETTINGS, BACK + 30 * MIN)
    expect(at).toMatchObject({ state: 'overdue', alert: 'overdue', step: 1, alertSinceMs: BACK + 30 * MIN })
  })

  it('with a grace of 0 is overdue at the expected return itself', () => {
    const s = { ...SETTINGS, overdueGraceMinutes: 0 }
    expect(assessParty(party(), s, BACK - 1).state).toBe('out')
    expect(assessParty(party(), s, BACK).state).toBe('overdue')
  })

  it('steps up every escalateEveryMinutes: step 2 at exactly 30 minutes after the first alert, step 3 at 60', () => {
    const since = BACK + 30 * MIN
    expect(assessParty(party(), SETTINGS, since + 30 * MIN - 1).step).toBe(1)
    expect(assessParty(party(), SETTINGS, since + 30 * MIN).step).toBe(2)
    expect(assessParty(party(), SETTINGS, since + 60 * MIN).step).toBe(3)
  })

  it('is back, with no alert, once the return is recorded however late', () => {
    expect(assessParty(party({ returnedAtMs: BACK + 5 * 60 * MIN }), SETTINGS, BACK + 6 * 60 * MIN)).toMatchObject({ state: 'back', alert: null, step: 0 })
  })

  it('a call from the field after the expected return clears the alert and starts the grace again', () => {
    const call = BACK + 45 * MIN
    const p = party({ lastCheckInAtMs: call })
    expect(assessParty(p, SETTINGS, call + 1 * MIN).state).toBe('out')
    expect(assessParty(p, SETTINGS, call + 30 * MIN)).toMatchObject({ state: 'overdue', alertSinceMs: call + 30 * MIN, step: 1 })
  })
})

describe('a person working alone', () => {
  const alone = (over: Partial<PartyTimes> = {}) => party({ peopleCount: 1, ...over })

  it('misses a check-in exactly soloCheckInMinutes after leaving with no call', () => {
    expect(assessParty(alone(), SETTINGS, LEFT + 120 * MIN - 1).state).toBe('out')
    expect(assessParty(alone(), SETTINGS, LEFT + 120 * MIN)).toMatchObject({ state: 'check-in-missed', step: 1, alertSinceMs: LEFT + 120 * MIN })
  })

  it('counts the interval from the last check-in, and a check-in clears a missed one', () => {
    const call = LEFT + 150 * MIN
    expect(assessParty(alone({ lastCheckInAtMs: call }), SETTINGS, call + 119 * MIN).state).toBe('out')
    expect(assessParty(alone({ lastCheckInAtMs: call }), SETTINGS, call + 120 * MIN).state).toBe('check-in-missed')
  })

  it('a party of two is never held to the lone-worker schedule', () => {
    expect(assessParty(party({ peopleCount: 2 }), SETTINGS, LEFT + 5 * 60 * MIN).state).toBe('out')
  })

  it('overdue wins over a missed check-in when both hold', () => {
    expect(assessParty(alone(), SETTINGS, BACK + 31 * MIN).state).toBe('overdue')
  })

  it('says when the next deadline falls while out', () => {
    expect(assessParty(alone(), SETTINGS, LEFT + MIN).nextDeadlineMs).toBe(LEFT + 120 * MIN)
    expect(assessParty(party(), DEFAULT_FIELD_SETTINGS, LEFT + MIN).nextDeadlineMs).toBe(BACK + 30 * MIN)
  })
})

describe('alert keys', () => {
  it('differ by step, by alert and by person, and are equal for the same step', () => {
    const a1 = assessParty(party(), SETTINGS, BACK + 30 * MIN)
    const a1later = assessParty(party(), SETTINGS, BACK + 59 * MIN)
    const a2 = assessParty(party(), SETTINGS, BACK + 60 * MIN)
    expect(fieldAlertKey(7, a1, 3)).toBe(fieldAlertKey(7, a1later, 3))
    expect(fieldAlertKey(7, a1, 3)).not.toBe(fieldAlertKey(7, a2, 3))
    expect(fieldAlertKey(7, a1, 3)).not.toBe(fieldAlertKey(7, a1, 4))
    const missed = assessParty(party({ peopleCount: 1 }), SETTINGS, LEFT + 120 * MIN)
    expect(fieldAlertKey(7, missed, 3)).not.toBe(fieldAlertKey(7, a1, 3))
  })
})
