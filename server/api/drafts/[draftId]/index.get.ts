export default defineEventHandler(async (event) => {
  const { draft, song, role } = await requireDraftAccess(event, 'song.view')
  return {
    id: draft.id,
    songId: song.id,
    name: draft.name,
    isMain: draft.isMain,
    headVersionId: draft.headVersionId,
    archivedAt: draft.archivedAt,
    role,
  }
})
