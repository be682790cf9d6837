import { and, eq } from 'drizzle-orm'
import { memberships } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'member.remove')
  const userId = idParam(event, 'userId', 'Member')
  const removed = await useDb().transaction(async (tx) => {
    await assertKeepsAnOwner(tx, crewId, userId, null)
    return tx.delete(memberships).where(and(eq(memberships.crewId, crewId), eq(memberships.userId, userId))).returning({ id: memberships.id })
  })
  if (removed.length === 0) throw notFound('Member')
  setResponseStatus(event, 204)
  return null
})
