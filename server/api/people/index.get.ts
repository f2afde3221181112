export default defineEventHandler(async (event) => {
  const viewer = await requireRole(event)
  return listPeople(viewer)
})
