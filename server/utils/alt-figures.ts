import type { AltFigures, AltView } from '../../shared/schemas/alts'
import type { LyricLine } from '../../shared/utils/lyric-doc'
import { analyseDraft, type Analysis, type LineAnalysis } from './prosody/analyse'
import type { Lexicon } from './prosody/resolve'

/** The last sung word of a line (ad-libs and silent tokens aside). */
function endWord(line: LineAnalysis | undefined) {
  return line?.words.filter(w => !w.isAdlib && w.syllables > 0).at(-1)
}

function syllablesOf(line: LineAnalysis): number | string {
  return line.syllablesMin === line.syllablesMax ? line.syllables : `${line.syllablesMin}–${line.syllablesMax}`
}

/** Words (other lines only) of the perfect or near family the line's end word belongs to. */
function endFamily(analysis: Analysis, lineId: string) {
  const word = endWord(analysis.lines.find(l => l.id === lineId))
  const family = word?.family ? analysis.families.find(f => f.id === word.family) : undefined
  if (!family) return null
  return { letter: family.letter, others: new Set(family.words.filter(w => w.lineId !== lineId).map(w => `${w.lineId}:${w.index}`)) }
}

/**
 * Figures for alts, from the prosody engine: each alt's own syllable count and whether,
 * put in its line's place in the head, its end word still rhymes with the words that
 * rhymed with the line's end word (its perfect or near family). `keepsFamily` is null when
 * the line's end word had no family to keep, or the line is no longer in the head.
 * The head's own lines get figures under `line:<lineId>`.
 */
export function altFigures(headLines: readonly LyricLine[], alts: readonly Pick<AltView, 'id' | 'lineId' | 'text' | 'status'>[], lexicon?: Lexicon): Record<string, AltFigures> {
  const out: Record<string, AltFigures> = {}
  if (!alts.length) return out
  const asInput = (lines: readonly LyricLine[]) => ({ lines: lines.map(l => ({ id: l.id, bar: l.bar, text: l.text })) })
  const base = analyseDraft(asInput(headLines), lexicon)
  const families = new Map<string, ReturnType<typeof endFamily>>()
  for (const alt of alts) {
    if (alt.status !== 'open') continue
    const at = headLines.findIndex(l => l.id === alt.lineId)
    if (at < 0) {
      const alone = analyseDraft({ lines: [{ id: alt.lineId, bar: 1, text: alt.text }] }, lexicon).lines[0]!
      out[alt.id] = { syllables: syllablesOf(alone), keepsFamily: null }
      continue
    }
    if (!families.has(alt.lineId)) {
      families.set(alt.lineId, endFamily(base, alt.lineId))
      const line = base.lines[at]!
      out[`line:${alt.lineId}`] = { syllables: syllablesOf(line), family: families.get(alt.lineId)?.letter }
    }
    const original = families.get(alt.lineId)!
    const swapped = analyseDraft(asInput(headLines.map((l, i) => (i === at ? { ...l, text: alt.text } : l))), lexicon)
    const altLine = swapped.lines[at]!
    const now = endFamily(swapped, alt.lineId)
    const keeps = original ? !!now && [...now.others].some(k => original.others.has(k)) : null
    // The letter is the head's own (as the desk's gutter shows it), so only a kept family has one.
    out[alt.id] = { syllables: syllablesOf(altLine), keepsFamily: keeps, ...(keeps ? { family: original!.letter } : {}) }
  }
  return out
}
