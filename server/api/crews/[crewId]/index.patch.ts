import { eq } from 'drizzle-orm'
import { CrewSchema } from '../../../../shared/schemas/crews'
import { crews } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  const { role } = await requireCrewAccess(event, crewId, 'crew.rename')
  const { name } = await validBody(event, CrewSchema)
  const [crew] = await useDb().update(crews).set({ name }).where(eq(crews.id, crewId)).returning({ id: crews.id, name: crews.name })
  return { ...crew!, role }
})
