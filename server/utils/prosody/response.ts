import { createHash } from 'node:crypto'
import { LRUCache } from 'lru-cache'
import { analyseDraft, analysisJson, type AnalysisInput, type AnalysisJsonDetail } from './analyse'
import type { Lexicon } from './resolve'

/**
 * Whole analysis responses, as JSON text, kept by a digest of what decides them: the lines,
 * grid and sections, the detail asked for, and the crew lexicon's version (a digest of its
 * entries, so a taught word changes the key at once). Bounded by count and by size.
 */
const responses = new LRUCache<string, string>({
  max: 256,
  maxSize: 48 * 1024 * 1024,
  sizeCalculation: text => text.length || 1,
})

/** A lexicon the cache may key on: one that says which version of a crew's entries it holds. */
function lexiconKey(lexicon: Lexicon | undefined): string | null {
  if (!lexicon?.size) return ''
  return lexicon.version ?? null
}

/**
 * The analysis of `input` as the JSON text the route sends, from the cache when the same draft
 * was analysed before with the same lexicon version; analysed (and kept) otherwise.
 */
export function analysisResponse(input: AnalysisInput, lexicon: Lexicon | undefined, detail: AnalysisJsonDetail): string {
  const version = lexiconKey(lexicon)
  if (version === null) return analysisJson(analyseDraft(input, lexicon), detail)
  const key = createHash('sha1')
    .update(JSON.stringify([input.lines, input.grid ?? null, input.sections ?? null, detail, version]))
    .digest('base64')
  let text = responses.get(key)
  if (text === undefined) {
    text = analysisJson(analyseDraft(input, lexicon), detail)
    responses.set(key, text)
  }
  return text
}

/** Empties the response cache (tests that change the corrections table). */
export function clearAnalysisResponses() {
  responses.clear()
}
