import { z } from 'zod'
import { DEFAULT_MIN_CIVIL_HOURS } from '../../shared/light'
import { numberBetween } from '../utils/validation'

const QuerySchema = z.object({ minCivilHours: numberBetween(0.25, 24).optional() })

// Every active site side by side: today's and tomorrow's light, shift counts and the next change of season.
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const q = readQueryAs(event, QuerySchema)
  return loadLightBoard(useDB(), nowMs(), q.minCivilHours ?? DEFAULT_MIN_CIVIL_HOURS)
})
