import { createHash } from 'node:crypto'
import { LRUCache } from 'lru-cache'
import { analyseDraft, analysisJson, type AnalysisInput, type AnalysisJsonDetail } from './analyse'
import type { Lexicon } from './resolve'

/**
 * Whole analysis responses, as UTF-8 JSON (encoded once, not at every send), kept by a digest of what decides them: the lines,
 * grid and sections, the detail asked for, and the crew lexicon's version (a digest of its
 * entries, so a taught word changes the key at once). Bounded by count and by size.
 */
// Kept small: a draft being typed never asks twice, and large strings kept long cost GC time.
const responses = new LRUCache<string, Buffer>({
  max: 64,
  maxSize: 16 * 1024 * 1024,
  sizeCalculation: bytes => bytes.length || 1,
})

/** A lexicon the cache may key on: one that says which version of a crew's entries it holds. */
function lexiconKey(lexicon: Lexicon | undefined): string | null {
  if (!lexicon?.size) return ''
  return lexicon.version ?? null
}

/**
 * The analysis of `input` as the UTF-8 JSON the route sends, from the cache when the same draft
 * was analysed before with the same lexicon version; analysed (and kept) otherwise.
 */
export function analysisResponse(input: AnalysisInput, lexicon: Lexicon | undefined, detail: AnalysisJsonDetail): Buffer {
  const version = lexiconKey(lexicon)
  if (version === null) return Buffer.from(analysisJson(analyseDraft(input, lexicon), detail))
  const key = createHash('sha1')
    .update(JSON.stringify([input.lines, input.grid ?? null, input.sections ?? null, detail, version]))
    .digest('base64')
  let bytes = responses.get(key)
  if (bytes === undefined) {
    bytes = Buffer.from(analysisJson(analyseDraft(input, lexicon), detail))
    responses.set(key, bytes)
  }
  return bytes
}

/** Empties the response cache (tests that change the corrections table). */
export function clearAnalysisResponses() {
  responses.clear()
}
