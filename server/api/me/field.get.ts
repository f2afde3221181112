// The signed-in person's parties out now, for their check-in and back buttons at the top of the home.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  return listOwnOpenOutings(useDB(), user.id, nowMs())
})
