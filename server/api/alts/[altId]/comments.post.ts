import { AltCommentSchema } from '../../../../shared/schemas/alts'

export default defineEventHandler(async (event) => {
  const { alt, song, user } = await requireAltAccess(event, 'alt.comment')
  const { body } = await validBody(event, AltCommentSchema)
  setResponseStatus(event, 201)
  return addAltComment(useDb(), { alt, song, user, body })
})
