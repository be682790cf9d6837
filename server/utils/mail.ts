import { and, asc, eq, lte, sql } from 'drizzle-orm'
import nodemailer, { type Transporter } from 'nodemailer'
import type SMTPTransport from 'nodemailer/lib/smtp-transport'
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
    { url: useEnv().SMTP_URL, connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 } satisfies SMTPTransport.Options,
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

/**
 * Claims due messages (SKIP LOCKED, so several server instances share the work), sends
 * them and records the outcome; a failure is retried later with a growing delay.
 * Returns how many were sent.
 */
export async function deliverDueMail(db: DbOrTx, limit = 20): Promise<number> {
  let sent = 0
  for (;;) {
    const done = await db.transaction(async (tx) => {
      const [message] = await tx.select().from(outbox)
        .where(and(eq(outbox.status, 'pending'), lte(outbox.nextAttemptAt, sql`now()`)))
        .orderBy(asc(outbox.nextAttemptAt))
        .limit(1)
        .for('update', { skipLocked: true })
      if (!message) return false
      try {
        await sendOne(message)
        await tx.update(outbox).set({ status: 'sent', sentAt: new Date(), attempts: message.attempts + 1, lastError: null }).where(eq(outbox.id, message.id))
        sent++
      }
      catch (error) {
        const attempts = message.attempts + 1
        await tx.update(outbox).set({
          attempts,
          status: attempts >= MAX_MAIL_ATTEMPTS ? 'failed' : 'pending',
          lastError: String((error as Error).message ?? error).slice(0, 1000),
          nextAttemptAt: new Date(Date.now() + retryDelaySeconds(attempts) * 1000),
        }).where(eq(outbox.id, message.id))
      }
      return true
    })
    if (!done || sent >= limit) return sent
  }
}
