// Makes a rotation: every working day of its cycle becomes an ordinary shift, light-checked and in
// review when flagged, all in one transaction (coordinator).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, RotationBodySchema)
  const id = createRotation(useDB(), actor, body)
  setResponseStatus(event, 201)
  return loadRotationReply(useDB(), id)
})
