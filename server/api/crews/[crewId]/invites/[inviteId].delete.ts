import { and, eq, isNull } from 'drizzle-orm'
import { invites } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'member.invite')
  const inviteId = idParam(event, 'inviteId', 'Invite')
  const revoked = await useDb().update(invites).set({ revokedAt: new Date() })
    .where(and(eq(invites.id, inviteId), eq(invites.crewId, crewId), isNull(invites.acceptedAt), isNull(invites.revokedAt)))
    .returning({ id: invites.id })
  if (revoked.length === 0) throw notFound('Invite')
  setResponseStatus(event, 204)
  return null
})
