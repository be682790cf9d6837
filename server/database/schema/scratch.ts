import { relations, sql } from 'drizzle-orm'
import { bigint, check, index, integer, pgEnum, pgTable, text, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'
import { users } from './auth'
import { songs } from './songs'

export const scratchFormat = pgEnum('scratch_format', ['wav', 'mp3', 'flac', 'ogg', 'webm', 'opus'])

/**
 * A rough vocal recorded in the browser over the loop, pinned to the lyric bar where the
 * recording started; it plays back from that bar's time on the grid. Storage keys are made
 * from ids only.
 */
export const scratchTakes = pgTable('scratch_takes', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
  bar: integer('bar').notNull(),
  name: text('name').notNull(),
  durationMs: integer('duration_ms').notNull(),
  format: scratchFormat('format').notNull(),
  sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
  storageKey: text('storage_key').notNull(),
  ...timestamps,
}, t => [
  index('scratch_takes_song_bar_idx').on(t.songId, t.bar),
  check('scratch_takes_bar_valid', sql`${t.bar} >= 1`),
  check('scratch_takes_duration_valid', sql`${t.durationMs} > 0`),
])

export const scratchTakesRelations = relations(scratchTakes, ({ one }) => ({
  song: one(songs, { fields: [scratchTakes.songId], references: [songs.id] }),
  author: one(users, { fields: [scratchTakes.authorId], references: [users.id] }),
}))

export type ScratchTake = typeof scratchTakes.$inferSelect
