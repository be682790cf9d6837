import { desc, eq } from 'drizzle-orm'
import { songs } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'song.view')
  return useDb()
    .select({ id: songs.id, title: songs.title, bpm: songs.bpm, updatedAt: songs.updatedAt })
    .from(songs)
    .where(eq(songs.crewId, crewId))
    .orderBy(desc(songs.updatedAt))
})
