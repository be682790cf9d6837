import { randomUUID } from 'node:crypto'
import { hostname } from 'node:os'
import { and, asc, eq, gt, lt, sql } from 'drizzle-orm'
import { memberships, presence, users } from '../database/schema'
import type { DbOrTx } from './db'
import type { SongEvent } from './events'

/** This server process, as presence rows name it. */
export const INSTANCE_ID = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`

export type LiveEvent = SongEvent & { songId: string, at: number }
type SongListener = (event: LiveEvent) => void

const bySong = new Map<string, Set<SongListener>>()
let listening: Promise<unknown> | undefined

function dispatch(payload: string) {
  let event: LiveEvent
  try {
    event = JSON.parse(payload)
  }
  catch {
    return
  }
  for (const fn of bySong.get(event.songId) ?? []) {
    try {
      fn(event)
    }
    catch { /* one broken stream must not stop the others */ }
  }
}

/**
 * Calls `fn` for every event published on `songId` by any server instance (NOTIFY
 * barsmith_song, one LISTEN connection per process). Returns the unsubscribe function.
 */
export async function subscribeToSong(songId: string, fn: SongListener): Promise<() => void> {
  listening ??= listenTo('barsmith_song', dispatch)
  await listening
  let set = bySong.get(songId)
  if (!set) bySong.set(songId, set = new Set())
  set.add(fn)
  return () => {
    set.delete(fn)
    if (!set.size) bySong.delete(songId)
  }
}

/** How long a presence row counts without a heartbeat. */
export function presenceTtlMs() {
  return Math.round(useEnv().LIVE_HEARTBEAT_MS * 2.5) + 1000
}

export async function presenceJoin(db: DbOrTx, row: { connectionId: string, songId: string, userId: string }) {
  await db.insert(presence).values({ ...row, instanceId: INSTANCE_ID })
  await publishSongEvent(db, row.songId, { type: 'presence', userId: row.userId, action: 'joined' })
}

/** Refreshes a stream's presence row; now and then clears rows left by instances that died. */
export async function presenceBeat(db: DbOrTx, connectionId: string) {
  await db.update(presence).set({ lastSeenAt: new Date() }).where(eq(presence.connectionId, connectionId))
  if (Math.random() < 0.05) await db.delete(presence).where(lt(presence.lastSeenAt, sql`now() - interval '1 hour'`))
}

export async function presenceLeave(db: DbOrTx, row: { connectionId: string, songId: string, userId: string }) {
  await db.delete(presence).where(eq(presence.connectionId, row.connectionId))
  await publishSongEvent(db, row.songId, { type: 'presence', userId: row.userId, action: 'left' })
}

/** Who has the song open now (by any instance), one entry per person, earliest first. */
export async function listPresence(db: DbOrTx, song: { id: string, crewId: string }) {
  return db.select({
    userId: users.id,
    name: users.name,
    role: memberships.role,
    since: sql<string>`min(${presence.connectedAt})`,
    connections: sql<number>`count(*)::int`,
  }).from(presence)
    .innerJoin(users, eq(users.id, presence.userId))
    .innerJoin(memberships, and(eq(memberships.userId, presence.userId), eq(memberships.crewId, song.crewId)))
    .where(and(eq(presence.songId, song.id), gt(presence.lastSeenAt, sql`now() - ${presenceTtlMs()} * interval '1 millisecond'`)))
    .groupBy(users.id, users.name, memberships.role)
    .orderBy(asc(sql`min(${presence.connectedAt})`))
}

export async function isCrewMember(db: DbOrTx, crewId: string, userId: string) {
  const [row] = await db.select({ id: memberships.id }).from(memberships)
    .where(and(eq(memberships.crewId, crewId), eq(memberships.userId, userId)))
  return !!row
}

/** Open event streams of this process, ended when the server shuts down. */
export const openStreams = new Set<() => void>()
