export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const patch = await readBodyAs(event, WorkRulesPatchSchema)
  return saveWorkRules(useDB(), actor.id, patch)
})
