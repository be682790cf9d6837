import { eq, inArray, sql } from 'drizzle-orm'
import nodemailer, { type Transporter } from 'nodemailer'
import type SMTPPool from 'nodemailer/lib/smtp-pool'
import { outbox, type OutboxAttachment, type OutboxMessage } from '../database/schema'
import type { DbOrTx } from './db'

export interface MailInput {
  to: string
  subject: string
  text: string
  html?: string
  attachments?: OutboxAttachment[]
}

/**
 * Writes a message to the outbox (inside the caller's transaction when one is passed) and
 * wakes the outbox worker. Nothing is sent here: a mail server that is down loses nothing.
 */
export async function queueMail(db: DbOrTx, mail: MailInput | MailInput[]): Promise<void> {
  const rows = [mail].flat()
  if (rows.length === 0) return
  await db.insert(outbox).values(rows.map(m => ({ ...m, attachments: m.attachments ?? [] })))
  await db.execute(sql`SELECT pg_notify('barsmith_outbox', '')`)
}

let transporter: Transporter | undefined

function useTransporter(): Transporter {
  transporter ??= nodemailer.createTransport(
    { url: useEnv().SMTP_URL, pool: true, maxConnections: SEND_CONCURRENCY, connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 } satisfies SMTPPool.Options,
    { from: useEnv().MAIL_FROM },
  )
  return transporter
}

/** Seconds to wait before attempt `n` (1-based): 2, 4, 8 … capped at 5 minutes. */
export function retryDelaySeconds(attempts: number): number {
  return Math.min(300, 2 ** Math.max(1, attempts))
}

export const MAX_MAIL_ATTEMPTS = 25

async function attachmentContent(a: OutboxAttachment): Promise<Buffer> {
  if (a.contentBase64) return Buffer.from(a.contentBase64, 'base64')
  if (a.storageKey) {
    const raw = await useStorage('files').getItemRaw(a.storageKey)
    if (!raw) throw new Error(`attachment ${a.storageKey} is missing from storage`)
    return Buffer.from(raw as ArrayBuffer)
  }
  throw new Error('attachment without content')
}

async function sendOne(message: OutboxMessage) {
  const attachments = await Promise.all(message.attachments.map(async a => ({
    filename: a.filename,
    contentType: a.contentType,
    content: await attachmentContent(a),
  })))
  await useTransporter().sendMail({
    to: message.to,
    subject: message.subject,
    text: message.text,
    html: message.html ?? undefined,
    attachments,
  })
}

/** How long a claimed message stays reserved for its sender before another may retry it. */
const CLAIM_LEASE_SECONDS = 120
const SEND_CONCURRENCY = 5

/**
 * Claims up to `batch` due messages (SKIP LOCKED, so several server instances share the
 * work) by pushing their next attempt past a lease, sends them a few at a time over pooled
 * SMTP connections and records each outcome; a failure is retried later with a growing
 * delay. A sender that dies mid-send leaves its messages to be retried when the lease ends.
 * Returns how many it claimed and how many of those were sent.
 */
export async function deliverDueMail(db: DbOrTx, batch = 20): Promise<{ claimed: number, sent: number }> {
  const claimed = await db.execute<{ id: string }>(sql`
    UPDATE outbox SET next_attempt_at = now() + make_interval(secs => ${CLAIM_LEASE_SECONDS}), attempts = attempts + 1
    WHERE id IN (
      SELECT id FROM outbox WHERE status = 'pending' AND next_attempt_at <= now()
      ORDER BY attempts, next_attempt_at LIMIT ${batch} FOR UPDATE SKIP LOCKED
    ) RETURNING id`)
  const ids = claimed.rows.map(r => r.id)
  if (ids.length === 0) return { claimed: 0, sent: 0 }
  const messages = await db.select().from(outbox).where(inArray(outbox.id, ids))
  let sent = 0
  const queue = [...messages]
  const worker = async () => {
    for (let message = queue.shift(); message; message = queue.shift()) {
      try {
        await sendOne(message)
        await db.update(outbox).set({ status: 'sent', sentAt: new Date(), lastError: null }).where(eq(outbox.id, message.id))
        sent++
      }
      catch (error) {
        // A 5xx reply is the mail server's final word on this message (RFC 5321, 4.2.1):
        // retrying it would only hold up the mail behind it.
        const code = Number((error as { responseCode?: unknown }).responseCode)
        const permanent = code >= 500 && code < 600
        await db.update(outbox).set({
          status: permanent || message.attempts >= MAX_MAIL_ATTEMPTS ? 'failed' : 'pending',
          lastError: String((error as Error).message ?? error).slice(0, 1000),
          nextAttemptAt: new Date(Date.now() + retryDelaySeconds(message.attempts) * 1000),
        }).where(eq(outbox.id, message.id))
      }
    }
  }
  await Promise.all(Array.from({ length: Math.min(SEND_CONCURRENCY, messages.length) }, worker))
  return { claimed: ids.length, sent }
}
