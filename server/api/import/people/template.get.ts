// The people import template: header and two example rows; crews separated by ';'.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', 'attachment; filename="gloamline-people-template.csv"')
  return buildPeopleImportTemplate()
})
