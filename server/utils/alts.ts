import { and, asc, eq, sql, type SQL } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { Action } from '../../shared/utils/permissions'
import type { AltStatus, AltView } from '../../shared/schemas/alts'
import { replaceLineText } from '../../shared/utils/doc-edit'
import { docFromLines, type LyricLine } from '../../shared/utils/lyric-doc'
import { altComments, alts, altVotes, drafts, songs, users, versions, type Alt, type Draft, type Song } from '../database/schema'
import type { DbOrTx } from './db'
import type { CadenceMapInput, StoredCadence } from '../../shared/schemas/cadence'
import { analyseDraft } from './prosody/analyse'
import type { SignedInUser } from './access'
import { notifyAltDecided, notifyLineWriter } from './notifications'
import { altFigures } from './alt-figures'

/** Loads the alt behind the `altId` route parameter and checks `action` in its song's crew. */
export function requireAltAccess(event: H3Event, action: Action, param = 'altId') {
  return requireRowAccess(event, action, param, 'Alt', async (id) => {
    const [row] = await useDb().select({ alt: alts, draft: drafts, song: songs }).from(alts)
      .innerJoin(drafts, eq(drafts.id, alts.draftId))
      .innerJoin(songs, eq(songs.id, drafts.songId))
      .where(eq(alts.id, id))
    return row
  })
}

const decider = sql<string | null>`(SELECT u.name FROM users u WHERE u.id = ${alts.decidedBy})`

/** A draft's alts with vote tallies, the caller's own vote and comment counts; oldest first. */
export async function listAlts(db: DbOrTx, draftId: string, userId: string, filter: { lineId?: string, status?: AltStatus, altId?: string } = {}): Promise<AltView[]> {
  const where: SQL[] = [eq(alts.draftId, draftId)]
  if (filter.lineId) where.push(eq(alts.lineId, filter.lineId))
  if (filter.status) where.push(eq(alts.status, filter.status))
  if (filter.altId) where.push(eq(alts.id, filter.altId))
  const rows = await db.select({
    id: alts.id,
    draftId: alts.draftId,
    lineId: alts.lineId,
    lineText: alts.lineText,
    text: alts.text,
    status: alts.status,
    authorId: alts.authorId,
    authorName: users.name,
    createdAt: alts.createdAt,
    decidedBy: alts.decidedBy,
    decidedByName: decider,
    decidedAt: alts.decidedAt,
    takenVersionId: alts.takenVersionId,
    up: sql<number>`(SELECT count(*)::int FROM alt_votes v WHERE v.alt_id = ${alts.id} AND v.value = 1)`,
    down: sql<number>`(SELECT count(*)::int FROM alt_votes v WHERE v.alt_id = ${alts.id} AND v.value = -1)`,
    myVote: sql<number | null>`(SELECT v.value::int FROM alt_votes v WHERE v.alt_id = ${alts.id} AND v.user_id = ${userId})`,
    commentCount: sql<number>`(SELECT count(*)::int FROM alt_comments c WHERE c.alt_id = ${alts.id})`,
  }).from(alts)
    .leftJoin(users, eq(users.id, alts.authorId))
    .where(and(...where))
    .orderBy(asc(alts.createdAt), asc(alts.id))
  return rows.map(r => ({
    ...r,
    createdAt: r.createdAt.toISOString(),
    decidedAt: r.decidedAt?.toISOString() ?? null,
    myVote: r.myVote === 1 || r.myVote === -1 ? r.myVote : null,
  }))
}

/**
 * Adds the prosody engine's figures to listed alts: syllables, and whether each open alt
 * keeps its line's rhyme family in the draft's head (with the crew's lexicon).
 */
export async function withAltFigures(db: DbOrTx, draft: Pick<Draft, 'headVersionId'>, crewId: string, views: AltView[]): Promise<AltView[]> {
  if (!views.some(v => v.status === 'open')) return views.map(v => ({ ...v, figures: null, lineFigures: null }))
  const [head] = draft.headVersionId ? await db.select({ lines: versions.lines }).from(versions).where(eq(versions.id, draft.headVersionId)) : []
  const figures = altFigures(head?.lines ?? [], views, await loadLexicon(crewId))
  return views.map(v => ({ ...v, figures: figures[v.id] ?? null, lineFigures: figures[`line:${v.lineId}`] ?? null }))
}

function conflict(message: string) {
  return createError({ statusCode: 409, message })
}

async function headLines(tx: DbOrTx, draft: Draft) {
  if (!draft.headVersionId) return null
  const [head] = await tx.select().from(versions).where(eq(versions.id, draft.headVersionId))
  return head ?? null
}

/**
 * Proposes `text` for the line `lineId` of the draft's head (409 when the head has no such
 * line), tells the line's writer, and announces it to the song. The draft itself is untouched.
 */
export async function proposeAlt(db: DbOrTx, input: { draft: Draft, song: Song, user: SignedInUser, lineId: string, text: string }) {
  return db.transaction(async (tx) => {
    const [draft] = await tx.select().from(drafts).where(eq(drafts.id, input.draft.id)).for('share')
    if (!draft) throw notFound('Draft')
    if (draft.archivedAt) throw conflict('This draft is archived. Alts go on drafts in use.')
    const head = await headLines(tx, draft)
    const line = head?.lines.find(l => l.id === input.lineId)
    if (!head || !line) throw conflict('That line is not in the draft\'s current version (it may have been removed). Reload and pick a line again.')
    if (line.text.trim() === input.text) throw createError({ statusCode: 400, message: 'The alt says exactly what the line already says.', data: { fields: { text: 'same as the line' } } })
    const [alt] = await tx.insert(alts).values({
      draftId: draft.id, lineId: line.id, lineText: line.text, baseVersionId: head.id, text: input.text, authorId: input.user.id,
    }).returning()
    await notifyLineWriter(tx, { song: input.song, draft, alt: alt!, line, proposer: input.user })
    await publishSongEvent(tx, input.song.id, { type: 'alt', action: 'proposed', altId: alt!.id, draftId: draft.id, lineId: line.id, authorId: input.user.id })
    return alt!
  })
}

/**
 * The line's placement kept for the alt's words when they sing the same number of syllables
 * (each syllable keeps its slot); otherwise the line goes back to the automatic placement.
 */
async function altCadence(cadence: StoredCadence, line: LyricLine, text: string, crewId: string): Promise<CadenceMapInput | undefined> {
  const placement = cadence[line.id]
  if (!placement) return undefined
  const lexicon = await loadLexicon(crewId)
  const [before, after] = analyseDraft({ lines: [{ id: 'old', bar: line.bar, text: line.text }, { id: 'new', bar: line.bar, text }] }, lexicon).lines
  return before!.syllables === after!.syllables && after!.syllables === placement.slots.length ? { [line.id]: placement } : undefined
}

/**
 * Takes an open alt: a new version on the current head with that one line's text replaced
 * (kind 'alt'), the alt marked taken. 409 when the line is gone or the alt already decided.
 */
export async function takeAlt(db: DbOrTx, input: { alt: Alt, song: Song, user: SignedInUser }) {
  return db.transaction(async (tx) => {
    const [draft] = await tx.select().from(drafts).where(eq(drafts.id, input.alt.draftId)).for('update')
    if (!draft) throw notFound('Draft')
    if (draft.archivedAt) throw conflict('This draft is archived. Restore it from the drafts list before taking alts.')
    const [alt] = await tx.select().from(alts).where(eq(alts.id, input.alt.id)).for('update')
    if (!alt) throw notFound('Alt')
    if (alt.status !== 'open') throw conflict(`This alt was already ${alt.status}.`)
    const head = await headLines(tx, draft)
    const line = head?.lines.find(l => l.id === alt.lineId)
    if (!head || !line) throw conflict('The line this alt was for is no longer in the draft, so it cannot be taken. Propose it on a current line.')
    const lines: LyricLine[] = head.lines.map(l => (l.id === alt.lineId ? { ...l, text: alt.text } : l))
    const doc = replaceLineText(head.doc, alt.lineId, alt.text) ?? docFromLines(lines)
    const [author] = alt.authorId ? await tx.select({ name: users.name }).from(users).where(eq(users.id, alt.authorId)) : []
    const saved = await saveVersion(tx, {
      draft, authorId: input.user.id, baseVersionId: head.id, lines, doc, kind: 'alt', cadence: await altCadence(head.cadence, line, alt.text, input.song.crewId),
      note: `Took ${author ? `${author.name}'s` : 'an'} alt for bar ${line.bar}`,
    })
    // The draft row is locked, so the head cannot have moved.
    if (!saved.saved) throw conflict('The draft changed while taking the alt. Try again.')
    const [updated] = await tx.update(alts).set({ status: 'taken', decidedBy: input.user.id, decidedAt: new Date(), takenVersionId: saved.version.id })
      .where(eq(alts.id, alt.id)).returning()
    await notifyAltDecided(tx, { song: input.song, alt: updated!, decider: input.user })
    await publishSongEvent(tx, input.song.id, { type: 'alt', action: 'taken', altId: alt.id, draftId: draft.id, lineId: alt.lineId, versionId: saved.version.id })
    return { alt: updated!, version: saved.version }
  })
}

/** Passes an open alt: it stays on record, marked passed. */
export async function passAlt(db: DbOrTx, input: { alt: Alt, song: Song, user: SignedInUser }) {
  return db.transaction(async (tx) => {
    const [updated] = await tx.update(alts).set({ status: 'passed', decidedBy: input.user.id, decidedAt: new Date() })
      .where(and(eq(alts.id, input.alt.id), eq(alts.status, 'open'))).returning()
    if (!updated) throw conflict(`This alt was already ${input.alt.status === 'open' ? 'decided' : input.alt.status}.`)
    await notifyAltDecided(tx, { song: input.song, alt: updated, decider: input.user })
    await publishSongEvent(tx, input.song.id, { type: 'alt', action: 'passed', altId: updated.id, draftId: updated.draftId, lineId: updated.lineId })
    return updated
  })
}

/** Sets (1 / −1) or takes back (0) the user's vote on an open alt; returns the new tallies. */
export async function voteOnAlt(db: DbOrTx, input: { alt: Alt, song: Song, user: SignedInUser, value: -1 | 0 | 1 }) {
  return db.transaction(async (tx) => {
    const [alt] = await tx.select({ status: alts.status }).from(alts).where(eq(alts.id, input.alt.id)).for('share')
    if (!alt) throw notFound('Alt')
    if (alt.status !== 'open') throw conflict(`This alt was already ${alt.status}; votes are closed.`)
    if (input.value === 0) {
      await tx.delete(altVotes).where(and(eq(altVotes.altId, input.alt.id), eq(altVotes.userId, input.user.id)))
    }
    else {
      await tx.insert(altVotes).values({ altId: input.alt.id, userId: input.user.id, value: input.value })
        .onConflictDoUpdate({ target: [altVotes.altId, altVotes.userId], set: { value: input.value, updatedAt: new Date() } })
    }
    const [tally] = await tx.select({
      up: sql<number>`count(*) FILTER (WHERE ${altVotes.value} = 1)::int`,
      down: sql<number>`count(*) FILTER (WHERE ${altVotes.value} = -1)::int`,
    }).from(altVotes).where(eq(altVotes.altId, input.alt.id))
    await publishSongEvent(tx, input.song.id, { type: 'vote', altId: input.alt.id, draftId: input.alt.draftId, lineId: input.alt.lineId })
    return { altId: input.alt.id, up: tally!.up, down: tally!.down, myVote: input.value === 0 ? null : input.value }
  })
}

/** An alt's comments, oldest first. */
export async function listAltComments(db: DbOrTx, altId: string) {
  const rows = await db.select({
    id: altComments.id, altId: altComments.altId, authorId: altComments.authorId, authorName: users.name, body: altComments.body, createdAt: altComments.createdAt,
  }).from(altComments).leftJoin(users, eq(users.id, altComments.authorId))
    .where(eq(altComments.altId, altId)).orderBy(asc(altComments.createdAt), asc(altComments.id))
  return rows.map(r => ({ ...r, createdAt: r.createdAt.toISOString() }))
}

export async function addAltComment(db: DbOrTx, input: { alt: Alt, song: Song, user: SignedInUser, body: string }) {
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(altComments).values({ altId: input.alt.id, authorId: input.user.id, body: input.body }).returning()
    await publishSongEvent(tx, input.song.id, { type: 'comment', altId: input.alt.id, commentId: row!.id, draftId: input.alt.draftId, lineId: input.alt.lineId })
    return { id: row!.id, altId: row!.altId, authorId: row!.authorId, authorName: input.user.name, body: row!.body, createdAt: row!.createdAt.toISOString() }
  })
}
