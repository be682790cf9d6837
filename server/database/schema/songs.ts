import { relations } from 'drizzle-orm'
import { index, integer, numeric, pgEnum, pgTable, text, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'
import { crews } from './crews'
import { users } from './auth'

export const gridFeel = pgEnum('grid_feel', ['normal', 'half'])

/**
 * A song and its grid. The grid lives on the song (not the beat) so a writer can start on
 * the default grid before any beat exists, and bounces keep it.
 */
export const songs = pgTable('songs', {
  id: uuid('id').primaryKey().defaultRandom(),
  crewId: uuid('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
  title: text('title').notNull(),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  bpm: numeric('bpm', { precision: 7, scale: 3, mode: 'number' }).notNull().default(90),
  beatsPerBar: integer('beats_per_bar').notNull().default(4),
  offsetMs: numeric('offset_ms', { precision: 10, scale: 3, mode: 'number' }).notNull().default(0),
  feel: gridFeel('feel').notNull().default('normal'),
  ...timestamps,
}, t => [
  index('songs_crew_idx').on(t.crewId),
])

export const songsRelations = relations(songs, ({ one }) => ({
  crew: one(crews, { fields: [songs.crewId], references: [crews.id] }),
}))

export type Song = typeof songs.$inferSelect
export type NewSong = typeof songs.$inferInsert
