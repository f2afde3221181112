import { z } from 'zod'
import { IdParamsSchema } from '../../utils/validation'

const QuerySchema = z.object({
  // the version the coordinator saw: a stale copy is refused with 409, as for an edit
  version: z.coerce.number({ error: 'expected the version you saw' }).int().positive().optional()
})

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const { version } = readQueryAs(event, QuerySchema)
  cancelShift(useDB(), actor, id, version)
  return findShiftView(useDB(), id)!
})
