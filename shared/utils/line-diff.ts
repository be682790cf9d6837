/**
 * Line-by-line differences between two versions of a draft, computed with the `diff`
 * package (jsdiff's array diff, a Myers O(ND) minimal edit script). A line is the same in
 * both when it says the same words on the same bar (span and "out" mark included); its id
 * may differ. Changed lines are then paired by their stable id so a reworded line reads as
 * one change, with the words that moved marked.
 */
import { diffArrays, diffWordsWithSpace } from 'diff'
import type { LyricLine } from './lyric-doc'

export type DiffOp = 'same' | 'added' | 'removed'

/** One step of the edit script: a line kept, added (only in `to`) or removed (only in `from`). */
export interface DiffStep {
  op: DiffOp
  line: LyricLine
  /** Position in `from` (same, removed) and in `to` (same, added). */
  fromIndex: number | null
  toIndex: number | null
}

export interface WordPart { value: string, added?: boolean, removed?: boolean }

/** A row to show: a kept line, an added one, a removed one, or one line changed in place. */
export type DiffRow
  = | { kind: 'same', from: LyricLine, to: LyricLine }
    | { kind: 'added', to: LyricLine }
    | { kind: 'removed', from: LyricLine }
    | { kind: 'changed', from: LyricLine, to: LyricLine, words: WordPart[] }

export interface DiffStats { same: number, added: number, removed: number, changed: number }

/** True when two lines read the same on the same bar (ids aside). */
export function sameLine(a: LyricLine, b: LyricLine): boolean {
  return a.bar === b.bar && a.text === b.text && (a.bars ?? 1) === (b.bars ?? 1) && !!a.out === !!b.out
}

/** The minimal edit script from `from` to `to`, line by line. */
export function diffLineSteps(from: readonly LyricLine[], to: readonly LyricLine[]): DiffStep[] {
  const steps: DiffStep[] = []
  let i = 0
  let j = 0
  for (const change of diffArrays([...from], [...to], { comparator: sameLine })) {
    for (const line of change.value) {
      if (change.added) steps.push({ op: 'added', line, fromIndex: null, toIndex: j++ })
      else if (change.removed) steps.push({ op: 'removed', line, fromIndex: i++, toIndex: null })
      else steps.push({ op: 'same', line: from[i]!, fromIndex: i++, toIndex: j++ })
    }
  }
  return steps
}

/**
 * Rows for display: each run of removed + added lines is paired by line id (a line edited
 * in place, or moved to another bar, keeps its id); what stays unpaired is added or removed.
 */
export function diffRows(from: readonly LyricLine[], to: readonly LyricLine[]): DiffRow[] {
  const steps = diffLineSteps(from, to)
  const rows: DiffRow[] = []
  let k = 0
  while (k < steps.length) {
    const step = steps[k]!
    if (step.op === 'same') {
      rows.push({ kind: 'same', from: step.line, to: to[step.toIndex!]! })
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
    const addedById = new Map(added.map(l => [l.id, l]))
    const paired = new Set<string>()
    const hunk: DiffRow[] = []
    for (const r of removed) {
      const a = addedById.get(r.id)
      if (a && !paired.has(a.id)) {
        paired.add(a.id)
        hunk.push({ kind: 'changed', from: r, to: a, words: diffWordsWithSpace(r.text, a.text).map(p => ({ value: p.value, ...(p.added ? { added: true } : {}), ...(p.removed ? { removed: true } : {}) })) })
      }
      else {
        hunk.push({ kind: 'removed', from: r })
      }
    }
    for (const a of added) if (!paired.has(a.id)) hunk.push({ kind: 'added', to: a })
    // Within a run, read in bar order (where each line now sits); the sort is stable.
    rows.push(...hunk.sort((x, y) => rowBar(x) - rowBar(y)))
  }
  return rows
}

function rowBar(row: DiffRow): number {
  return row.kind === 'removed' ? row.from.bar : row.to.bar
}

export function diffStats(rows: readonly DiffRow[]): DiffStats {
  const stats: DiffStats = { same: 0, added: 0, removed: 0, changed: 0 }
  for (const r of rows) stats[r.kind]++
  return stats
}
