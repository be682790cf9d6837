import { AltVoteSchema } from '../../../../shared/schemas/alts'

/** Sets, changes (one vote per member) or takes back (0) my vote on an open alt. */
export default defineEventHandler(async (event) => {
  const { alt, song, user } = await requireAltAccess(event, 'alt.vote')
  const { value } = await validBody(event, AltVoteSchema)
  return voteOnAlt(useDb(), { alt, song, user, value })
})
