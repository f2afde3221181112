import { ImportBodySchema } from '../../../core/planning/csv'
// All rows or none: a file with any bad row answers 400 with the preview and writes nothing.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const { csv } = await readBodyAs(event, ImportBodySchema)
  const result = importShiftsFromCsv(useDB(), actor.id, csv)
  setResponseStatus(event, 201)
  return result
})
