// The shift import template: header and two example rows (local times in each site's zone).
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', 'attachment; filename="gloamline-shifts-template.csv"')
  return buildShiftImportTemplate()
})
