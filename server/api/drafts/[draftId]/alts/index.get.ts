import { AltListQuerySchema } from '../../../../../shared/schemas/alts'

/** The draft's alts (all lines, or one with ?lineId=), with tallies, my vote and comment counts. */
export default defineEventHandler(async (event) => {
  const { draft, user } = await requireDraftAccess(event, 'song.view')
  const query = validQuery(event, AltListQuerySchema)
  return listAlts(useDb(), draft.id, user.id, query)
})
