import { asc, eq } from 'drizzle-orm'
import { memberships, users } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'member.list')
  return useDb()
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.crewId, crewId))
    .orderBy(asc(users.name))
})
