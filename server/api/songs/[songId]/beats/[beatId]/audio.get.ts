import { AUDIO_FORMATS } from '../../../../../utils/audio/formats'
import { parseRange, streamStored } from '../../../../../utils/beat-files'

/** The beat's audio for playback, with byte ranges so the browser can seek without loading it all. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  const beat = await findBeat(song.id, idParam(event, 'beatId', 'Beat'))
  const size = beat.sizeBytes
  const range = parseRange(getRequestHeader(event, 'range'), size)
  const { start, end } = range ?? { start: 0, end: size - 1 }
  setResponseHeaders(event, {
    'Content-Type': AUDIO_FORMATS[beat.format].mime,
    'Accept-Ranges': 'bytes',
    'Content-Length': String(end - start + 1),
    // The stored file of a beat id never changes.
    'Cache-Control': 'private, max-age=86400, immutable',
    'ETag': `"${beat.id}"`,
  })
  if (range) {
    setResponseStatus(event, 206)
    setResponseHeader(event, 'Content-Range', `bytes ${start}-${end}/${size}`)
  }
  return sendStream(event, await streamStored(beat.storageKey, start, end))
})
