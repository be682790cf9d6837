import { and, asc, eq } from 'drizzle-orm'
import type { SealSplitLine } from '../database/schema'
import { memberships, splitLines, users } from '../database/schema'
import { SPLIT_CAUTION, splitTotalProblem, totalBp } from '../../shared/utils/shares'
import type { DbOrTx } from './db'

export interface SplitLineInput { userId?: string | null, name: string, role?: string | null, share: number }

/** The song's working split sheet, in order, with whether each member confirmed. */
export async function loadSplitLines(db: DbOrTx, songId: string) {
  const rows = await db.select({
    id: splitLines.id,
    userId: splitLines.userId,
    name: splitLines.name,
    role: splitLines.role,
    shareBp: splitLines.shareBp,
    confirmedAt: splitLines.confirmedAt,
    position: splitLines.position,
    updatedAt: splitLines.updatedAt,
  }).from(splitLines).where(eq(splitLines.songId, songId)).orderBy(asc(splitLines.position))
  return rows
}

export type SplitRow = Awaited<ReturnType<typeof loadSplitLines>>[number]

/** What the split sheet lacks before it can be sealed (total, confirmations), in words; null when ready. */
export function splitReadiness(rows: readonly SplitRow[]): string | null {
  if (!rows.length) return 'The split sheet is empty: list the writers and their shares first.'
  const total = splitTotalProblem(rows)
  if (total) return total
  const waiting = rows.filter(r => r.userId && !r.confirmedAt).map(r => r.name)
  if (waiting.length) return `Every member on the split sheet must confirm their line first (still to confirm: ${waiting.join(', ')}).`
  return null
}

/** The split as kept in a seal. */
export function splitSnapshot(rows: readonly SplitRow[]): SealSplitLine[] {
  return rows.map(r => ({ userId: r.userId, name: r.name, role: r.role, shareBp: r.shareBp, confirmedAt: r.confirmedAt?.toISOString() ?? null }))
}

/**
 * Replaces the song's split sheet. The total must be exactly 100.00 % (400 naming the total
 * otherwise); members must belong to the crew. A member's confirmation is kept only when
 * their own line (name, role and share) is unchanged.
 */
export async function replaceSplitLines(db: DbOrTx, songId: string, crewId: string, input: SplitLineInput[]) {
  const problem = splitTotalProblem(input.map(l => ({ shareBp: l.share })))
  if (problem) throw createError({ statusCode: 400, message: problem, data: { fields: { lines: problem }, totalBp: totalBp(input.map(l => ({ shareBp: l.share }))) } })
  return db.transaction(async (tx) => {
    const members = await tx.select({ userId: memberships.userId, role: memberships.role, name: users.name }).from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId)).where(eq(memberships.crewId, crewId))
    const byId = new Map(members.map(m => [m.userId, m]))
    input.forEach((l, i) => {
      if (!l.userId) return
      const m = byId.get(l.userId)
      if (!m) throw createError({ statusCode: 400, message: `Line ${i + 1}: that person is not a member of this crew. List outside contributors by name only.`, data: { fields: { [`lines.${i}.userId`]: 'not a member of this crew' } } })
      if (m.role === 'listener') throw createError({ statusCode: 400, message: `Line ${i + 1}: ${m.name} is a listener in this crew; a listener cannot confirm a split line. List them by name only, or change their role first.`, data: { fields: { [`lines.${i}.userId`]: 'listener' } } })
    })
    const before = await tx.select().from(splitLines).where(eq(splitLines.songId, songId)).for('update')
    const kept = new Map(before.filter(b => b.userId && b.confirmedAt).map(b => [b.userId!, b]))
    await tx.delete(splitLines).where(eq(splitLines.songId, songId))
    await tx.insert(splitLines).values(input.map((l, i) => {
      const prior = l.userId ? kept.get(l.userId) : undefined
      const same = prior && prior.shareBp === l.share && prior.name === l.name && (prior.role ?? null) === (l.role ?? null)
      return {
        songId,
        userId: l.userId ?? null,
        name: l.name,
        role: l.role ?? null,
        position: i,
        shareBp: l.share,
        confirmedAt: same ? prior.confirmedAt : null,
      }
    }))
    return loadSplitLines(tx, songId)
  })
}

/** Confirms (or takes back) the signed-in member's own line; 404 when they are not listed. */
export async function confirmOwnSplitLine(db: DbOrTx, songId: string, userId: string, confirm: boolean) {
  const [row] = await db.update(splitLines).set({ confirmedAt: confirm ? new Date() : null })
    .where(and(eq(splitLines.songId, songId), eq(splitLines.userId, userId))).returning({ id: splitLines.id })
  if (!row) throw createError({ statusCode: 404, message: 'You are not listed on this song\'s split sheet, so there is no line of yours to confirm.' })
}

/** The split sheet as the API returns it, for the signed-in member `userId`. */
export async function splitView(db: DbOrTx, songId: string, userId: string) {
  const lines = await loadSplitLines(db, songId)
  const problem = splitReadiness(lines)
  return {
    lines: lines.map(l => ({ ...l, mine: l.userId === userId })),
    totalBp: totalBp(lines),
    ready: problem === null,
    problem,
    locked: !!(await activeSealOfSong(db, songId)),
    caution: SPLIT_CAUTION,
  }
}
