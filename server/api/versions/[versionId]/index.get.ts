export default defineEventHandler(async (event) => {
  const { version, draft } = await requireVersionAccess(event, 'song.view')
  const seal = await activeSealOfVersion(useDb(), version.id)
  return {
    id: version.id,
    number: version.number,
    draftId: version.draftId,
    songId: draft.songId,
    isHead: draft.headVersionId === version.id,
    authorId: version.authorId,
    kind: version.kind,
    note: version.note,
    createdAt: version.createdAt,
    parentId: version.parentId,
    lines: version.lines,
    doc: version.doc,
    cadence: version.cadence,
    sealed: !!seal,
    sealedAt: seal?.sealedAt ?? null,
  }
})
