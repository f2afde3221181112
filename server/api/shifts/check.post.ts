import { z } from 'zod'
import { ShiftBodySchema } from '../../../shared/schemas/shift'

const BodySchema = ShiftBodySchema.extend({
  // the stored shift being edited, so it is not its own neighbour in the conflict check
  shiftId: z.number({ error: 'expected a shift id' }).int().positive().optional()
})

// Previews a shift as POST /api/shifts would store it (light check, bands, conflicts), writing nothing.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, BodySchema)
  return previewShiftCheck(useDB(), body)
})
