// The body of POST /api/shifts, /api/shifts/check and PATCH /api/shifts/:id: the handlers validate
// with these, and the shift form checks a draft with the same schema before sending it.
import { z } from 'zod'
import { InstantSchema, LightRequirementSchema, TravelMinutesSchema, singleLineText } from './fields'
import { MAX_NOTES_LENGTH, MAX_TITLE_LENGTH } from './limits'
import { WallClockTimeSchema } from './calendar'

/** A shift time: an ISO 8601 instant with an offset, or a wall-clock time read in the site's zone. */
export const ShiftTimeSchema = z.union([
  InstantSchema,
  WallClockTimeSchema
], { error: 'expected an ISO 8601 instant, or a local time YYYY-MM-DDTHH:mm in the site\'s zone' })

const AssigneeIdsSchema = z.array(z.number().int().positive(), { error: 'expected a list of person ids' }).max(200)

export const ShiftBodySchema = z.object({
  siteId: z.number({ error: 'expected a site id' }).int().positive(),
  title: singleLineText(MAX_TITLE_LENGTH),
  start: ShiftTimeSchema,
  end: ShiftTimeSchema,
  light: LightRequirementSchema,
  assigneeIds: AssigneeIdsSchema.default([]),
  notes: z.string().max(MAX_NOTES_LENGTH).optional(),
  // each way; absent: the site's travelMinutes
  travelMinutes: TravelMinutesSchema.optional(),
  overrideReason: z.string().trim().max(1000).optional()
})
export type ShiftInput = z.infer<typeof ShiftBodySchema>

export const ShiftPatchSchema = ShiftBodySchema.partial().extend({
  // no default here: zod 4 still applies the body's default([]) under partial(), and a patch that
  // leaves the people out (a drag on the calendar) must keep them, not empty the shift
  assigneeIds: AssigneeIdsSchema.optional(),
  version: z.number({ error: 'expected the version you edited' }).int().positive().optional()
})
export type ShiftPatch = z.infer<typeof ShiftPatchSchema>
