import { useDB } from '../utils/db'
import { notFound } from '../utils/errors'
import { asc, eq, isNull } from 'drizzle-orm'
import { sites } from '../db/schema'

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
