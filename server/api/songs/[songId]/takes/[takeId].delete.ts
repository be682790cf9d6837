import { eq } from 'drizzle-orm'
import { scratchTakes } from '../../../../database/schema'
import { requireTakeAccess } from '../../../../utils/scratch'

/** Deletes one's own take and its stored audio. */
export default defineEventHandler(async (event) => {
  const { take } = await requireTakeAccess(event, 'scratch.record', true)
  const [gone] = await useDb().delete(scratchTakes).where(eq(scratchTakes.id, take.id)).returning({ key: scratchTakes.storageKey })
  if (!gone) throw notFound('Take')
  await useStorage('files').removeItem(gone.key)
  setResponseStatus(event, 204)
  return null
})
