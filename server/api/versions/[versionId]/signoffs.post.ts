import { SignoffRequestSchema } from '../../../../shared/schemas/finish'

/** Asks the crew to sign off this version (the draft's newest) as the final sheet. */
export default defineEventHandler(async (event) => {
  const { version, song, user } = await requireVersionAccess(event, 'signoff.request')
  const body = await validBody(event, SignoffRequestSchema)
  const db = useDb()
  const request = await openSignoff(db, { song, versionId: version.id, requester: user, note: body.note })
  setResponseStatus(event, 201)
  return loadSignoffView(db, request.id)
})
