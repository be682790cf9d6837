import { relations } from 'drizzle-orm'
import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { users } from './auth'
import { songs } from './songs'

/**
 * Who has a song open: one row per open event stream, refreshed by heartbeats, so every
 * server instance answers the same list. Rows of a crashed instance simply go stale.
 */
export const presence = pgTable('presence', {
  connectionId: uuid('connection_id').primaryKey(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  instanceId: text('instance_id').notNull(),
  connectedAt: timestamp('connected_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  lastSeenAt: timestamp('last_seen_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
}, t => [
  index('presence_song_seen_idx').on(t.songId, t.lastSeenAt),
])

export const presenceRelations = relations(presence, ({ one }) => ({
  song: one(songs, { fields: [presence.songId], references: [songs.id] }),
  user: one(users, { fields: [presence.userId], references: [users.id] }),
}))

export type Presence = typeof presence.$inferSelect
