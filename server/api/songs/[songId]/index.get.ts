import { eq } from 'drizzle-orm'
import { crews } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song, role } = await requireSongAccess(event, 'song.view')
  const [crew] = await useDb().select({ name: crews.name }).from(crews).where(eq(crews.id, song.crewId))
  return {
    id: song.id,
    title: song.title,
    crewId: song.crewId,
    crewName: crew!.name,
    role,
    grid: { bpm: song.bpm, beatsPerBar: song.beatsPerBar, offsetMs: song.offsetMs, feel: song.feel },
    createdAt: song.createdAt,
    updatedAt: song.updatedAt,
  }
})
