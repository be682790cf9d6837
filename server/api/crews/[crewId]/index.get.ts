import { count, eq } from 'drizzle-orm'
import { crews, memberships } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  const { role } = await requireCrewAccess(event, crewId, 'crew.view')
  const db = useDb()
  const [crew] = await db.select({ id: crews.id, name: crews.name, createdAt: crews.createdAt }).from(crews).where(eq(crews.id, crewId))
  const [members] = await db.select({ n: count() }).from(memberships).where(eq(memberships.crewId, crewId))
  return { ...crew!, role, memberCount: members!.n }
})
