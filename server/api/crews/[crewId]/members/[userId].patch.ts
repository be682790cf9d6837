import { and, eq } from 'drizzle-orm'
import { RoleChangeSchema } from '../../../../../shared/schemas/crews'
import { memberships } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'member.setRole')
  const userId = idParam(event, 'userId', 'Member')
  const { role } = await validBody(event, RoleChangeSchema)
  const updated = await useDb().transaction(async (tx) => {
    await assertKeepsAnOwner(tx, crewId, userId, role)
    const [row] = await tx.update(memberships).set({ role })
      .where(and(eq(memberships.crewId, crewId), eq(memberships.userId, userId)))
      .returning({ userId: memberships.userId, role: memberships.role })
    return row
  })
  if (!updated) throw notFound('Member')
  return updated
})
