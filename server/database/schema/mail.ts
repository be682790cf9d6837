import { sql } from 'drizzle-orm'
import { index, integer, jsonb, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'

export const outboxStatus = pgEnum('outbox_status', ['pending', 'sent', 'failed'])

export interface OutboxAttachment {
  filename: string
  contentType: string
  /** Key in the `files` storage mount; the bytes are read when the mail is sent. */
  storageKey?: string
  /** Small attachments may be inlined as base64. */
  contentBase64?: string
}

/** Every e-mail is written here first and sent by the outbox worker, with retries. */
export const outbox = pgTable('outbox', {
  id: uuid('id').primaryKey().defaultRandom(),
  to: text('to').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  html: text('html'),
  attachments: jsonb('attachments').$type<OutboxAttachment[]>().notNull().default([]),
  status: outboxStatus('status').notNull().default('pending'),
  attempts: integer('attempts').notNull().default(0),
  nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  lastError: text('last_error'),
  sentAt: timestamp('sent_at', { withTimezone: true, mode: 'date' }),
  ...timestamps,
}, t => [
  index('outbox_due_idx').on(t.nextAttemptAt).where(sql`${t.status} = 'pending'`),
])

export type OutboxMessage = typeof outbox.$inferSelect
