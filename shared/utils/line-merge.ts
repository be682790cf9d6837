/**
 * The merge of a refused save ("mine") with the draft's head ("theirs"), line by line.
 * Rows come from the same line diff as history; where the base both started from is known,
 * each differing row gets a suggestion: a line only one side changed takes that side.
 */
import { diffLineSteps, sameLine } from './line-diff'
import { newLineId, type LyricLine } from './lyric-doc'

export type MergeChoice = 'mine' | 'theirs' | 'both'

export interface MergeRow {
  /** Stable within one merge (row position). */
  key: string
  theirs: LyricLine | null
  mine: LyricLine | null
  /** False when both sides say the same: nothing to choose. */
  differs: boolean
  /** What to take unless the writer chooses otherwise. */
  suggested: MergeChoice
  /** Both sides changed this line away from the base (or no base is known). */
  conflict: boolean
}

function suggest(theirs: LyricLine | null, mine: LyricLine | null, base: Map<string, LyricLine> | null): { suggested: MergeChoice, conflict: boolean } {
  if (!base) return { suggested: 'both', conflict: true }
  const b = (theirs && base.get(theirs.id)) || (mine && base.get(mine.id)) || null
  const unchanged = (l: LyricLine | null) => (l && b ? sameLine(l, b) : !l && !b)
  // Only I changed (or added, or removed) it: mine. Only they did: theirs.
  if (unchanged(theirs)) return { suggested: 'mine', conflict: false }
  if (unchanged(mine)) return { suggested: 'theirs', conflict: false }
  return { suggested: 'both', conflict: true }
}

/** Rows for the merge view: `theirs` is the head's lines, `mine` the refused save's. */
export function mergeRows(theirs: readonly LyricLine[], mine: readonly LyricLine[], base: readonly LyricLine[] | null = null): MergeRow[] {
  const baseById = base ? new Map(base.map(l => [l.id, l])) : null
  const steps = diffLineSteps(theirs, mine)
  const rows: MergeRow[] = []
  let k = 0
  while (k < steps.length) {
    const step = steps[k]!
    if (step.op === 'same') {
      rows.push({ key: `r${rows.length}`, theirs: theirs[step.fromIndex!]!, mine: mine[step.toIndex!]!, differs: false, suggested: 'theirs', conflict: false })
      k++
      continue
    }
    const removed: LyricLine[] = []
    const added: LyricLine[] = []
    while (k < steps.length && steps[k]!.op !== 'same') {
      const s = steps[k++]!
      if (s.op === 'removed') removed.push(s.line)
      else added.push(s.line)
    }
    // Pair the run's lines by id first (the same line, edited on both sides), then in order.
    const mineLeft = [...added]
    for (const t of removed) {
      const at = mineLeft.findIndex(m => m.id === t.id)
      const m = at >= 0 ? mineLeft.splice(at, 1)[0]! : null
      rows.push({ key: `r${rows.length}`, theirs: t, mine: m, differs: true, ...suggest(t, m, baseById) })
    }
    for (const m of mineLeft) rows.push({ key: `r${rows.length}`, theirs: null, mine: m, differs: true, ...suggest(null, m, baseById) })
  }
  return rows
}

/**
 * The merged lines for the chosen sides (a row without a choice takes its suggestion).
 * "Both" keeps theirs then mine; a line id already used gets a new one, so ids stay unique.
 */
export function applyMerge(rows: readonly MergeRow[], choices: Readonly<Record<string, MergeChoice>> = {}, makeId: () => string = newLineId): LyricLine[] {
  const out: LyricLine[] = []
  const used = new Set<string>()
  const keep = (line: LyricLine | null) => {
    if (!line) return
    const copy = { ...line }
    if (used.has(copy.id)) copy.id = makeId()
    used.add(copy.id)
    out.push(copy)
  }
  for (const row of rows) {
    // Kept lines keep the head's ids: alts point at them.
    if (!row.differs) {
      keep(row.theirs)
      continue
    }
    const choice = choices[row.key] ?? row.suggested
    if (choice === 'theirs' || choice === 'both') keep(row.theirs)
    if (choice === 'mine' || (choice === 'both' && !(row.theirs && row.mine && sameLine(row.theirs, row.mine)))) keep(row.mine)
  }
  return out
}
