import { readdir, readFile } from 'node:fs/promises'
import { resolve } from 'node:path'
import { inject } from 'vitest'

export interface ReceivedMail {
  id: string
  receivedAt: string
  envelope: { from: string | null, to: string[] }
  subject: string
  text: string
  html: string
  attachments: Array<{ file: string, filename: string, contentType: string, size: number }>
}

export async function allMail(): Promise<ReceivedMail[]> {
  const dir = inject('mailboxDir')
  const files = (await readdir(dir).catch(() => [] as string[])).filter(f => f.endsWith('.json')).sort()
  return Promise.all(files.map(async f => JSON.parse(await readFile(resolve(dir, f), 'utf8')) as ReceivedMail))
}

/** Waits until the fake SMTP server has a message to `to` that matches, and returns it. */
export async function waitForMail(to: string, match: (m: ReceivedMail) => boolean = () => true, timeoutMs = 20_000): Promise<ReceivedMail> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    const found = (await allMail()).filter(m => m.envelope.to.includes(to.toLowerCase()) && match(m))
    if (found.length) return found.at(-1)!
    await new Promise(r => setTimeout(r, 200))
  }
  throw new Error(`no mail to ${to} arrived within ${timeoutMs} ms`)
}

export function attachmentPath(mail: ReceivedMail, index = 0): string {
  return resolve(inject('mailboxDir'), mail.id, mail.attachments[index]!.file)
}

/** The first link in a message's text that points at `path` on the app. */
export function linkIn(mail: ReceivedMail, path: string): string {
  const url = mail.text.match(new RegExp(`https?://\\S+${path.replace(/[/?]/g, m => `\\${m}`)}\\S*`))?.[0]
  if (!url) throw new Error(`no ${path} link in mail "${mail.subject}":\n${mail.text}`)
  return url
}
