import { sql } from 'drizzle-orm'
import type { DbOrTx } from './db'

export interface SongEvent {
  type: string
  [key: string]: unknown
}

/**
 * Announces a change on a song to every server instance (NOTIFY barsmith_song), delivered
 * when the surrounding transaction commits. Payloads stay small: listeners re-fetch details.
 */
export async function publishSongEvent(db: DbOrTx, songId: string, event: SongEvent) {
  const payload = JSON.stringify({ songId, at: Date.now(), ...event })
  await db.execute(sql`SELECT pg_notify('barsmith_song', ${payload})`)
}
