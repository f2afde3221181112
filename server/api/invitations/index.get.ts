// Invitations with their state (open, used, expired), newest first; never the token.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'coordinator')
  return { invitations: listInvitations(useDB()) }
})
