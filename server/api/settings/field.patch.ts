// Changes the field settings (coordinator or safety).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator', 'safety')
  const patch = await readBodyAs(event, FieldSettingsPatchSchema)
  return saveFieldSettings(useDB(), actor.id, patch)
})
