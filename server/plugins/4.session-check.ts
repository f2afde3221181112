// The page asks /api/_auth/session whether it is signed in; that built-in route reads only the cookie.
// Check the server-side session there too, so a signed-out or ended session shows as signed out.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (_session, event) => {
    await requireRole(event)
  })
})
