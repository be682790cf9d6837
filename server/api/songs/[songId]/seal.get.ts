import { desc, eq } from 'drizzle-orm'
import { drafts, sealLifts, seals, versions } from '../../../database/schema'

/** The song's sealed final sheet (or null), and every seal it had, lifted ones with their reason. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  const rows = await useDb().select({ seal: seals, lift: sealLifts, versionNumber: versions.number, draftId: drafts.id, draftName: drafts.name })
    .from(seals)
    .innerJoin(versions, eq(versions.id, seals.versionId))
    .innerJoin(drafts, eq(drafts.id, versions.draftId))
    .leftJoin(sealLifts, eq(sealLifts.sealId, seals.id))
    .where(eq(seals.songId, song.id))
    .orderBy(desc(seals.sealedAt))
  const history = rows.map(r => ({
    id: r.seal.id,
    versionId: r.seal.versionId,
    versionNumber: r.versionNumber,
    draftId: r.draftId,
    draftName: r.draftName,
    sealedAt: r.seal.sealedAt,
    signers: r.seal.signers,
    split: r.seal.split,
    lifted: r.lift ? { at: r.lift.createdAt, by: r.lift.liftedByName, reason: r.lift.reason, newDraftId: r.lift.newDraftId } : null,
  }))
  return { seal: history.find(h => !h.lifted) ?? null, history }
})
