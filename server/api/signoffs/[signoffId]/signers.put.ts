import { SignersSchema } from '../../../../shared/schemas/finish'

/** The owner decides who must sign; signers kept on keep their decisions. */
export default defineEventHandler(async (event) => {
  const { request, song, user } = await requireSignoffAccess(event, 'signoff.signers')
  const { userIds } = await validBody(event, SignersSchema)
  const db = useDb()
  await setSignoffSigners(db, { request, song, userIds, by: user })
  return loadSignoffView(db, request.id)
})
