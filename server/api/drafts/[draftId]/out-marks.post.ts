import { eq } from 'drizzle-orm'
import { OutMarksSchema } from '../../../../shared/schemas/finish'
import { outNote, outOnlyChange, withOutMarks } from '../../../../shared/utils/out-marks'
import { versions } from '../../../database/schema'

/**
 * Saves a version whose only change from the head is which lines are marked out, so a
 * producer decides what is performed without being able to rewrite a writer's words.
 */
export default defineEventHandler(async (event) => {
  const { draft, user } = await requireDraftAccess(event, 'line.markOut')
  const body = await validBody(event, OutMarksSchema)
  const db = useDb()
  if (!draft.headVersionId) throw createError({ statusCode: 409, message: 'This draft has no version yet: there are no lines to mark out.' })
  const [head] = await db.select().from(versions).where(eq(versions.id, draft.headVersionId))
  if (body.baseVersionId !== head!.id) {
    throw createError({ statusCode: 409, message: `Version ${head!.number} was saved meanwhile. Mark the lines again on it.`, data: { head: { id: head!.id, number: head!.number } } })
  }
  const change = outOnlyChange(head!.lines, body.lines)
  if (!change.ok) throw createError({ statusCode: 400, message: change.message, data: { fields: { lines: change.message }, lineId: change.lineId } })
  if (!change.marked.length && !change.restored.length) {
    throw createError({ statusCode: 400, message: `Nothing to save: the out marks are the same as in version ${head!.number}.`, data: { fields: { lines: 'no change' } } })
  }
  const result = await saveVersion(db, {
    draft, authorId: user.id, baseVersionId: head!.id, lines: body.lines, doc: withOutMarks(head!.doc, body.lines),
    note: body.note || outNote(change), kind: 'save',
  })
  if (!result.saved) throw staleSaveError(result)
  setResponseStatus(event, 201)
  return { ...result.version, marked: change.marked, restored: change.restored }
})
