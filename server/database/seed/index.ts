import { count } from 'drizzle-orm'
import type { Db } from '../../utils/db'
import { users } from '../schema'
import { seedPeople } from './people'
import { seedSongs } from './songs'
import { seedDrafts } from './drafts'
import { seedFinishedSong } from './finished'
import { seedLexicon } from './lexicon'
import { seedBeat } from './beats'

/**
 * Seeds the invented demo crew when the database has no users yet, so it never writes over
 * real data. Each step receives what the earlier ones made.
 */
export async function seedDemoIfEmpty(db: Db): Promise<boolean> {
  const [row] = await db.select({ n: count() }).from(users)
  if (row!.n > 0) return false
  await db.transaction(async (tx) => {
    const people = await seedPeople(tx, useEnv().DEMO_PASSWORD)
    const song = await seedSongs(tx, people)
    await seedBeat(tx, people, song.songId)
    await seedDrafts(tx, people, song)
    await seedFinishedSong(tx, people)
    await seedLexicon(tx, people)
  })
  console.log('[barsmith] seeded the demo crew')
  return true
}
