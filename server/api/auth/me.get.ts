export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  return { user }
})
