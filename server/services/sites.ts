import { useDB } from '../utils/db'
import { notFound } from '../utils/errors'
import { asc, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { LIGHT_REQUIREMENTS, sites } from '../db/schema'
import { LatitudeSchema, LongitudeSchema, TimeZoneSchema, singleLineText } from '../utils/validation'

export const SiteBodySchema = z.object({
  name: singleLineText(120),
  latitude: LatitudeSchema,
  longitude: LongitudeSchema,
  timezone: TimeZoneSchema,
  elevation: z.number().min(-500).max(9000).nullable().optional(),
  defaultLight: z.enum(LIGHT_REQUIREMENTS, { error: 'must be daylight, civil or any' }).optional(),
  reminderHour: z.number().int().min(0).max(23).optional(),
  // minutes of travel each way, the default for new shifts here (0–720)
  travelMinutes: z.number({ error: 'expected minutes of travel each way' }).int('must be whole minutes').min(0, 'must be 0 or more').max(720, 'must be at most 720').optional(),
  notes: z.string().max(4000).optional()
})

/** Every site not archived (or all with includeArchived), by name. */
export function listSites(includeArchived = false) {
  const query = useDB().select().from(sites)
  return (includeArchived ? query : query.where(isNull(sites.archivedAt))).orderBy(asc(sites.name)).all()
}

export function findSite(id: number) {
  return useDB().select().from(sites).where(eq(sites.id, id)).get()
}

/** The site or a 404 naming it. */
export function requireSite(id: number) {
  const site = findSite(id)
  if (!site) throw notFound('Site')
  return site
}
