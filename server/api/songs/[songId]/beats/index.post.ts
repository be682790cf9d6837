import { randomUUID } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { beats, songs } from '../../../../database/schema'
import { beatAudioKey, receiveAudioUpload, removeTemp, storeUpload } from '../../../../utils/beat-files'

export default defineEventHandler(async (event) => {
  // The role is checked before a byte of the body is read: nobody uploads 200 MB to be refused.
  const { song, user } = await requireSongAccess(event, 'beat.upload')
  const upload = await receiveAudioUpload(event, useEnv().UPLOAD_LIMIT_MB * 1024 * 1024)
  const id = randomUUID()
  const storageKey = beatAudioKey(song.id, id, upload.format)
  let stored = false
  let recorded = false
  try {
    await storeUpload(storageKey, upload.tmpPath)
    stored = true
    // Many uploads at once to one song each get the next bounce number: the song row is locked
    // while its number is taken, so none collides and none is refused.
    const beat = await useDb().transaction(async (tx) => {
      await tx.select({ id: songs.id }).from(songs).where(eq(songs.id, song.id)).for('update')
      const [created] = await tx.insert(beats).values({
        id, songId: song.id, bounce: await nextBounce(tx, song.id), uploadedBy: user.id, originalName: upload.originalName,
        format: upload.format, sizeBytes: upload.sizeBytes, storageKey,
      }).returning()
      return created!
    })
    recorded = true
    await queueBeatAnalysis(beat.id)
    setResponseStatus(event, 201)
    return { id: beat.id, status: 'queued' as const, bounce: beat.bounce }
  }
  catch (error) {
    // No row points at the file: do not leave it in storage.
    if (stored && !recorded) await useStorage('files').removeItem(storageKey).catch(() => undefined)
    throw error
  }
  finally {
    await removeTemp(upload.tmpPath)
  }
})
