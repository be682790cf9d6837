import { randomUUID, createHash } from 'node:crypto'
import { mkdir, rename, writeFile } from 'node:fs/promises'
import { resolve } from 'node:path'

/**
 * A fake SMTP server for local use and tests: accepts every message on loopback and stores
 * it under `dir` as `<id>.eml` plus `<id>.json` (parsed headers, text, html, attachment list)
 * and the attachments themselves in `<id>/`. It delivers nothing anywhere.
 */
export async function startFakeSmtp({ port, dir, host = '127.0.0.1' }) {
  const [{ SMTPServer }, { simpleParser }] = await Promise.all([import('smtp-server'), import('mailparser')])
  await mkdir(dir, { recursive: true })
  let count = 0
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Barsmith fake SMTP (local only)',
    logger: false,
    size: 50 * 1024 * 1024,
    // Addresses at reject.test (a reserved name, RFC 2606) are refused for good, as a real
    // server refuses an unknown mailbox, so a permanent failure can be tried locally.
    onRcptTo(address, session, callback) {
      if (/@reject\.test$/i.test(address.address)) return callback(Object.assign(new Error('No such mailbox here'), { responseCode: 550 }))
      callback()
    },
    onData(stream, session, callback) {
      const chunks = []
      stream.on('data', c => chunks.push(c))
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks)
          const parsed = await simpleParser(raw)
          const id = `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomUUID().slice(0, 8)}`
          const attachments = []
          if (parsed.attachments.length) await mkdir(resolve(dir, id), { recursive: true })
          for (const [i, a] of parsed.attachments.entries()) {
            const file = `${i}-${(a.filename || 'attachment').replace(/[^\w.-]+/g, '_')}`
            await writeFile(resolve(dir, id, file), a.content)
            attachments.push({ file, filename: a.filename, contentType: a.contentType, size: a.size, sha256: createHash('sha256').update(a.content).digest('hex') })
          }
          await writeFile(resolve(dir, `${id}.eml`), raw)
          const message = {
            id,
            receivedAt: new Date().toISOString(),
            envelope: { from: session.envelope.mailFrom?.address ?? null, to: session.envelope.rcptTo.map(r => r.address) },
            from: parsed.from?.text ?? '',
            to: parsed.to ? [parsed.to].flat().map(t => t.text).join(', ') : '',
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            attachments,
          }
          // The JSON file appears last, so a reader never sees a half-written message.
          await writeFile(resolve(dir, `${id}.json.tmp`), JSON.stringify(message, null, 2))
          await rename(resolve(dir, `${id}.json.tmp`), resolve(dir, `${id}.json`))
          count++
          callback()
        }
        catch (error) {
          callback(error)
        }
      })
    },
  })
  await new Promise((resolvePromise, reject) => {
    server.once('error', reject)
    server.listen(port, host, resolvePromise)
  })
  return {
    port: server.server.address().port,
    get count() { return count },
    close: () => new Promise(r => server.close(r)),
  }
}
