// What a rotation would make, over the light, before anything is saved (coordinator). Same body and
// the same 400s as POST /api/rotations; nothing is written.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  const body = await readBodyAs(event, RotationBodySchema)
  return previewRotation(useDB(), body)
})
