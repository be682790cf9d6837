import { eq } from 'drizzle-orm'
import { users } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  const beat = await findBeat(song.id, idParam(event, 'beatId', 'Beat'))
  const [uploader] = beat.uploadedBy ? await useDb().select({ name: users.name }).from(users).where(eq(users.id, beat.uploadedBy)) : []
  return beatView(beat, uploader?.name)
})
