// The rotations planned at a site in a year, with their live shifts, for the year chart (coordinator, safety).
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator', 'safety')
  const query = readQueryAs(event, SiteRotationsQuerySchema)
  return listSiteRotations(useDB(), query.siteId, query.year)
})
