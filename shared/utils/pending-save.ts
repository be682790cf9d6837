/**
 * The pure half of the draft saver (app/composables/useDraftSaver.ts): what is kept in the
 * browser's storage until the server confirms a save, and how a save's answer is read.
 */
import { z } from 'zod'
import { LinesSchema } from '../schemas/drafts'
import { sameLines, type LyricDoc, type LyricLine } from './lyric-doc'

export interface VersionRef { id: string, number: number }

export interface SaveConflict {
  /** The head the save was refused against (null: the draft has no version yet). */
  head: VersionRef | null
  /** Where the server kept the refused text. */
  sideSaveId: string | null
}

/** Unsaved work on one draft, as stored in the browser. */
export interface PendingSave {
  v: 1
  draftId: string
  /** The version these edits started from. */
  baseVersionId: string | null
  lines: LyricLine[]
  doc?: LyricDoc
  note?: string
  /** When the text last changed (ms since epoch). */
  changedAt: number
  conflict?: SaveConflict | null
}

/** Storage as the saver needs it (window.localStorage fits; tests pass a Map-backed one). */
export interface KeyValueStore {
  getItem: (key: string) => string | null
  setItem: (key: string, value: string) => void
  removeItem: (key: string) => void
}

export const pendingKey = (draftId: string) => `barsmith:unsaved:${draftId}`

const VersionRefSchema = z.object({ id: z.string(), number: z.number() })
const PendingSchema = z.object({
  v: z.literal(1),
  draftId: z.string(),
  baseVersionId: z.string().nullable(),
  lines: LinesSchema,
  doc: z.any().optional(),
  note: z.string().optional(),
  changedAt: z.number(),
  conflict: z.object({ head: VersionRefSchema.nullable(), sideSaveId: z.string().nullable() }).nullable().optional(),
})

/** The unsaved work kept for `draftId`, or null (nothing kept, or storage holds garbage). */
export function readPending(store: KeyValueStore, draftId: string): PendingSave | null {
  let raw: string | null
  try {
    raw = store.getItem(pendingKey(draftId))
  }
  catch {
    return null
  }
  if (!raw) return null
  try {
    const parsed = PendingSchema.safeParse(JSON.parse(raw))
    if (!parsed.success || parsed.data.draftId !== draftId) return null
    return parsed.data as PendingSave
  }
  catch {
    return null
  }
}

/** Keeps `pending`; false when the browser refused (storage full or disabled). */
export function writePending(store: KeyValueStore, pending: PendingSave): boolean {
  try {
    store.setItem(pendingKey(pending.draftId), JSON.stringify(pending))
    return true
  }
  catch {
    return false
  }
}

/**
 * Forgets the kept work once the server holds it — unless it changed again after the save
 * was sent (`sentAt` older than its `changedAt`), in which case it stays, on the new base.
 */
export function confirmPending(store: KeyValueStore, draftId: string, sentChangedAt: number, saved: VersionRef): PendingSave | null {
  const current = readPending(store, draftId)
  if (!current || current.changedAt <= sentChangedAt) {
    try {
      store.removeItem(pendingKey(draftId))
    }
    catch { /* nothing kept */ }
    return null
  }
  const rebased = { ...current, baseVersionId: saved.id, conflict: null }
  writePending(store, rebased)
  return rebased
}

/** Whether kept work is worth restoring over what the server holds now. */
export function hasUnsavedWork(pending: PendingSave | null, serverLines: readonly LyricLine[], serverHeadId: string | null): boolean {
  if (!pending) return false
  if (pending.conflict) return true
  return !(pending.baseVersionId === serverHeadId && sameLines(pending.lines, serverLines))
}

export type SaveOutcome
  = | { kind: 'saved', version: VersionRef }
    | { kind: 'conflict', conflict: SaveConflict }
    | { kind: 'offline' }
    | { kind: 'refused', statusCode: number, message: string }

/** Reads a failed save (a `$fetch` error): a 409 conflict, no answer at all, or a refusal. */
export function outcomeOfError(error: unknown): SaveOutcome {
  const e = error as { statusCode?: number, status?: number, data?: { statusCode?: number, message?: string, data?: { head?: VersionRef | null, sideSaveId?: string } } }
  const status = e?.statusCode ?? e?.status ?? e?.data?.statusCode ?? 0
  const body = e?.data
  if (status === 409 && body?.data && 'head' in body.data) {
    return { kind: 'conflict', conflict: { head: body.data.head ?? null, sideSaveId: body.data.sideSaveId ?? null } }
  }
  // No status, a gateway error or the database being away: the text waits and is sent again.
  if (!status || status === 502 || status === 503 || status === 504) return { kind: 'offline' }
  return { kind: 'refused', statusCode: status, message: body?.message ?? 'The save was refused.' }
}

/** Milliseconds before retry `attempt` (1-based) of a save that got no answer: 1 s, 2 s, 4 s … 30 s. */
export function retryDelayMs(attempt: number): number {
  return Math.min(30_000, 1000 * 2 ** Math.max(0, attempt - 1))
}
