import { changedLines } from '~~/shared/utils/desk-lines'
import type { LyricDoc, LyricLine } from '~~/shared/utils/lyric-doc'
import type { LineMarks } from '~/components/desk/extensions'
import type { BarFigures, LineFigures } from '~/utils/desk/view'

interface WordResult { index: number, text: string, start: number, end: number, isAdlib: boolean, syllables: number, stress: string, source: string, family?: string }
interface LineResult { id: string, bar: number, syllables: number, syllablesMin: number, syllablesMax: number, adlibSyllables: number, stress: string, words: WordResult[] }
interface BarResult { bar: number, syllables: number, lineIds: string[], syllablesPerBeat?: number, dense?: boolean, overPacked?: boolean }
interface FamilyResult { id: string, kind: 'perfect' | 'near' | 'multi', letter: string, words: Array<{ lineId: string, index: number }> }
interface AnalysisResult { lines: LineResult[], bars: BarResult[], families: FamilyResult[] }

const MAX_CHARS = 300

/**
 * Live figures for the desk. Each section block is analysed on its own (its rhyme families
 * and letters belong to the section), and only blocks with a changed line are sent again,
 * after a pause in typing; the rest keep their last figures. Answers that arrive out of
 * order are dropped.
 */
export function useDeskAnalysis(options: { grid: () => { bpm: number, beatsPerBar: number, feel?: 'normal' | 'half' }, crewId: () => string | undefined, debounceMs?: number }) {
  const lineFigures = shallowRef(new Map<string, LineFigures>())
  const lineMarks = new Map<string, LineMarks>()
  const barFigures = shallowRef(new Map<number, BarFigures>())
  const error = ref('')
  /** Requests sent so far and lines they carried (the bench and tests read them). */
  const sent = ref({ requests: 0, lines: 0 })
  /** Bumped after every applied answer so the editor redraws its marks. */
  const revision = ref(0)
  const analysed = new Map<string, { bar: number, text: string }>()
  const blockKeys: string[] = []
  const blockBars: Array<BarResult[]> = []
  const seq: number[] = []
  let timer: ReturnType<typeof setTimeout> | undefined
  let latest: LyricDoc | null = null

  function blocksOf(doc: LyricDoc): LyricLine[][] {
    return doc.content.map(b => (b.content ?? []).filter(n => n.type === 'line' && !n.attrs.out).map(n => ({
      id: n.attrs.lineId, bar: n.attrs.bar, text: (n.content ?? []).map(t => t.text).join('').slice(0, MAX_CHARS),
    })))
  }

  async function analyseBlock(index: number, lines: LyricLine[]) {
    const mine = (seq[index] = (seq[index] ?? 0) + 1)
    if (!lines.length) return apply(index, mine, lines, { lines: [], bars: [], families: [] })
    sent.value = { requests: sent.value.requests + 1, lines: sent.value.lines + lines.length }
    try {
      const g = options.grid()
      const crewId = options.crewId()
      const res = await api<AnalysisResult>('/api/analysis', {
        method: 'POST',
        body: { lines: lines.map(l => ({ id: l.id, bar: l.bar, text: l.text })), grid: { bpm: g.bpm, beatsPerBar: g.beatsPerBar, ...(g.feel ? { feel: g.feel } : {}) }, ...(crewId ? { crewId } : {}) },
      })
      apply(index, mine, lines, res)
      error.value = ''
    }
    catch (e) {
      if (seq[index] === mine) error.value = `Counts are paused: ${apiError(e).message}`
      for (const l of lines) analysed.delete(l.id)
    }
  }

  function apply(index: number, mine: number, lines: LyricLine[], res: AnalysisResult) {
    if (seq[index] !== mine) return
    const letterOf = new Map<string, { letter: string, kind: FamilyResult['kind'] }>()
    for (const f of res.families) {
      if (f.kind === 'multi') continue
      for (const w of f.words) letterOf.set(`${w.lineId}:${w.index}`, { letter: f.letter, kind: f.kind })
    }
    const figures = new Map(lineFigures.value)
    const sentText = new Map(lines.map(l => [l.id, l.text]))
    for (const line of res.lines) {
      const text = sentText.get(line.id) ?? ''
      const letters: string[] = []
      const marks: LineMarks = { text, words: [] }
      for (const w of line.words) {
        const fam = letterOf.get(`${line.id}:${w.index}`)
        if (fam && !letters.includes(fam.letter)) letters.push(fam.letter)
        const guessed = w.source === 'guess' && !w.isAdlib
        if (fam || guessed) {
          marks.words.push({ start: w.start, end: w.end, letter: fam?.letter, kind: fam?.kind, pattern: fam ? (fam.letter.charCodeAt(0) - 65) % 6 : undefined, guessed })
        }
      }
      lineMarks.set(line.id, marks)
      figures.set(line.id, {
        text, syllables: line.syllables, syllablesMin: line.syllablesMin, syllablesMax: line.syllablesMax, adlibSyllables: line.adlibSyllables, stress: line.stress, letters,
        guessed: [...new Set(line.words.filter(w => w.source === 'guess' && !w.isAdlib).map(w => w.text.toLowerCase()))],
        words: line.words.map(w => ({ text: w.text, stress: w.stress, syllables: w.syllables, source: w.source, isAdlib: w.isAdlib })),
      })
      analysed.set(line.id, { bar: line.bar, text })
    }
    lineFigures.value = figures
    blockBars[index] = res.bars
    const bars = new Map<number, BarFigures>()
    for (const list of blockBars) {
      for (const b of list ?? []) {
        const before = bars.get(b.bar)
        bars.set(b.bar, before
          ? { ...before, syllables: before.syllables + b.syllables, lineCount: before.lineCount + b.lineIds.length }
          : { bar: b.bar, syllables: b.syllables, lineCount: b.lineIds.length, syllablesPerBeat: b.syllablesPerBeat, dense: b.dense, overPacked: b.overPacked })
      }
    }
    barFigures.value = bars
    revision.value++
  }

  function run() {
    if (!latest) return
    const blocks = blocksOf(latest)
    blockBars.length = Math.min(blockBars.length, blocks.length)
    blockKeys.length = Math.min(blockKeys.length, blocks.length)
    blocks.forEach((lines, i) => {
      const key = lines.map(l => `${l.id}@${l.bar}`).join(' ')
      const { changed } = changedLines(analysed, lines)
      if (!changed.length && blockKeys[i] === key) return
      blockKeys[i] = key
      void analyseBlock(i, lines)
    })
  }

  /** Call on every change of the document; the analysis runs after a pause. */
  function update(doc: LyricDoc, now = false) {
    latest = doc
    clearTimeout(timer)
    if (now) run()
    else timer = setTimeout(run, options.debounceMs ?? 250)
  }

  /** Forget every figure (the crew lexicon changed) and analyse again at once. */
  function invalidate() {
    analysed.clear()
    blockKeys.length = 0
    run()
  }

  onBeforeUnmount(() => clearTimeout(timer))

  return {
    lineFigures, barFigures, error, sent, revision, update, invalidate,
    marksOf: (lineId: string) => lineMarks.get(lineId),
  }
}
