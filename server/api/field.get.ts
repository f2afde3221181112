// The field board: everyone out now, when expected back, last check-in, and parties back in the last 12 h.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator', 'safety')
  return listFieldBoard(useDB(), nowMs())
})
