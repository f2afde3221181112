import { describe, expect, it } from 'vitest'
import { ShiftBodySchema, ShiftPatchSchema } from '../../shared/schemas/shift'
import { SiteBodySchema } from '../../shared/schemas/site'
import { PersonBodySchema, PersonPatchSchema } from '../../shared/schemas/person'
import { collectFieldIssues } from '../../shared/schemas/issues'
import { validateShiftDraft, type ShiftDraft } from '../../shared/planning'

// The request schemas are our own rules (no outside reference): one definition that the handlers
// validate with and the forms check drafts with, so both refuse the same input by the same field.

const SHIFT = { siteId: 1, title: 'Mast survey', start: '2027-03-02T09:00', end: '2027-03-02T13:00', light: 'daylight', assigneeIds: [] }
const DRAFT: ShiftDraft = { ...SHIFT, light: 'daylight', notes: '', overrideReason: '' }

describe('shared request schemas', () => {
  it('accept a plain shift and name the field of each bad one', () => {
    expect(ShiftBodySchema.safeParse(SHIFT).success).toBe(true)
    expect(collectFieldIssues(ShiftBodySchema, { ...SHIFT, light: 'moonlight' })).toEqual({ light: 'must be daylight, civil or any' })
    expect(collectFieldIssues(ShiftBodySchema, { ...SHIFT, travelMinutes: 721 })).toEqual({ travelMinutes: 'must be at most 720' })
    expect(collectFieldIssues(ShiftBodySchema, { ...SHIFT, title: 'two\nlines' })).toEqual({ title: 'must be one line without control characters' })
    // a patch without people keeps them: no default list is filled in
    expect(ShiftPatchSchema.parse({ title: 'Renamed' }).assigneeIds).toBeUndefined()
  })

  it('let the shift form refuse what the handler refuses, in the form\'s words where it has them', () => {
    expect(validateShiftDraft(DRAFT)).toEqual({})
    expect(validateShiftDraft({ ...DRAFT, travelMinutes: 721 })).toEqual({ travelMinutes: 'must be at most 720' })
    expect(validateShiftDraft({ ...DRAFT, notes: 'x'.repeat(4001) })).toHaveProperty('notes')
    expect(validateShiftDraft({ ...DRAFT, siteId: null })).toEqual({ siteId: 'Choose the site.' })
    expect(validateShiftDraft({ ...DRAFT, title: 'a\u2028b' })).toEqual({ title: 'Keep the task on one line.' })
  })

  it('check sites and people by the same fields as the handlers', () => {
    const site = { name: 'Ravnvik mast', latitude: 78.2, longitude: 15.6, timezone: 'Arctic/Longyearbyen' }
    expect(SiteBodySchema.safeParse(site).success).toBe(true)
    expect(collectFieldIssues(SiteBodySchema, { ...site, latitude: 91, timezone: '+02:00' })).toEqual({ latitude: 'must be between -90 and 90', timezone: 'not an IANA time zone name' })
    expect(collectFieldIssues(PersonBodySchema, { name: 'Ada Lind', email: 'ada@', role: 'admin' })).toEqual({ email: 'not an e-mail address', role: 'must be coordinator, safety or crew' })
    expect(PersonBodySchema.parse({ name: ' Ada Lind ', email: 'Ada@Northwake.TEST', role: 'crew' })).toEqual({ name: 'Ada Lind', email: 'ada@northwake.test', role: 'crew' })
    expect(collectFieldIssues(PersonPatchSchema, { colour: 'red' })).toEqual({ body: expect.stringContaining('colour') })
  })
})
