import { CrewSchema } from '../../../shared/schemas/crews'
import { crews, memberships } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { name } = await validBody(event, CrewSchema)
  const crew = await useDb().transaction(async (tx) => {
    const [crew] = await tx.insert(crews).values({ name, createdBy: user.id }).returning()
    await tx.insert(memberships).values({ crewId: crew!.id, userId: user.id, role: 'owner' })
    return crew!
  })
  setResponseStatus(event, 201)
  return { id: crew.id, name: crew.name, role: 'owner' as const }
})
