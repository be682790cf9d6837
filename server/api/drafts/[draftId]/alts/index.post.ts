import { AltProposeSchema } from '../../../../../shared/schemas/alts'

/** Proposes an alt for one exact line of the draft's head; the draft itself does not change. */
export default defineEventHandler(async (event) => {
  const { draft, song, user, crewId } = await requireDraftAccess(event, 'alt.propose')
  const body = await validBody(event, AltProposeSchema)
  const alt = await proposeAlt(useDb(), { draft, song, user, ...body })
  setResponseStatus(event, 201)
  const [view] = await withAltFigures(useDb(), draft, crewId, await listAlts(useDb(), draft.id, user.id, { altId: alt.id }))
  return view
})
