import { dictionaryKeys, rawValue } from './dictionary'

/**
 * The guesser's training pairs: every dictionary headword made of letters a–z with its first
 * pronunciation, minus the words in `hidden` (the held-out check hides its sample this way).
 */
export function* trainingEntries(hidden: ReadonlySet<string> = new Set()): Generator<[string, string[]]> {
  for (const key of dictionaryKeys()) {
    if (!/^[a-z]+$/.test(key) || hidden.has(key)) continue
    yield [key, rawValue(key).split(' ')]
  }
}
