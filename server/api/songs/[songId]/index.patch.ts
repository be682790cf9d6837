import { eq } from 'drizzle-orm'
import { SongRenameSchema } from '../../../../shared/schemas/songs'
import { songs } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.rename')
  const { title } = await validBody(event, SongRenameSchema)
  const [updated] = await useDb().update(songs).set({ title }).where(eq(songs.id, song.id)).returning({ id: songs.id, title: songs.title })
  return updated!
})
