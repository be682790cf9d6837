import type { DbOrTx } from '../../utils/db'
import { songs } from '../schema'
import type { DemoPeople } from './people'

export const DEMO_SONG_TITLE = 'Night Bus Home'

export async function seedSongs(tx: DbOrTx, people: DemoPeople) {
  const [song] = await tx.insert(songs).values({
    crewId: people.crewId,
    title: DEMO_SONG_TITLE,
    createdBy: people.producer.id,
    bpm: 90,
    beatsPerBar: 4,
    offsetMs: 0,
  }).returning()
  return { songId: song!.id }
}
