import { z } from 'zod'

const QuerySchema = z.object({ archived: z.enum(['0', '1']).optional() })

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { archived } = readQueryAs(event, QuerySchema)
  return listSites(archived === '1')
})
