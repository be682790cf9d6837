import { ANALYSIS_LIMITS, AnalysisBodySchema, AnalysisQuerySchema } from '../../../shared/schemas/prosody'
import { analysisResponseIn, chooseCoding } from '../../utils/prosody/response'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const query = validQuery(event, AnalysisQuerySchema)
  const body = await limitedJsonBody(event, ANALYSIS_LIMITS.bodyBytes)
  if (Array.isArray((body as { lines?: unknown })?.lines) && (body as { lines: unknown[] }).lines.length > ANALYSIS_LIMITS.lines) {
    throw createError({ statusCode: 413, message: `Send at most ${ANALYSIS_LIMITS.lines} lines per analysis (this had ${(body as { lines: unknown[] }).lines.length}); analyse a section at a time.` })
  }
  const input = parseOr400(AnalysisBodySchema, body, 'analysis')
  const lexicon = await lexiconFor(event, input.crewId)
  // The JSON is made (or found) by the engine, each word's JSON kept with its line, and sent
  // compressed when the client accepts it (a large body costs more to write than to compress).
  const { body: bytes, coding } = analysisResponseIn(input, lexicon, input.detail ?? query.detail ?? 'words', chooseCoding(getRequestHeader(event, 'accept-encoding')))
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  appendResponseHeader(event, 'vary', 'Accept-Encoding')
  if (coding !== 'identity') setResponseHeader(event, 'content-encoding', coding)
  return bytes
})
