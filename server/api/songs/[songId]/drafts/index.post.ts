import { and, count, eq } from 'drizzle-orm'
import { DraftCreateSchema } from '../../../../../shared/schemas/drafts'
import { drafts, songs, versions } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song, user } = await requireSongAccess(event, 'draft.create')
  const { name, fromVersionId } = await validBody(event, DraftCreateSchema)
  const db = useDb()
  let source: { doc: typeof versions.$inferSelect['doc'], lines: typeof versions.$inferSelect['lines'], cadence: typeof versions.$inferSelect['cadence'], number: number, draftName: string } | undefined
  if (fromVersionId) {
    const [row] = await db.select({ doc: versions.doc, lines: versions.lines, cadence: versions.cadence, number: versions.number, draftName: drafts.name })
      .from(versions).innerJoin(drafts, eq(drafts.id, versions.draftId))
      .where(and(eq(versions.id, fromVersionId), eq(drafts.songId, song.id)))
    if (!row) throw notFound('Version')
    source = row
  }
  const draft = await db.transaction(async (tx) => {
    // Locks the song so two first drafts made at once cannot both become main.
    await tx.select({ id: songs.id }).from(songs).where(eq(songs.id, song.id)).for('update')
    const [existing] = await tx.select({ n: count() }).from(drafts).where(eq(drafts.songId, song.id))
    const [created] = await tx.insert(drafts).values({ songId: song.id, name, createdBy: user.id, isMain: existing!.n === 0 }).returning()
    if (!source) return { ...created!, headVersionId: null }
    const saved = await saveVersion(tx, {
      draft: created!, authorId: user.id, baseVersionId: null, lines: source.lines, doc: source.doc, cadence: source.cadence,
      note: `Copied from "${source.draftName}" version ${source.number}`, kind: 'copy',
    })
    return { ...created!, headVersionId: saved.saved ? saved.version.id : null }
  })
  await publishSongEvent(db, song.id, { type: 'draft', draftId: draft.id })
  setResponseStatus(event, 201)
  return { id: draft.id, name: draft.name, headVersionId: draft.headVersionId, isMain: draft.isMain }
})
