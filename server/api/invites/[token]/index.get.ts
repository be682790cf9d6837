export default defineEventHandler(async (event) => {
  const { invite, crewName, inviterName } = await inviteByToken(event)
  return {
    crewName,
    inviterName,
    email: invite.email,
    role: invite.role,
    expiresAt: invite.expiresAt,
    status: inviteStatus(invite),
  }
})
