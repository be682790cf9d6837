import { readStored } from '../../../../../utils/beat-files'

/** Waveform peaks, so the browser draws the beat without decoding it. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  const beat = await findBeat(song.id, idParam(event, 'beatId', 'Beat'))
  const bytes = beat.peaksKey ? await readStored(beat.peaksKey) : null
  if (!bytes) throw createError({ statusCode: 404, message: beat.status === 'failed' ? 'This beat could not be analysed, so it has no waveform.' : 'The waveform is drawn once the analysis is ready.' })
  setResponseHeaders(event, { 'Content-Type': 'application/json', 'Cache-Control': 'private, max-age=86400, immutable' })
  return bytes.toString('utf8')
})
