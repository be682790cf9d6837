import { eq } from 'drizzle-orm'
import { drafts } from '../../../database/schema'

/** Makes an older version the head again by saving a copy of it as a new version. */
export default defineEventHandler(async (event) => {
  const { version, draft, user } = await requireVersionAccess(event, 'version.save')
  const db = useDb()
  const [current] = await db.select({ headVersionId: drafts.headVersionId }).from(drafts).where(eq(drafts.id, draft.id))
  const result = await saveVersion(db, {
    draft, authorId: user.id, baseVersionId: current!.headVersionId, lines: version.lines, doc: version.doc, cadence: version.cadence,
    note: `Restored version ${version.number}`, kind: 'restore',
  })
  if (!result.saved) throw staleSaveError(result)
  setResponseStatus(event, 201)
  return result.version
})
