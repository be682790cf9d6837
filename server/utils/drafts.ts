import { and, desc, eq, sql } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { z } from 'zod'
import type { Action } from '../../shared/utils/permissions'
import type { CadenceMapInput, StoredCadence } from '../../shared/schemas/cadence'
import { LIMITS } from '../../shared/schemas/drafts'
import { LyricDocSchema } from '../../shared/schemas/lyric-doc'
import { docFromLines, linesFromDoc, sameLines, type LyricDoc, type LyricLine } from '../../shared/utils/lyric-doc'
import { drafts, sideSaves, songs, versions, type Draft, type Version } from '../database/schema'
import type { DbOrTx } from './db'

/** Loads the draft behind the `draftId` route parameter and checks `action` in its song's crew. */
export function requireDraftAccess(event: H3Event, action: Action, param = 'draftId') {
  return requireRowAccess(event, action, param, 'Draft', async (id) => {
    const [row] = await useDb().select({ draft: drafts, song: songs }).from(drafts)
      .innerJoin(songs, eq(songs.id, drafts.songId))
      .where(eq(drafts.id, id))
    return row
  })
}

/** Loads the version behind the `versionId` route parameter and checks `action` in its crew. */
export function requireVersionAccess(event: H3Event, action: Action, param = 'versionId') {
  return requireRowAccess(event, action, param, 'Version', async (id) => {
    const [row] = await useDb().select({ version: versions, draft: drafts, song: songs }).from(versions)
      .innerJoin(drafts, eq(drafts.id, versions.draftId))
      .innerJoin(songs, eq(songs.id, drafts.songId))
      .where(eq(versions.id, id))
    return row
  })
}

/** Loads the kept-aside save behind the `sideSaveId` route parameter and checks `action` in its crew. */
export function requireSideSaveAccess(event: H3Event, action: Action, param = 'sideSaveId') {
  return requireRowAccess(event, action, param, 'Kept-aside save', async (id) => {
    const [row] = await useDb().select({ side: sideSaves, draft: drafts, song: songs }).from(sideSaves)
      .innerJoin(drafts, eq(drafts.id, sideSaves.draftId))
      .innerJoin(songs, eq(songs.id, drafts.songId))
      .where(eq(sideSaves.id, id))
    return row
  })
}

/**
 * The document to store with `lines`: the client's own when it sends one (it must parse as a
 * lyric document and say exactly what `lines` say), else one derived from the lines and the
 * song's sections.
 */
export async function documentFor(songId: string, lines: LyricLine[], doc: unknown): Promise<LyricDoc> {
  if (doc === undefined) return docFromLines(lines, await listSections(songId))
  if (JSON.stringify(doc).length > LIMITS.docBytes) {
    throw createError({ statusCode: 413, message: `The document is larger than ${LIMITS.docBytes / 1_000_000} MB.` })
  }
  const parsed = LyricDocSchema.safeParse(doc)
  if (!parsed.success) {
    throw createError({ statusCode: 400, message: `The document is not a lyric document: ${z.prettifyError(parsed.error).split('\n')[0]}`, data: { fields: { doc: 'not a lyric document' } } })
  }
  const typed = parsed.data as LyricDoc
  if (!sameLines(linesFromDoc(typed), lines)) {
    throw createError({ statusCode: 400, message: 'The document and the lines disagree. Send lines derived from the document.', data: { fields: { doc: 'does not match lines' } } })
  }
  return typed
}

export interface SaveInput {
  draft: Pick<Draft, 'id' | 'songId'>
  authorId: string
  baseVersionId: string | null
  lines: LyricLine[]
  doc: LyricDoc
  note?: string | null
  kind?: Version['kind']
  /** Placements to set (null clears one); lines not named keep the head's when unchanged. */
  cadence?: CadenceMapInput
}

/**
 * The cadence a new version stores: the base's placement of every line whose text and bar
 * span are unchanged, then the sent placements on top (null clears). Only lines of the new
 * version are kept, so a deleted line's placement goes with it.
 */
export function cadenceFor(lines: readonly LyricLine[], base: { lines: readonly LyricLine[], cadence: StoredCadence } | null, sent?: CadenceMapInput): StoredCadence {
  const before = new Map((base?.lines ?? []).map(l => [l.id, l]))
  const out: StoredCadence = {}
  for (const line of lines) {
    const old = before.get(line.id)
    const kept = base?.cadence[line.id]
    const placement = sent && line.id in sent
      ? sent[line.id]
      : (old && kept && old.text === line.text && (old.bars ?? 1) === (line.bars ?? 1) ? kept : null)
    if (placement) out[line.id] = placement
  }
  return out
}

/** A 400 when the sent cadence names lines that the saved lines do not have. */
export function checkCadenceLines(lines: readonly LyricLine[], sent: CadenceMapInput | undefined) {
  if (!sent) return
  const ids = new Set(lines.map(l => l.id))
  const unknown = Object.keys(sent).filter(id => !ids.has(id))
  if (unknown.length) {
    throw createError({ statusCode: 400, message: `The cadence names line${unknown.length === 1 ? '' : 's'} not in this save: ${unknown.slice(0, 5).join(', ')}.`, data: { fields: { cadence: 'unknown line ids' } } })
  }
}

export type SaveResult
  = | { saved: true, version: { id: string, number: number } }
    | { saved: false, head: { id: string, number: number } | null, sideSaveId: string }

/**
 * Saves a new version on top of the draft's head, or — when `baseVersionId` is no longer the
 * head — keeps the text as a side save and reports the head. The draft row is locked for the
 * duration, so concurrent saves on one head produce exactly one new version.
 */
export async function saveVersion(db: DbOrTx, input: SaveInput): Promise<SaveResult> {
  return db.transaction(async (tx) => {
    const [draft] = await tx.select().from(drafts).where(eq(drafts.id, input.draft.id)).for('update')
    if (!draft) throw notFound('Draft')
    if (draft.archivedAt) throw createError({ statusCode: 409, message: 'This draft is archived. Restore it from the drafts list before saving.' })
    const [head] = draft.headVersionId
      ? await tx.select({ id: versions.id, number: versions.number, lines: versions.lines, cadence: versions.cadence }).from(versions).where(eq(versions.id, draft.headVersionId))
      : []
    if ((head?.id ?? null) !== input.baseVersionId) {
      const [side] = await tx.insert(sideSaves).values({
        draftId: draft.id,
        baseVersionId: input.baseVersionId,
        headVersionId: head?.id ?? null,
        authorId: input.authorId,
        note: input.note ?? null,
        doc: input.doc,
        lines: input.lines,
      }).returning({ id: sideSaves.id })
      return { saved: false, head: head ? { id: head.id, number: head.number } : null, sideSaveId: side!.id }
    }
    const [version] = await tx.insert(versions).values({
      draftId: draft.id,
      number: (head?.number ?? 0) + 1,
      parentId: head?.id ?? null,
      authorId: input.authorId,
      kind: input.kind ?? 'save',
      note: input.note || null,
      doc: input.doc,
      lines: input.lines,
      cadence: cadenceFor(input.lines, head ?? null, input.cadence),
    }).returning({ id: versions.id, number: versions.number })
    await tx.update(drafts).set({ headVersionId: version!.id }).where(eq(drafts.id, draft.id))
    await cancelSignoffsOnNewVersion(tx, { songId: draft.songId, draftId: draft.id, version: version! })
    await publishSongEvent(tx, draft.songId, { type: 'version', draftId: draft.id, versionId: version!.id, number: version!.number, authorId: input.authorId })
    return { saved: true, version: version! }
  })
}

/** The 409 a refused save answers with: the head to rebase on, and where the text was kept. */
export function staleSaveError(result: Extract<SaveResult, { saved: false }>) {
  return createError({
    statusCode: 409,
    message: result.head
      ? `Someone saved version ${result.head.number} while you were writing. Your text is kept aside; compare and merge it with the new version.`
      : 'This draft has no versions yet: save with baseVersionId null. Your text is kept aside.',
    data: { head: result.head, sideSaveId: result.sideSaveId },
  })
}

/** Drafts of a song with their head's number, main first then newest. */
export async function listDrafts(db: DbOrTx, songId: string, includeArchived = false) {
  return db.select({
    id: drafts.id,
    name: drafts.name,
    headVersionId: drafts.headVersionId,
    headNumber: versions.number,
    isMain: drafts.isMain,
    archivedAt: drafts.archivedAt,
    updatedAt: drafts.updatedAt,
  }).from(drafts)
    .leftJoin(versions, eq(versions.id, drafts.headVersionId))
    .where(includeArchived ? eq(drafts.songId, songId) : and(eq(drafts.songId, songId), sql`${drafts.archivedAt} IS NULL`))
    .orderBy(desc(drafts.isMain), desc(drafts.updatedAt))
}
