import { randomUUID } from 'node:crypto'
import { ScratchUploadQuerySchema } from '../../../../../shared/schemas/scratch'
import { scratchTakes } from '../../../../database/schema'
import { detectScratchFormat, SCRATCH_FORMATS_TEXT } from '../../../../utils/audio/formats'
import { removeTemp, storeUpload } from '../../../../utils/beat-files'
import { scratchKey, takeView } from '../../../../utils/scratch'
import { receiveUpload } from '../../../../utils/uploads'

/**
 * A scratch take: multipart field `file` with what the browser recorded, pinned to `?bar=`.
 * The bar, duration and role are checked before the audio is read; the audio goes through
 * the same checked upload path as beats (content decides the format, a size limit).
 */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const query = validQuery(event, ScratchUploadQuerySchema)
  const { song, user } = await requireSongAccess(event, 'scratch.record')
  const upload = await receiveUpload(event, {
    limitBytes: useEnv().SCRATCH_LIMIT_MB * 1024 * 1024, detect: detectScratchFormat, accepted: SCRATCH_FORMATS_TEXT, what: 'the take', fallbackName: 'take',
  })
  try {
    const id = randomUUID()
    const storageKey = scratchKey(song.id, id, upload.format)
    await storeUpload(storageKey, upload.tmpPath)
    const [take] = await useDb().insert(scratchTakes).values({
      id, songId: song.id, authorId: user.id, bar: query.bar, name: query.name ?? `Take at bar ${query.bar}`,
      durationMs: query.durationMs, format: upload.format, sizeBytes: upload.sizeBytes, storageKey,
    }).returning()
    setResponseStatus(event, 201)
    return takeView(take!, user.name)
  }
  finally {
    await removeTemp(upload.tmpPath)
  }
})
