import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import ShiftLightMarker from '../../components/shift/ShiftLightMarker.vue'
import type { ReviewState } from '../../shared/planning'
import type { LightRequirement } from '../../shared/light'

function shift(minutesBelow: number, requirement: LightRequirement, reviewState: ReviewState) {
  return { lightCheck: { requirement, minutesBelow, flagged: minutesBelow >= 1 }, reviewState }
}

// The light state must read in words and an icon, never colour alone (docs/look.md).
describe('the light-state marker', () => {
  it('says Clear, with an icon, for a shift that meets its requirement', async () => {
    const el = await mountSuspended(ShiftLightMarker, { props: { shift: shift(0, 'daylight', 'not-needed'), detail: true } })
    expect(el.text()).toContain('Clear')
    expect(el.text()).toContain('Within daylight throughout')
    expect(el.find('svg').exists()).toBe(true)
    expect(el.attributes('data-light-state')).toBe('clear')
  })

  it('says how far below the requirement a flagged shift is, in hours and minutes', async () => {
    const el = await mountSuspended(ShiftLightMarker, { props: { shift: shift(45, 'daylight', 'pending') } })
    expect(el.text()).toBe('Awaiting review: 45 min below daylight')
    const long = await mountSuspended(ShiftLightMarker, { props: { shift: shift(205, 'civil', 'pending') } })
    expect(long.text()).toBe('Awaiting review: 3 h 25 min below civil light')
  })

  it('gives the short form on calendar chips, with the minutes in its title', async () => {
    const el = await mountSuspended(ShiftLightMarker, { props: { shift: shift(180, 'daylight', 'pending'), short: true } })
    expect(el.text()).toBe('Awaiting review: below its light')
    expect(el.attributes('title')).toContain('Below its light: 3 h below daylight')
  })

  it('names the safety decision on a reviewed shift', async () => {
    for (const [state, word] of [['approved', 'Approved'], ['rejected', 'Rejected'], ['changes-requested', 'Sent back']] as const) {
      const el = await mountSuspended(ShiftLightMarker, { props: { shift: shift(30, 'civil', state), detail: true } })
      expect(el.text()).toContain(word)
      expect(el.text()).toContain('30 min below civil light')
      expect(el.attributes('data-light-state')).toBe(state)
    }
  })

  it('says a lit work area needs no daylight, even in darkness', async () => {
    const el = await mountSuspended(ShiftLightMarker, { props: { shift: shift(0, 'any', 'not-needed'), detail: true } })
    expect(el.text()).toContain('Lit work area: no daylight needed')
  })
})
