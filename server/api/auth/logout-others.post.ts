// "Sign out everywhere else": ends every session of the signed-in person except this browser's.
// (To leave this browser too, sign out as usual afterwards.)
export default defineEventHandler(async (event) => {
  const { user, sid } = await requireSession(event)
  const ended = endPersonSessions(useDB(), user.id, sid)
  return { ok: true, ended }
})
