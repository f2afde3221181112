import { afterEach, describe, expect, it, vi } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import ShiftForm from '../../components/shift/ShiftForm.vue'
import type { ShiftCheckReply, ShiftDraft, SiteItem } from '../../shared/planning'

// Invented demo data (not a reference): one site, two people.
const SITE: SiteItem = { id: 1, name: 'Test Fjord Camp', latitude: 78.2, longitude: 15.6, elevation: null, timezone: 'Arctic/Longyearbyen', defaultLight: 'civil', notes: '', archivedAt: null }
const PEOPLE = [{ id: 7, name: 'Test Person', email: 'person@example.test', role: 'crew' as const, active: true }]
const DRAFT: ShiftDraft = { siteId: 1, title: 'Route check', start: '2027-03-02T10:00', end: '2027-03-02T13:00', light: 'civil', assigneeIds: [7], notes: '', overrideReason: '' }

let reply: ShiftCheckReply = { lightCheck: { requirement: 'civil', minutesBelow: 0, flagged: false }, bands: [], conflicts: [], timeNotes: [] }
const checked: unknown[] = []
registerEndpoint('/api/shifts/check', {
  method: 'POST',
  handler: async (event) => {
    const { readBody } = await import('h3')
    checked.push(await readBody(event))
    return reply
  }
})

async function mountForm(draft: Partial<ShiftDraft> = {}) {
  return mountSuspended(ShiftForm, { props: { initial: { ...DRAFT, ...draft }, sites: [SITE], people: PEOPLE, crews: [] } })
}

afterEach(() => {
  checked.length = 0
  reply = { lightCheck: { requirement: 'civil', minutesBelow: 0, flagged: false }, bands: [], conflicts: [], timeNotes: [] }
})

describe('the shift form', () => {
  it('refuses an end before the start and says so beside the end', async () => {
    const form = await mountForm({ end: '2027-03-02T09:00' })
    await form.find('form').trigger('submit')
    expect(form.emitted('submit')).toBeUndefined()
    expect(form.find('[data-error-for="shift-end"]').text()).toContain('The end must be after the start')
  })

  it('refuses a missing task and a shift longer than 7 days', async () => {
    const form = await mountForm({ title: '  ', end: '2027-03-10T10:00' })
    await form.find('form').trigger('submit')
    expect(form.emitted('submit')).toBeUndefined()
    expect(form.find('[data-error-for="shift-title"]').text()).toContain('Say what the task is')
    expect(form.find('[data-error-for="shift-end"]').text()).toContain('at most 7 days')
  })

  it('shows the server\'s light check of the draft and sends the draft to it', async () => {
    reply = { ...reply, lightCheck: { requirement: 'civil', minutesBelow: 50, flagged: true }, bands: [{ kind: 'nautical', start: '2027-03-02T17:00:00+01:00', end: '2027-03-02T17:50:00+01:00' }] }
    const form = await mountForm({ start: '2027-03-02T17:00', end: '2027-03-02T17:50' })
    await vi.waitFor(() => expect(form.find('[data-testid="preview-verdict"]').exists()).toBe(true), { timeout: 5000 })
    expect(form.find('[data-testid="preview-verdict"]').text()).toContain('Awaiting review: 50 min below civil light')
    expect(form.find('[data-testid="shift-check-preview"]').text()).toContain('17:00–17:50 Nautical twilight (50 min)')
    expect(checked.at(-1)).toMatchObject({ siteId: 1, start: '2027-03-02T17:00', end: '2027-03-02T17:50', light: 'civil', assigneeIds: [7] })
  })

  it('asks for a typed reason before keeping a shift with conflict warnings', async () => {
    reply = { ...reply, conflicts: [{ kind: 'rest', personId: 7, personName: 'Test Person', otherShiftId: 3, message: 'Test Person has 4 h of rest between shifts' }] }
    const form = await mountForm()
    await vi.waitFor(() => expect(form.find('[data-testid="conflict-list"]').exists()).toBe(true), { timeout: 5000 })
    await form.find('form').trigger('submit')
    expect(form.emitted('submit')).toBeUndefined()
    expect(form.find('[data-error-for="shift-override"]').text()).toContain('give the reason')
    await form.find('#shift-override').setValue('Only qualified boat driver this week')
    await form.find('form').trigger('submit')
    expect(form.emitted('submit')?.[0]?.[0]).toMatchObject({ overrideReason: 'Only qualified boat driver this week', title: 'Route check' })
  })

  it('saves a valid shift without conflicts as it is', async () => {
    const form = await mountForm()
    await vi.waitFor(() => expect(form.find('[data-testid="preview-verdict"]').exists()).toBe(true), { timeout: 5000 })
    await form.find('form').trigger('submit')
    expect(form.emitted('submit')?.[0]?.[0]).toMatchObject({ siteId: 1, start: '2027-03-02T10:00', end: '2027-03-02T13:00', light: 'civil' })
  })
})
