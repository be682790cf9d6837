import { createReadStream, createWriteStream } from 'node:fs'
import { readFile, rm, stat } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { Readable } from 'node:stream'
import { randomUUID } from 'node:crypto'
import { AwsClient } from 'aws4fetch'
import busboy from 'busboy'
import type { H3Event } from 'h3'
import { ACCEPTED_FORMATS_TEXT, detectAudioFormat, SNIFF_BYTES, type AudioFormat } from './audio/formats'

/** Storage keys are built from row ids only, never from a user's file name. */
export const beatAudioKey = (songId: string, beatId: string, format: AudioFormat) => `beats/${songId}/${beatId}/audio.${format}`
export const beatPeaksKey = (songId: string, beatId: string) => `beats/${songId}/${beatId}/peaks.json`

export interface ReceivedUpload {
  tmpPath: string
  format: AudioFormat
  sizeBytes: number
  originalName: string
}

function refuse(statusCode: number, message: string) {
  return createError({ statusCode, message })
}

/**
 * Streams the multipart field `file` to a temporary file, checking its first bytes for an
 * accepted audio format (415 otherwise) and its size against `limitBytes` (413) while it
 * arrives, so a large or wrong upload is refused without being held in memory.
 */
export function receiveAudioUpload(event: H3Event, limitBytes: number): Promise<ReceivedUpload> {
  const req = event.node.req
  const type = req.headers['content-type'] ?? ''
  const limitMb = Math.round(limitBytes / 1024 / 1024 * 10) / 10
  if (!type.startsWith('multipart/form-data')) {
    return Promise.reject(refuse(415, `Send the beat as multipart/form-data with the audio in the field "file" (${ACCEPTED_FORMATS_TEXT}).`))
  }
  const declared = Number(req.headers['content-length'] ?? 0)
  // Multipart framing adds a few hundred bytes; anything past the limit plus that is too big for sure.
  if (declared > limitBytes + 64 * 1024) {
    // Answer before reading the body, then linger so the client reads the 413, not a reset.
    event.node.res.setHeader('Connection', 'close')
    event.node.res.once('finish', () => lingerThenClose(req))
    return Promise.reject(refuse(413, `The file is larger than the upload limit of ${limitMb} MB.`))
  }

  return new Promise<ReceivedUpload>((resolve, reject) => {
    let settled = false
    let bb: busboy.Busboy
    try {
      bb = busboy({ headers: req.headers, limits: { files: 1, fileSize: limitBytes, fields: 10, parts: 12 } })
    }
    catch {
      reject(refuse(400, 'The multipart body could not be read: check its boundary.'))
      return
    }
    const tmpPath = join(tmpdir(), `barsmith-upload-${randomUUID()}`)
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
      let format: AudioFormat | null = null
      let checking: Promise<void> | null = null
      // The stream pauses for the format check and for the disk to catch up; it resumes when neither waits.
      let waitCheck = false
      let waitDrain = false
      const resume = () => {
        if (!settled && !waitCheck && !waitDrain) stream.resume()
      }

      const check = async () => {
        format = await detectAudioFormat(Buffer.concat(head))
        head = []
        if (!format) fail(refuse(415, `That file is not audio Barsmith can read. Upload ${ACCEPTED_FORMATS_TEXT}; the file's content decides, not its name.`))
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
          resolve({ tmpPath, format: format!, sizeBytes: size, originalName: (info.filename || 'beat').slice(0, 200) })
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

/** The file-system path of a key in the `files` mount (fs driver only). */
function fsPath(key: string): string {
  return join(useEnv().STORAGE_DIR, ...key.split('/'))
}

function s3Client() {
  const env = useEnv()
  return new AwsClient({ service: 's3', region: env.S3_REGION, accessKeyId: env.S3_ACCESS_KEY_ID!, secretAccessKey: env.S3_SECRET_ACCESS_KEY! })
}
const s3Url = (key: string) => `${useEnv().S3_ENDPOINT!.replace(/\/$/, '')}/${useEnv().S3_BUCKET}/${key}`

/** Moves a received upload into the `files` mount (streamed on the file system). */
export async function storeUpload(key: string, tmpPath: string): Promise<void> {
  const storage = useStorage('files')
  if (useEnv().STORAGE_DRIVER === 'fs') await storage.setItemRaw(key, createReadStream(tmpPath))
  else await storage.setItemRaw(key, await readFile(tmpPath))
}

/** The stored bytes of `key`, or null. */
export async function readStored(key: string): Promise<Buffer | null> {
  const raw = await useStorage('files').getItemRaw(key)
  if (!raw) return null
  return Buffer.isBuffer(raw) ? raw : Buffer.from(raw as ArrayBuffer)
}

/** A byte range [start, end] of a stored file as a stream (ranged GET on S3). */
export async function streamStored(key: string, start: number, end: number): Promise<Readable> {
  if (useEnv().STORAGE_DRIVER === 'fs') {
    await stat(fsPath(key))
    return createReadStream(fsPath(key), { start, end })
  }
  const res = await s3Client().fetch(s3Url(key), { headers: { Range: `bytes=${start}-${end}` } })
  if (!res.ok || !res.body) throw createError({ statusCode: 404, message: 'The stored audio is missing.' })
  return Readable.fromWeb(res.body as never)
}

export async function removeTemp(path: string) {
  await rm(path, { force: true })
}

/**
 * Parses a single `Range: bytes=a-b` header against `size`: null for no header; throws
 * 416 for a range that cannot be served.
 */
export function parseRange(header: string | undefined, size: number): { start: number, end: number } | null {
  if (!header) return null
  const m = /^bytes=(\d*)-(\d*)$/.exec(header.trim())
  const unsatisfiable = () => {
    const error = createError({ statusCode: 416, message: `That byte range is outside the file (0–${size - 1}).` })
    error.data = undefined
    return error
  }
  if (!m || (m[1] === '' && m[2] === '')) throw unsatisfiable()
  let start: number
  let end: number
  if (m[1] === '') {
    start = Math.max(0, size - Number(m[2]))
    end = size - 1
  }
  else {
    start = Number(m[1])
    end = m[2] === '' ? size - 1 : Math.min(Number(m[2]), size - 1)
  }
  if (start > end || start >= size) throw unsatisfiable()
  return { start, end }
}
