import { AUDIO_FORMATS } from '../../../../../utils/audio/formats'
import { sendStoredFile } from '../../../../../utils/beat-files'

/** The beat's audio for playback, with byte ranges so the browser can seek without loading it all. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  const beat = await findBeat(song.id, idParam(event, 'beatId', 'Beat'))
  return sendStoredFile(event, { key: beat.storageKey, size: beat.sizeBytes, mime: AUDIO_FORMATS[beat.format].mime, etag: beat.id })
})
