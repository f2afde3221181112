import { z } from 'zod'
import { IdParamsSchema } from '../../../utils/validation'

const BodySchema = z.object({}).strict()

// Records that the party is back: its alerts stop.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator', 'safety', 'crew')
  const { id } = readParamsAs(event, IdParamsSchema)
  await readBodyAs(event, BodySchema)
  return recordReturn(useDB(), actor, id, nowMs())
})
