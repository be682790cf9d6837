import { VersionSaveSchema } from '../../../../../shared/schemas/drafts'

export default defineEventHandler(async (event) => {
  const { draft, user } = await requireDraftAccess(event, 'version.save')
  const body = await validBody(event, VersionSaveSchema)
  checkCadenceLines(body.lines, body.cadence)
  const doc = await documentFor(draft.songId, body.lines, body.doc)
  const result = await saveVersion(useDb(), {
    draft, authorId: user.id, baseVersionId: body.baseVersionId, lines: body.lines, doc, note: body.note, cadence: body.cadence, kind: body.autosave ? 'autosave' : 'save',
  })
  if (!result.saved) throw staleSaveError(result)
  setResponseStatus(event, 201)
  return result.version
})
