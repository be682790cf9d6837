import { AltListQuerySchema } from '../../../../../shared/schemas/alts'

/** The draft's alts (all lines, or one with ?lineId=), with tallies, my vote, comment counts and syllable/family figures. */
export default defineEventHandler(async (event) => {
  const { draft, user, crewId } = await requireDraftAccess(event, 'song.view')
  const query = validQuery(event, AltListQuerySchema)
  return withAltFigures(useDb(), draft, crewId, await listAlts(useDb(), draft.id, user.id, query))
})
