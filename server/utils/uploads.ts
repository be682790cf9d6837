import { createWriteStream, mkdirSync } from 'node:fs'
import { readdir, rm, stat } from 'node:fs/promises'
import { hostname, tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomUUID } from 'node:crypto'
import busboy from 'busboy'
import type { H3Event } from 'h3'
import { SNIFF_BYTES } from './audio/formats'

/** An upload streamed to a temporary file, its format told by its content. */
export interface ReceivedFile<F extends string> {
  tmpPath: string
  format: F
  sizeBytes: number
  originalName: string
}

/** What an upload route accepts. */
export interface UploadSpec<F extends string> {
  limitBytes: number
  /** The format of a file from its first bytes, or null when it is not accepted. */
  detect: (head: Uint8Array) => Promise<F | null>
  /** The accepted formats as a person reads them ("WAV, MP3, FLAC or OGG/Vorbis"). */
  accepted: string
  /** What is sent, for messages ("the beat"). */
  what: string
  /** Name kept when the client sends none. */
  fallbackName: string
}

/**
 * Where uploads arrive before they are stored: inside the storage root on the file system
 * (so storing is one rename, and a half-received file never sits under a key), the OS
 * temporary directory otherwise. Keys are never under this folder, so nothing here is served.
 */
export function incomingDir(): string {
  const env = useEnv()
  return env.STORAGE_DRIVER === 'fs' ? join(env.STORAGE_DIR, '.incoming') : join(tmpdir(), 'barsmith-incoming')
}

const HOST_TAG = hostname().replace(/[^\w]/g, '').slice(0, 40) || 'host'
let incomingReady = false
function newIncomingPath(): string {
  const dir = incomingDir()
  if (!incomingReady) {
    mkdirSync(dir, { recursive: true })
    incomingReady = true
  }
  // The receiving process's id (and host, for a shared volume) is in the name, so after a crash
  // the next start can tell its leftovers.
  return join(dir, `${process.pid}-${HOST_TAG}-${randomUUID()}.part`)
}

function processAlive(pid: number): boolean {
  if (pid === process.pid) return true
  try {
    process.kill(pid, 0)
    return true
  }
  catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM'
  }
}

/**
 * Removes half-received uploads left by a process that died while receiving (killed, power
 * lost): this host's files whose process is gone, and any older than a day.
 * Returns how many were removed.
 */
export async function sweepIncoming(): Promise<number> {
  const dir = incomingDir()
  const names = await readdir(dir).catch(() => [] as string[])
  let removed = 0
  for (const name of names) {
    const [, pidText, host] = /^(\d+)-(\w+)-/.exec(name) ?? []
    const pid = Number(pidText)
    const path = join(dir, name)
    const old = await stat(path).then(s => Date.now() - s.mtimeMs > 86_400_000, () => false)
    // Another host's upload may still be arriving: only age tells.
    const gone = host === HOST_TAG && pid > 0 && !processAlive(pid)
    if (!old && !gone) continue
    await rm(path, { force: true, recursive: true })
    removed++
  }
  return removed
}

function refuse(statusCode: number, message: string) {
  return createError({ statusCode, message })
}

/**
 * Streams the multipart field `file` to a temporary file, checking its first bytes with
 * `spec.detect` (415 when it is not an accepted format, whatever its name says) and its size
 * against `spec.limitBytes` (413) while it arrives, so a large or wrong upload is refused
 * without being held in memory. Beats and scratch takes both come in through here.
 */
export function receiveUpload<F extends string>(event: H3Event, spec: UploadSpec<F>): Promise<ReceivedFile<F>> {
  const { limitBytes } = spec
  const req = event.node.req
  const type = req.headers['content-type'] ?? ''
  const limitMb = Math.round(limitBytes / 1024 / 1024 * 10) / 10
  if (!type.startsWith('multipart/form-data')) {
    return Promise.reject(refuse(415, `Send ${spec.what} as multipart/form-data with the audio in the field "file" (${spec.accepted}).`))
  }
  const declared = Number(req.headers['content-length'] ?? 0)
  // Multipart framing adds a few hundred bytes; anything past the limit plus that is too big for sure.
  if (declared > limitBytes + 64 * 1024) {
    // Answer before reading the body, then linger so the client reads the 413, not a reset.
    event.node.res.setHeader('Connection', 'close')
    event.node.res.once('finish', () => lingerThenClose(req))
    return Promise.reject(refuse(413, `The file is larger than the upload limit of ${limitMb} MB.`))
  }

  return new Promise<ReceivedFile<F>>((resolve, reject) => {
    let settled = false
    let bb: busboy.Busboy
    try {
      bb = busboy({ headers: req.headers, limits: { files: 1, fileSize: limitBytes, fields: 10, parts: 12 } })
    }
    catch {
      reject(refuse(400, 'The multipart body could not be read: check its boundary.'))
      return
    }
    const tmpPath = newIncomingPath()
    let out: ReturnType<typeof createWriteStream> | undefined
    let sawFile = false

    const fail = (error: unknown) => {
      if (settled) return
      settled = true
      req.unpipe(bb)
      out?.destroy()
      void rm(tmpPath, { force: true })
      // The rest of the body is not stored. After the reply, a bounded "lingering close" (as
      // web servers do) discards a little more so the client reads the reply before the
      // socket closes, instead of a reset; then the connection is dropped.
      event.node.res.setHeader('Connection', 'close')
      event.node.res.once('finish', () => lingerThenClose(req))
      reject(error)
    }

    bb.on('file', (name, stream, info) => {
      if (name !== 'file' || sawFile) {
        stream.resume()
        return
      }
      sawFile = true
      out = createWriteStream(tmpPath)
      out.on('error', fail)
      let size = 0
      let head: Buffer[] = []
      let headBytes = 0
      let format: F | null = null
      let checking: Promise<void> | null = null
      // The stream pauses for the format check and for the disk to catch up; it resumes when neither waits.
      let waitCheck = false
      let waitDrain = false
      const resume = () => {
        if (!settled && !waitCheck && !waitDrain) stream.resume()
      }

      const check = async () => {
        format = await spec.detect(Buffer.concat(head))
        head = []
        if (!format) fail(refuse(415, `That file is not audio Barsmith can read. Upload ${spec.accepted}; the file's content decides, not its name.`))
      }

      stream.on('data', (chunk: Buffer) => {
        if (settled) return
        size += chunk.length
        if (headBytes < SNIFF_BYTES) {
          head.push(chunk)
          headBytes += chunk.length
          if (headBytes >= SNIFF_BYTES) {
            waitCheck = true
            stream.pause()
            checking = check().then(() => {
              waitCheck = false
              resume()
            })
          }
        }
        if (!out!.write(chunk)) {
          waitDrain = true
          stream.pause()
          out!.once('drain', () => {
            waitDrain = false
            resume()
          })
        }
      })
      stream.on('limit', () => fail(refuse(413, `The file is larger than the upload limit of ${limitMb} MB.`)))
      stream.on('end', async () => {
        if (settled) return
        if (!format) await (checking ?? check())
        if (settled) return
        if (size === 0) return fail(refuse(400, 'The file is empty.'))
        out!.end(() => {
          if (settled) return
          settled = true
          resolve({ tmpPath, format: format!, sizeBytes: size, originalName: (info.filename || spec.fallbackName).slice(0, 200) })
        })
      })
    })
    bb.on('error', () => fail(refuse(400, 'The multipart body could not be read.')))
    bb.on('close', () => {
      if (!sawFile) fail(refuse(400, 'Attach the audio in the multipart field "file".'))
    })
    req.on('aborted', () => fail(refuse(400, 'The upload was interrupted.')))
    req.pipe(bb)
  })
}

const LINGER_BYTES = 256 * 1024 * 1024
const LINGER_MS = 2000

function lingerThenClose(req: H3Event['node']['req']) {
  let discarded = 0
  const done = () => {
    clearTimeout(timer)
    req.destroy()
  }
  const timer = setTimeout(done, LINGER_MS)
  req.on('data', (chunk: Buffer) => {
    discarded += chunk.length
    if (discarded > LINGER_BYTES) done()
  })
  req.on('end', done)
  req.resume()
}
