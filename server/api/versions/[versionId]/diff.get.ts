import { and, eq } from 'drizzle-orm'
import { DiffQuerySchema } from '../../../../shared/schemas/versions'
import { diffRows, diffStats } from '../../../../shared/utils/line-diff'
import { drafts, versions, type Version } from '../../../database/schema'

/**
 * The line-by-line difference from version `against` (default: this version's parent) to
 * this one — both of the same song, any drafts — computed with the `diff` package. Rows
 * carry the lines themselves, and so their bars.
 */
export default defineEventHandler(async (event) => {
  const { version, draft } = await requireVersionAccess(event, 'song.view')
  const { against } = validQuery(event, DiffQuerySchema)
  const otherId = against ?? version.parentId
  let other: { version: Version, draftName: string } | undefined
  if (otherId) {
    [other] = await useDb().select({ version: versions, draftName: drafts.name }).from(versions)
      .innerJoin(drafts, eq(drafts.id, versions.draftId))
      .where(and(eq(versions.id, otherId), eq(drafts.songId, draft.songId)))
    if (!other) throw notFound('Version to compare with')
  }
  const rows = diffRows(other?.version.lines ?? [], version.lines)
  const ref = (v: Version, draftName: string) => ({ id: v.id, number: v.number, draftId: v.draftId, draftName, kind: v.kind, note: v.note, createdAt: v.createdAt })
  return {
    from: other ? ref(other.version, other.draftName) : null,
    to: ref(version, draft.name),
    rows,
    stats: diffStats(rows),
  }
})
