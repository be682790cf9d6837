import { ANALYSIS_LIMITS, AnalysisBodySchema } from '../../../shared/schemas/prosody'
import { analyseDraft } from '../../utils/prosody/analyse'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const body = await limitedJsonBody(event, ANALYSIS_LIMITS.bodyBytes)
  if (Array.isArray((body as { lines?: unknown })?.lines) && (body as { lines: unknown[] }).lines.length > ANALYSIS_LIMITS.lines) {
    throw createError({ statusCode: 413, message: `Send at most ${ANALYSIS_LIMITS.lines} lines per analysis (this had ${(body as { lines: unknown[] }).lines.length}); analyse a section at a time.` })
  }
  const input = parseOr400(AnalysisBodySchema, body, 'analysis')
  const lexicon = await lexiconFor(event, input.crewId)
  return analyseDraft(input, lexicon)
})
