import { randomUUID } from 'node:crypto'
import { beats } from '../../../../database/schema'
import { beatAudioKey, receiveAudioUpload, removeTemp, storeUpload } from '../../../../utils/beat-files'

export default defineEventHandler(async (event) => {
  // The role is checked before a byte of the body is read: nobody uploads 200 MB to be refused.
  const { song, user } = await requireSongAccess(event, 'beat.upload')
  const upload = await receiveAudioUpload(event, useEnv().UPLOAD_LIMIT_MB * 1024 * 1024)
  try {
    const id = randomUUID()
    const storageKey = beatAudioKey(song.id, id, upload.format)
    await storeUpload(storageKey, upload.tmpPath)
    let beat
    for (let attempt = 0; !beat; attempt++) {
      try {
        ;[beat] = await useDb().insert(beats).values({
          id, songId: song.id, bounce: await nextBounce(song.id), uploadedBy: user.id, originalName: upload.originalName,
          format: upload.format, sizeBytes: upload.sizeBytes, storageKey,
        }).returning()
      }
      catch (error) {
        // Two uploads at once took the same bounce number: take the next one.
        if (attempt < 3 && (error as { cause?: { code?: string } }).cause?.code === '23505') continue
        throw error
      }
    }
    await queueBeatAnalysis(beat.id)
    setResponseStatus(event, 201)
    return { id: beat.id, status: 'queued' as const, bounce: beat.bounce }
  }
  finally {
    await removeTemp(upload.tmpPath)
  }
})
