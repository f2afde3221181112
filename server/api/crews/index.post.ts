export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, CrewBodySchema)
  const crew = createCrew(useDB(), actor.id, body)
  setResponseStatus(event, 201)
  return crew
})
