import { IdParamsSchema } from '../../utils/validation'

// Cancels a rotation's shifts from a local date on (coordinator); they keep their records.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const { from } = readQueryAs(event, RotationCancelQuerySchema)
  const { cancelled } = cancelRotationFrom(useDB(), actor, id, from)
  return { ...loadRotationReply(useDB(), id), cancelled }
})
