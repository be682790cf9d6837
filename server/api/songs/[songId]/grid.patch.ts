import { eq } from 'drizzle-orm'
import { GridPatchSchema } from '../../../../shared/schemas/beats'
import { songs } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'grid.edit')
  const patch = await validBody(event, GridPatchSchema)
  const [updated] = await useDb().update(songs).set(patch).where(eq(songs.id, song.id))
    .returning({ bpm: songs.bpm, beatsPerBar: songs.beatsPerBar, offsetMs: songs.offsetMs, feel: songs.feel })
  return updated!
})
