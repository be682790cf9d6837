import { DecisionSchema } from '../../../../shared/schemas/finish'

/** A listed signer approves or declines, with a comment; the last approval seals the version. */
export default defineEventHandler(async (event) => {
  const { request, song, user } = await requireSignoffAccess(event, 'signoff.sign')
  const body = await validBody(event, DecisionSchema)
  const db = useDb()
  const { sealed } = await decideSignoff(db, { request, song, user, decision: body.decision, comment: body.comment })
  return { sealed, signoff: await loadSignoffView(db, request.id) }
})
