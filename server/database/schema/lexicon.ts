import { relations, sql } from 'drizzle-orm'
import { check, index, pgTable, text, unique, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'
import { crews } from './crews'
import { users } from './auth'

/**
 * A crew's own pronunciations (names, slang), used before the dictionary by the analysis and
 * the rhyme finder. `phones` is ARPAbet; `soundsLike` keeps the respelling it was taught with.
 */
export const lexiconEntries = pgTable('lexicon_entries', {
  id: uuid('id').primaryKey().defaultRandom(),
  crewId: uuid('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
  word: text('word').notNull(),
  phones: text('phones').notNull(),
  soundsLike: text('sounds_like'),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  unique('lexicon_entries_crew_word_key').on(t.crewId, t.word),
  index('lexicon_entries_crew_idx').on(t.crewId),
  check('lexicon_entries_word_check', sql`${t.word} ~ '^''?[a-z]+(''[a-z]+)*''?$' AND length(${t.word}) <= 40`),
  check('lexicon_entries_phones_check', sql`${t.phones} ~ '^((AA|AE|AH|AO|AW|AY|EH|ER|EY|IH|IY|OW|OY|UH|UW)[012]|B|CH|D|DH|F|G|HH|JH|K|L|M|N|NG|P|R|S|SH|T|TH|V|W|Y|Z|ZH)( ((AA|AE|AH|AO|AW|AY|EH|ER|EY|IH|IY|OW|OY|UH|UW)[012]|B|CH|D|DH|F|G|HH|JH|K|L|M|N|NG|P|R|S|SH|T|TH|V|W|Y|Z|ZH))*$'`),
])

export const lexiconEntriesRelations = relations(lexiconEntries, ({ one }) => ({
  crew: one(crews, { fields: [lexiconEntries.crewId], references: [crews.id] }),
  author: one(users, { fields: [lexiconEntries.createdBy], references: [users.id] }),
}))

export type LexiconEntry = typeof lexiconEntries.$inferSelect
export type NewLexiconEntry = typeof lexiconEntries.$inferInsert
