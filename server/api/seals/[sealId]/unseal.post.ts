import { UnsealSchema } from '../../../../shared/schemas/finish'

/** The owner lifts a seal with a recorded reason; a new main draft starts from the sealed version. */
export default defineEventHandler(async (event) => {
  const { seal, song, user } = await requireSealAccess(event, 'seal.unseal')
  const { reason } = await validBody(event, UnsealSchema)
  const result = await liftSeal(useDb(), { seal, song, user, reason })
  setResponseStatus(event, 201)
  return result
})
