import { RhymesQuerySchema } from '../../../shared/schemas/prosody'
import { findRhymes } from '../../utils/prosody/finder'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { q, crewId, limit } = validQuery(event, RhymesQuerySchema)
  const lexicon = await lexiconFor(event, crewId)
  return findRhymes(q, { lexicon, limit })
})
