// How many browsers the signed-in person is signed in on (settings, next to "sign out everywhere").
export default defineEventHandler(async (event) => {
  const { user } = await requireSession(event)
  return { live: countLiveSessions(useDB(), user.id) }
})
