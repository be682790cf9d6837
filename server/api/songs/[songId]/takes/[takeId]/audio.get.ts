import { SCRATCH_FORMATS } from '../../../../../utils/audio/formats'
import { sendStoredFile } from '../../../../../utils/beat-files'
import { requireTakeAccess } from '../../../../../utils/scratch'

/** A take's audio for playback, with byte ranges. */
export default defineEventHandler(async (event) => {
  const { take } = await requireTakeAccess(event, 'song.view')
  return sendStoredFile(event, { key: take.storageKey, size: take.sizeBytes, mime: SCRATCH_FORMATS[take.format].mime, etag: take.id })
})
