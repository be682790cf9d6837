import { relations, sql } from 'drizzle-orm'
import { boolean, index, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { createdAt } from './common'
import { users } from './auth'
import { songs } from './songs'
import { drafts } from './drafts'
import { alts } from './alts'

export const notificationKind = pgEnum('notification_kind', ['alt.proposed', 'alt.taken', 'alt.passed'])

/**
 * Something for one person to see (unread until marked read). Those flagged `email` are
 * also mailed, several at once: the mail worker batches a person's pending ones.
 */
export const notifications = pgTable('notifications', {
  id: uuid('id').primaryKey().defaultRandom(),
  userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  kind: notificationKind('kind').notNull(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  draftId: uuid('draft_id').references(() => drafts.id, { onDelete: 'cascade' }),
  altId: uuid('alt_id').references(() => alts.id, { onDelete: 'cascade' }),
  actorId: uuid('actor_id').references(() => users.id, { onDelete: 'set null' }),
  title: text('title').notNull(),
  body: text('body').notNull(),
  url: text('url').notNull(),
  email: boolean('email').notNull().default(false),
  mailedAt: timestamp('mailed_at', { withTimezone: true, mode: 'date' }),
  readAt: timestamp('read_at', { withTimezone: true, mode: 'date' }),
  createdAt,
}, t => [
  index('notifications_user_created_idx').on(t.userId, t.createdAt),
  index('notifications_mail_due_idx').on(t.userId, t.createdAt).where(sql`${t.email} AND ${t.mailedAt} IS NULL`),
])

export const notificationsRelations = relations(notifications, ({ one }) => ({
  user: one(users, { fields: [notifications.userId], references: [users.id] }),
  song: one(songs, { fields: [notifications.songId], references: [songs.id] }),
  alt: one(alts, { fields: [notifications.altId], references: [alts.id] }),
}))

export type Notification = typeof notifications.$inferSelect
