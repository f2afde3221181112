import { z } from 'zod'
import { COLD_UNITS } from '../../../../../shared/cold'
import { IdParamsSchema } from '../../../../utils/validation'

const BodySchema = z.object({
  csv: z.string({ error: 'csv must be the text of the file' }).min(1, 'the file is empty').max(1_000_000, 'the file may be at most 1 MB'),
  units: z.enum(COLD_UNITS, { error: 'units must be metric or imperial' })
})

// A CSV of readings (header: time, temperature, wind). Every row is checked first: one bad row
// refuses the whole file with its row and column named, and nothing is stored.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'safety', 'coordinator')
  const { id } = readParamsAs(event, IdParamsSchema)
  const body = await readBodyAs(event, BodySchema)
  const site = requireSite(id)
  const parsed = parseObservationCsv(body.csv, body.units, site.timezone, nowMs())
  if (parsed.issues.length) throw invalidInput(parsed.issues)
  const stored = insertSiteObservations(useDB(), actor.id, site.id, parsed.rows, 'csv')
  reassessSiteReviewReasons(useDB(), site.id)
  setResponseStatus(event, 201)
  return { siteId: site.id, stored: stored.length, observations: stored }
})
