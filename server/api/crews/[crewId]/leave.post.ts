import { and, eq } from 'drizzle-orm'
import { memberships } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  const { user } = await requireCrewAccess(event, crewId, 'crew.view')
  await useDb().transaction(async (tx) => {
    await assertKeepsAnOwner(tx, crewId, user.id, null)
    await tx.delete(memberships).where(and(eq(memberships.crewId, crewId), eq(memberships.userId, user.id)))
  })
  setResponseStatus(event, 204)
  return null
})
