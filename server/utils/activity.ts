import { and, desc, eq, inArray, isNotNull } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { alts, drafts, sealLifts, seals, signoffRequests, signoffSigners, users, versions } from '../database/schema'
import type { DbOrTx } from './db'

export type ActivityKind
  = | 'version' | 'signoff.requested' | 'signoff.approved' | 'signoff.declined' | 'signoff.cancelled' | 'signoff.withdrawn'
    | 'seal' | 'unseal' | 'alt.taken' | 'alt.passed'

export interface ActivityEntry {
  at: string
  kind: ActivityKind
  /** Who did it, when a person did. */
  by: string | null
  /** One plain sentence. */
  summary: string
  /** A comment, note or reason in the person's own words. */
  detail: string | null
  draftId?: string | null
  versionId?: string | null
}

type Source = (db: DbOrTx, songId: string, limit: number) => Promise<ActivityEntry[]>

const versionSource: Source = async (db, songId, limit) => {
  const rows = await db.select({
    at: versions.createdAt, number: versions.number, kind: versions.kind, note: versions.note, id: versions.id,
    draftId: drafts.id, draftName: drafts.name, author: users.name,
  }).from(versions).innerJoin(drafts, eq(drafts.id, versions.draftId)).leftJoin(users, eq(users.id, versions.authorId))
    .where(eq(drafts.songId, songId)).orderBy(desc(versions.createdAt)).limit(limit)
  const verb: Record<string, string> = { save: 'saved', autosave: 'autosaved', restore: 'restored an older text as', alt: 'took an alt into', merge: 'merged into', copy: 'copied in' }
  return rows.map(r => ({
    at: r.at.toISOString(), kind: 'version' as const, by: r.author,
    summary: `${r.author ?? 'Someone'} ${verb[r.kind] ?? 'saved'} version ${r.number} of "${r.draftName}"`,
    detail: r.note, draftId: r.draftId, versionId: r.id,
  }))
}

const signoffSource: Source = async (db, songId, limit) => {
  const requester = alias(users, 'requester')
  const closer = alias(users, 'closer')
  const requests = await db.select({ r: signoffRequests, number: versions.number, draftName: drafts.name, requester: requester.name, closer: closer.name })
    .from(signoffRequests)
    .innerJoin(versions, eq(versions.id, signoffRequests.versionId))
    .innerJoin(drafts, eq(drafts.id, signoffRequests.draftId))
    .leftJoin(requester, eq(requester.id, signoffRequests.requestedBy))
    .leftJoin(closer, eq(closer.id, signoffRequests.closedBy))
    .where(eq(signoffRequests.songId, songId)).orderBy(desc(signoffRequests.createdAt)).limit(limit)
  const decisions = await db.select({ s: signoffSigners, name: users.name, number: versions.number, draftName: drafts.name, versionId: versions.id })
    .from(signoffSigners)
    .innerJoin(signoffRequests, eq(signoffRequests.id, signoffSigners.requestId))
    .innerJoin(versions, eq(versions.id, signoffRequests.versionId))
    .innerJoin(drafts, eq(drafts.id, signoffRequests.draftId))
    .innerJoin(users, eq(users.id, signoffSigners.userId))
    .where(and(eq(signoffRequests.songId, songId), isNotNull(signoffSigners.decidedAt)))
    .orderBy(desc(signoffSigners.decidedAt)).limit(limit)
  const out: ActivityEntry[] = []
  for (const { r, number, draftName, requester: who, closer: closedBy } of requests) {
    out.push({
      at: r.createdAt.toISOString(), kind: 'signoff.requested', by: who,
      summary: `${who ?? 'Someone'} asked for sign-off on version ${number} of "${draftName}"`, detail: r.note, draftId: r.draftId, versionId: r.versionId,
    })
    if ((r.status === 'cancelled' || r.status === 'withdrawn') && r.closedAt) {
      out.push({
        at: r.closedAt.toISOString(), kind: r.status === 'cancelled' ? 'signoff.cancelled' : 'signoff.withdrawn', by: closedBy,
        summary: r.status === 'cancelled' ? `Sign-off on version ${number} was cancelled` : `${closedBy ?? 'Someone'} withdrew the sign-off on version ${number}`,
        detail: r.closedReason, draftId: r.draftId, versionId: r.versionId,
      })
    }
  }
  for (const d of decisions) {
    out.push({
      at: d.s.decidedAt!.toISOString(), kind: d.s.decision === 'approve' ? 'signoff.approved' : 'signoff.declined', by: d.name,
      summary: `${d.name} ${d.s.decision === 'approve' ? 'approved' : 'declined'} version ${d.number} of "${d.draftName}"`,
      detail: d.s.comment, versionId: d.versionId,
    })
  }
  return out
}

const sealSource: Source = async (db, songId, limit) => {
  const newDraft = alias(drafts, 'new_draft')
  const rows = await db.select({ seal: seals, number: versions.number, draftName: drafts.name, lift: sealLifts, newDraftName: newDraft.name })
    .from(seals)
    .innerJoin(versions, eq(versions.id, seals.versionId))
    .innerJoin(drafts, eq(drafts.id, versions.draftId))
    .leftJoin(sealLifts, eq(sealLifts.sealId, seals.id))
    .leftJoin(newDraft, eq(newDraft.id, sealLifts.newDraftId))
    .where(eq(seals.songId, songId)).orderBy(desc(seals.sealedAt)).limit(limit)
  const out: ActivityEntry[] = []
  for (const r of rows) {
    out.push({
      at: r.seal.sealedAt.toISOString(), kind: 'seal', by: null,
      summary: `Version ${r.number} of "${r.draftName}" was sealed as the final sheet`,
      detail: `Signed off by ${r.seal.signers.map(s => s.name).join(', ')}`, versionId: r.seal.versionId,
    })
    if (r.lift) {
      out.push({
        at: r.lift.createdAt.toISOString(), kind: 'unseal', by: r.lift.liftedByName,
        summary: `${r.lift.liftedByName} unsealed version ${r.number}${r.newDraftName ? ` and reopened it as "${r.newDraftName}"` : ''}`,
        detail: r.lift.reason, draftId: r.lift.newDraftId, versionId: r.seal.versionId,
      })
    }
  }
  return out
}

const quote = (text: string) => `"${text.length > 60 ? `${text.slice(0, 57).trimEnd()}…` : text}"`

const altSource: Source = async (db, songId, limit) => {
  const author = alias(users, 'alt_author')
  const decider = alias(users, 'alt_decider')
  const rows = await db.select({ alt: alts, draftName: drafts.name, author: author.name, decider: decider.name, number: versions.number })
    .from(alts)
    .innerJoin(drafts, eq(drafts.id, alts.draftId))
    .leftJoin(author, eq(author.id, alts.authorId))
    .leftJoin(decider, eq(decider.id, alts.decidedBy))
    .leftJoin(versions, eq(versions.id, alts.takenVersionId))
    .where(and(eq(drafts.songId, songId), inArray(alts.status, ['taken', 'passed']), isNotNull(alts.decidedAt)))
    .orderBy(desc(alts.decidedAt)).limit(limit)
  return rows.map(({ alt, draftName, author: by, decider: who, number }) => {
    const whose = by ? `${by}'s alt` : 'an alt'
    return alt.status === 'taken'
      ? {
          at: alt.decidedAt!.toISOString(), kind: 'alt.taken' as const, by: who,
          summary: `${who ?? 'Someone'} took ${whose} for ${quote(alt.lineText)}${number ? ` into version ${number}` : ''} of "${draftName}"`,
          detail: alt.text, draftId: alt.draftId, versionId: alt.takenVersionId,
        }
      : {
          at: alt.decidedAt!.toISOString(), kind: 'alt.passed' as const, by: who,
          summary: `${who ?? 'Someone'} passed on ${whose} for ${quote(alt.lineText)} in "${draftName}"`,
          detail: alt.text, draftId: alt.draftId,
        }
  })
}

/** Where the song's timeline comes from; each area adds its own source. */
export const ACTIVITY_SOURCES: Source[] = [versionSource, signoffSource, sealSource, altSource]

// Steps at the same moment (the last approval and its seal) are shown in the order they happen.
const STEP: Record<ActivityKind, number> = {
  'version': 1, 'alt.taken': 1, 'alt.passed': 1, 'signoff.requested': 2, 'signoff.approved': 3, 'signoff.declined': 3,
  'signoff.cancelled': 4, 'signoff.withdrawn': 4, 'seal': 5, 'unseal': 6,
}

/** The song's timeline, newest first. */
export async function songActivity(db: DbOrTx, songId: string, limit = 200): Promise<ActivityEntry[]> {
  const all = (await Promise.all(ACTIVITY_SOURCES.map(s => s(db, songId, limit)))).flat()
  // A taken alt and the version it made are one step: the alt's entry says more.
  const takenInto = new Set(all.filter(e => e.kind === 'alt.taken' && e.versionId).map(e => e.versionId))
  return all.filter(e => !(e.kind === 'version' && takenInto.has(e.versionId))).sort((a, b) => (a.at < b.at ? 1 : a.at > b.at ? -1 : STEP[b.kind] - STEP[a.kind])).slice(0, limit)
}
