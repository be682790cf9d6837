import { SplitSchema } from '../../../../../shared/schemas/finish'

/** Replaces the split sheet; shares must total exactly 100.00 %. Locked while the song is sealed. */
export default defineEventHandler(async (event) => {
  const { song, user } = await requireSongAccess(event, 'split.edit')
  const body = await validBody(event, SplitSchema)
  const db = useDb()
  if (await activeSealOfSong(db, song.id)) {
    throw createError({ statusCode: 409, message: 'The split sheet is sealed with the final sheet. The owner must unseal the song before it changes.' })
  }
  await replaceSplitLines(db, song.id, song.crewId, body.lines.map(l => ({ userId: l.userId, name: l.name, role: l.role, share: l.share })))
  await publishSongEvent(db, song.id, { type: 'split' })
  return splitView(db, song.id, user.id)
})
