import { createHash } from 'node:crypto'
import { brotliCompressSync, constants, gzipSync } from 'node:zlib'
import { LRUCache } from 'lru-cache'
import Negotiator from 'negotiator'
import { analyseDraft, analysisJson, type AnalysisInput, type AnalysisJsonDetail } from './analyse'
import type { Lexicon } from './resolve'

/** An analysis response in each content coding made for it so far (HTTP content codings, RFC 9110 §8.4). */
interface Encoded { identity: Buffer, br?: Buffer, gzip?: Buffer }
export type ContentCoding = keyof Encoded

/**
 * Whole analysis responses, as UTF-8 JSON (encoded once, not at every send), kept by a digest
 * of what decides them: the lines, grid and sections, the detail asked for, and the crew
 * lexicon's version (a digest of its entries, so a taught word changes the key at once).
 * Kept small: a draft being typed never asks twice, and large buffers kept long cost memory.
 */
const responses = new LRUCache<string, Encoded>({
  max: 64,
  maxSize: 16 * 1024 * 1024,
  sizeCalculation: e => e.identity.length + (e.br?.length ?? 0) + (e.gzip?.length ?? 0) || 1,
})

/** A lexicon the cache may key on: one that says which version of a crew's entries it holds. */
function lexiconKey(lexicon: Lexicon | undefined): string | null {
  if (!lexicon?.size) return ''
  return lexicon.version ?? null
}

function encodedAnalysis(input: AnalysisInput, lexicon: Lexicon | undefined, detail: AnalysisJsonDetail): { key: string | null, encoded: Encoded } {
  const version = lexiconKey(lexicon)
  if (version === null) return { key: null, encoded: { identity: Buffer.from(analysisJson(analyseDraft(input, lexicon), detail)) } }
  const key = createHash('sha1')
    .update(JSON.stringify([input.lines, input.grid ?? null, input.sections ?? null, detail, version]))
    .digest('base64')
  let encoded = responses.get(key)
  if (!encoded) {
    encoded = { identity: Buffer.from(analysisJson(analyseDraft(input, lexicon), detail)) }
    responses.set(key, encoded)
  }
  return { key, encoded }
}

/**
 * The analysis of `input` as the UTF-8 JSON the route sends, from the cache when the same draft
 * was analysed before with the same lexicon version; analysed (and kept) otherwise.
 */
export function analysisResponse(input: AnalysisInput, lexicon: Lexicon | undefined, detail: AnalysisJsonDetail): Buffer {
  return encodedAnalysis(input, lexicon, detail).encoded.identity
}

// Below this the bytes saved do not pay for compressing.
const COMPRESS_FROM_BYTES = 1024

/**
 * The content coding to answer with for an Accept-Encoding header: Brotli if accepted, else gzip, else none.
 * On a loopback socket, writing 237 KB of JSON cost about a millisecond of CPU; Brotli at
 * quality 1 makes it ~11 KB in ~0.2 ms (gzip level 1: ~26 KB in ~0.8 ms).
 */
export function chooseCoding(acceptEncoding: string | undefined): ContentCoding {
  if (!acceptEncoding) return 'identity'
  // Of the codings the client accepts (q > 0), the server's preference decides (RFC 9110 §12.5.3).
  const accepted = new Set(new Negotiator({ headers: { 'accept-encoding': acceptEncoding } }).encodings(['br', 'gzip', 'identity']))
  return accepted.has('br') ? 'br' : accepted.has('gzip') ? 'gzip' : 'identity'
}

/** `analysisResponse` in the coding asked for; the compressed bytes are kept beside the plain ones. */
export function analysisResponseIn(input: AnalysisInput, lexicon: Lexicon | undefined, detail: AnalysisJsonDetail, coding: ContentCoding): { body: Buffer, coding: ContentCoding } {
  const { key, encoded } = encodedAnalysis(input, lexicon, detail)
  if (coding === 'identity' || encoded.identity.length < COMPRESS_FROM_BYTES) return { body: encoded.identity, coding: 'identity' }
  let body = encoded[coding]
  if (!body) {
    body = coding === 'br'
      ? brotliCompressSync(encoded.identity, { params: { [constants.BROTLI_PARAM_QUALITY]: 1, [constants.BROTLI_PARAM_SIZE_HINT]: encoded.identity.length } })
      : gzipSync(encoded.identity, { level: 1 })
    encoded[coding] = body
    if (key) responses.set(key, encoded) // counts the new bytes against the cache's size
  }
  return { body, coding }
}

/** Empties the response cache (tests that change the corrections table). */
export function clearAnalysisResponses() {
  responses.clear()
}
