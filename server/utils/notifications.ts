import { and, desc, eq, inArray, isNull, sql } from 'drizzle-orm'
import type { LyricLine } from '../../shared/utils/lyric-doc'
import { memberships, notifications, users, versions, drafts, type Alt, type Draft, type Song } from '../database/schema'
import type { DbOrTx } from './db'
import type { MailInput } from './mail'

const quote = (s: string, max = 120) => `“${s.length > max ? `${s.slice(0, max - 1)}…` : s}”`

/** Where a line's alts are read and decided (the song's lines room, on that draft and line). */
export function linePath(songId: string, draftId: string, lineId: string) {
  return `/songs/${songId}?draft=${draftId}&line=${encodeURIComponent(lineId)}`
}

/**
 * The writer of a line: the author of the earliest version, in any draft of the song, that
 * holds a line with this id (drafts copied from each other share line ids). Only a current
 * member of the song's crew counts.
 */
export async function lineWriter(db: DbOrTx, song: Pick<Song, 'id' | 'crewId'>, lineId: string) {
  const [row] = await db.select({ id: users.id, name: users.name, email: users.email })
    .from(versions)
    .innerJoin(drafts, eq(drafts.id, versions.draftId))
    .innerJoin(users, eq(users.id, versions.authorId))
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.crewId, song.crewId)))
    .where(and(eq(drafts.songId, song.id), sql`${versions.lines} @> jsonb_build_array(jsonb_build_object('id', ${lineId}::text))`))
    .orderBy(versions.createdAt, versions.number)
    .limit(1)
  return row
}

/** Tells a line's writer (in the app, and later by a batched e-mail) that an alt was proposed on it. */
export async function notifyLineWriter(tx: DbOrTx, input: { song: Song, draft: Draft, alt: Alt, line: LyricLine, proposer: { id: string, name: string } }) {
  const writer = await lineWriter(tx, input.song, input.line.id)
  if (!writer || writer.id === input.proposer.id) return
  await tx.insert(notifications).values({
    userId: writer.id,
    kind: 'alt.proposed',
    songId: input.song.id,
    draftId: input.draft.id,
    altId: input.alt.id,
    actorId: input.proposer.id,
    title: `New alt on your line in “${input.song.title}”`,
    body: `${input.proposer.name} proposed ${quote(input.alt.text)} for bar ${input.line.bar} (${quote(input.line.text)}) in the draft “${input.draft.name}”.`,
    url: linePath(input.song.id, input.draft.id, input.line.id),
    email: true,
  })
}

/** Tells an alt's author (in the app only) that a writer took or passed it. */
export async function notifyAltDecided(tx: DbOrTx, input: { song: Song, alt: Alt, decider: { id: string, name: string } }) {
  if (!input.alt.authorId || input.alt.authorId === input.decider.id) return
  const taken = input.alt.status === 'taken'
  await tx.insert(notifications).values({
    userId: input.alt.authorId,
    kind: taken ? 'alt.taken' : 'alt.passed',
    songId: input.song.id,
    draftId: input.alt.draftId,
    altId: input.alt.id,
    actorId: input.decider.id,
    title: `${input.decider.name} ${taken ? 'took' : 'passed'} your alt in “${input.song.title}”`,
    body: `${quote(input.alt.text)} (for ${quote(input.alt.lineText)}) was ${taken ? 'taken into a new version' : 'passed; it stays on record'}.`,
    url: linePath(input.song.id, input.alt.draftId, input.alt.lineId),
  })
}

/** The signed-in user's newest notifications and unread count. */
export async function listNotifications(db: DbOrTx, userId: string, unreadOnly = false, limit = 50) {
  const items = await db.select({
    id: notifications.id, kind: notifications.kind, songId: notifications.songId, draftId: notifications.draftId, altId: notifications.altId,
    title: notifications.title, body: notifications.body, url: notifications.url, readAt: notifications.readAt, createdAt: notifications.createdAt,
  }).from(notifications)
    .where(unreadOnly ? and(eq(notifications.userId, userId), isNull(notifications.readAt)) : eq(notifications.userId, userId))
    .orderBy(desc(notifications.createdAt)).limit(limit)
  return { unread: await unreadCount(db, userId), items }
}

export async function unreadCount(db: DbOrTx, userId: string): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(notifications)
    .where(and(eq(notifications.userId, userId), isNull(notifications.readAt)))
  return row!.n
}

/** Marks some (by id, the user's own only) or all of the user's notifications read. */
export async function markNotificationsRead(db: DbOrTx, userId: string, ids: string[] | 'all') {
  await db.update(notifications).set({ readAt: new Date() }).where(and(
    eq(notifications.userId, userId),
    isNull(notifications.readAt),
    ...(ids === 'all' ? [] : [inArray(notifications.id, ids)]),
  ))
  return { unread: await unreadCount(db, userId) }
}

function altDigestMail(to: { email: string, name: string }, items: Array<{ title: string, body: string, url: string }>, appUrl: string): MailInput {
  const n = items.length
  const subject = n === 1 ? items[0]!.title : `${n} new alts on your lines`
  const list = items.map(i => `- ${i.body}\n  ${new URL(i.url, appUrl).toString()}`).join('\n')
  const text = `Hi ${to.name},\n\n${n === 1 ? 'A crew member proposed an alt' : `Crew members proposed ${n} alts`} on lines you wrote:\n\n${list}\n\nOpen a line to vote, comment, take or pass.\n\n— Barsmith`
  const esc = (s: string) => s.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)
  const html = `<div style="font-family:Georgia,serif;font-size:16px;line-height:1.6;color:#1d1a16">
<p>Hi ${esc(to.name)},</p><p>${n === 1 ? 'A crew member proposed an alt' : `Crew members proposed ${n} alts`} on lines you wrote:</p>
<ul>${items.map(i => `<li>${esc(i.body)} <a href="${esc(new URL(i.url, appUrl).toString())}" style="color:#8a5a12">Open the line</a></li>`).join('')}</ul>
<p>— Barsmith</p></div>`
  return { to: to.email, subject, text, html }
}

/**
 * Mails each person their pending alt notifications as one message, once none has arrived
 * for ALT_MAIL_WINDOW_MS (or the oldest waited ALT_MAIL_MAX_WAIT_MS). An advisory lock per
 * person keeps two instances from mailing the same batch. Returns how many mails were queued.
 */
export async function deliverDueAltMail(db: DbOrTx): Promise<number> {
  const env = useEnv()
  const due = await db.select({ userId: notifications.userId }).from(notifications)
    .where(and(eq(notifications.email, true), isNull(notifications.mailedAt)))
    .groupBy(notifications.userId)
    .having(sql`max(${notifications.createdAt}) <= now() - ${env.ALT_MAIL_WINDOW_MS} * interval '1 millisecond'
      OR min(${notifications.createdAt}) <= now() - ${env.ALT_MAIL_MAX_WAIT_MS} * interval '1 millisecond'`)
  let queued = 0
  for (const { userId } of due) {
    queued += await db.transaction(async (tx) => {
      const [lock] = await tx.execute<{ ok: boolean }>(sql`SELECT pg_try_advisory_xact_lock(hashtext('barsmith_alt_mail'), hashtext(${userId})) AS ok`).then(r => r.rows)
      if (!lock?.ok) return 0
      const pending = await tx.select().from(notifications)
        .where(and(eq(notifications.userId, userId), eq(notifications.email, true), isNull(notifications.mailedAt)))
        .orderBy(notifications.createdAt).for('update')
      if (!pending.length) return 0
      const [to] = await tx.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, userId))
      if (to) await queueMail(tx, altDigestMail(to, pending, env.APP_URL))
      await tx.update(notifications).set({ mailedAt: new Date() }).where(inArray(notifications.id, pending.map(p => p.id)))
      return to ? 1 : 0
    })
  }
  return queued
}
