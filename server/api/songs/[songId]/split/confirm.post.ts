import { SplitConfirmSchema } from '../../../../../shared/schemas/finish'

/** A listed member confirms (or takes back) their own line of the split sheet. */
export default defineEventHandler(async (event) => {
  const { song, user } = await requireSongAccess(event, 'split.confirm')
  const { confirm } = await validBody(event, SplitConfirmSchema)
  const db = useDb()
  if (await activeSealOfSong(db, song.id)) {
    throw createError({ statusCode: 409, message: 'The split sheet is sealed with the final sheet and cannot change.' })
  }
  await confirmOwnSplitLine(db, song.id, user.id, confirm)
  await publishSongEvent(db, song.id, { type: 'split' })
  return splitView(db, song.id, user.id)
})
