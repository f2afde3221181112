import { ImportBodySchema } from '../../../core/planning/csv'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  const { csv } = await readBodyAs(event, ImportBodySchema)
  return previewShiftImport(useDB(), csv)
})
