import type { DbOrTx } from '../../utils/db'
import { lexiconEntries } from '../schema'
import type { DemoPeople } from './people'

/** Invented crew slang the demo crew has taught Barsmith, one by ARPAbet and one by respelling. */
export async function seedLexicon(tx: DbOrTx, people: DemoPeople) {
  await tx.insert(lexiconEntries).values([
    { crewId: people.crewId, word: 'lampo', phones: 'L AE1 M P OW0', createdBy: people.writer.id },
    { crewId: people.crewId, word: 'skrt', phones: 'S K ER1 T', soundsLike: 'skirt', createdBy: people.writer.id },
  ])
}
