import { ANALYSIS_LIMITS, AnalysisBodySchema, AnalysisQuerySchema } from '../../../shared/schemas/prosody'
import { analysisResponse } from '../../utils/prosody/response'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const query = validQuery(event, AnalysisQuerySchema)
  const body = await limitedJsonBody(event, ANALYSIS_LIMITS.bodyBytes)
  if (Array.isArray((body as { lines?: unknown })?.lines) && (body as { lines: unknown[] }).lines.length > ANALYSIS_LIMITS.lines) {
    throw createError({ statusCode: 413, message: `Send at most ${ANALYSIS_LIMITS.lines} lines per analysis (this had ${(body as { lines: unknown[] }).lines.length}); analyse a section at a time.` })
  }
  const input = parseOr400(AnalysisBodySchema, body, 'analysis')
  const lexicon = await lexiconFor(event, input.crewId)
  // The JSON text is made (or found) by the engine: each word's JSON is kept with its line.
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return analysisResponse(input, lexicon, input.detail ?? query.detail ?? 'words')
})
