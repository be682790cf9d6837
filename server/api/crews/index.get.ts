import { asc, eq } from 'drizzle-orm'
import { crews, memberships } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return useDb()
    .select({ id: crews.id, name: crews.name, role: memberships.role })
    .from(memberships)
    .innerJoin(crews, eq(crews.id, memberships.crewId))
    .where(eq(memberships.userId, user.id))
    .orderBy(asc(crews.name))
})
