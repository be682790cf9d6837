import { createReadStream } from 'node:fs'
import { copyFile, mkdir, readFile, rename, rm, stat } from 'node:fs/promises'
import { dirname, join } from 'node:path'
import { Readable } from 'node:stream'
import { AwsClient } from 'aws4fetch'
import type { H3Event } from 'h3'
import { ACCEPTED_FORMATS_TEXT, detectAudioFormat, type AudioFormat } from './audio/formats'
import { receiveUpload, type ReceivedFile } from './uploads'

/** Storage keys are built from row ids only, never from a user's file name. */
export const beatAudioKey = (songId: string, beatId: string, format: AudioFormat) => `beats/${songId}/${beatId}/audio.${format}`
export const beatPeaksKey = (songId: string, beatId: string) => `beats/${songId}/${beatId}/peaks.json`

/** A beat upload received to a temporary file, its format told by its content. */
export type ReceivedUpload = ReceivedFile<AudioFormat>

/**
 * Streams the multipart field `file` to a temporary file, refusing anything that is not an
 * accepted beat format (415) or is larger than `limitBytes` (413) while it arrives.
 */
export function receiveAudioUpload(event: H3Event, limitBytes: number): Promise<ReceivedUpload> {
  return receiveUpload(event, { limitBytes, detect: detectAudioFormat, accepted: ACCEPTED_FORMATS_TEXT, what: 'the beat', fallbackName: 'beat' })
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

/**
 * Moves a received upload into the `files` mount. On the file system it is one rename from
 * the incoming folder (same volume), so a key never holds a half-written file, even when
 * the process dies mid-way; across volumes it is copied beside the key and then renamed.
 */
export async function storeUpload(key: string, tmpPath: string): Promise<void> {
  if (useEnv().STORAGE_DRIVER !== 'fs') {
    await useStorage('files').setItemRaw(key, await readFile(tmpPath))
    return
  }
  const target = fsPath(key)
  await mkdir(dirname(target), { recursive: true })
  try {
    await rename(tmpPath, target)
  }
  catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EXDEV') throw error
    const part = `${target}.part`
    await copyFile(tmpPath, part)
    await rename(part, target)
  }
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

/**
 * Answers with a stored file for playback, honouring one `Range` header (206) so a browser
 * can seek without loading it all. Stored files never change under their id (`etag`).
 */
export async function sendStoredFile(event: H3Event, file: { key: string, size: number, mime: string, etag: string }) {
  const range = parseRange(getRequestHeader(event, 'range'), file.size)
  const { start, end } = range ?? { start: 0, end: file.size - 1 }
  setResponseHeaders(event, {
    'Content-Type': file.mime,
    'Accept-Ranges': 'bytes',
    'Content-Length': String(end - start + 1),
    'Cache-Control': 'private, max-age=86400, immutable',
    'ETag': `"${file.etag}"`,
  })
  if (range) {
    setResponseStatus(event, 206)
    setResponseHeader(event, 'Content-Range', `bytes ${start}-${end}/${file.size}`)
  }
  return sendStream(event, await streamStored(file.key, start, end))
}
