/**
 * Pure rules of the lyric desk's editor (no ProseMirror, no Vue): which bar a new line goes
 * on, moving a line between bars, which lines sit on a bar, which line ids must be renewed
 * after a paste or a split, and which lines changed since the last analysis.
 */
import type { BlockNode, LyricDoc, LyricLine, SectionRef } from './lyric-doc'
import { docFromLines } from './lyric-doc'
import { SECTION_KIND_LABELS } from '../schemas/beats'

export const MAX_BAR = 9999
export const MAX_SPAN = 2

/** The last bar a line holds (a line on bar 7 spanning two bars holds bar 8). */
export const endBarOf = (line: Pick<LyricLine, 'bar' | 'bars'>) => line.bar + (line.bars ?? 1) - 1

/** True when `line` is sung on `bar` (its first bar or a bar it spans into). */
export const holdsBar = (line: Pick<LyricLine, 'bar' | 'bars'>, bar: number) => bar >= line.bar && bar <= endBarOf(line)

/** The lines sung on `bar`, in document order (several short lines may share a bar). */
export function linesOnBar(lines: readonly LyricLine[], bar: number): LyricLine[] {
  return lines.filter(l => !l.out && holdsBar(l, bar))
}

/**
 * The bar for a line started with Enter after the line at `index`: the first bar after it
 * that no line holds. When that bar would jump past the next line in the document (which
 * would put the lines out of bar order), the new line shares the current line's last bar.
 */
export function barForNewLine(lines: readonly LyricLine[], index: number): number {
  const current = lines[index]
  if (!current) return lastFreeBar(lines)
  const taken = new Set<number>()
  for (const l of lines) for (let b = l.bar; b <= endBarOf(l); b++) taken.add(b)
  let bar = endBarOf(current) + 1
  while (taken.has(bar) && bar < MAX_BAR) bar++
  const next = lines[index + 1]
  if (next && bar > next.bar) return endBarOf(current)
  return Math.min(bar, MAX_BAR)
}

/** The bar after the last one any line holds (1 for an empty draft). */
export function lastFreeBar(lines: readonly LyricLine[]): number {
  return Math.min(MAX_BAR, lines.reduce((max, l) => Math.max(max, endBarOf(l)), 0) + 1)
}

/** A bar moved by `delta`, kept within 1…9999. */
export const movedBar = (bar: number, delta: number) => Math.max(1, Math.min(MAX_BAR, Math.round(bar + delta)))

/** A typed bar number, or null when it is not one (the editor keeps the old bar). */
export function parseBar(value: string): number | null {
  if (!/^\s*\d{1,4}\s*$/.test(value)) return null
  const n = Number(value)
  return n >= 1 && n <= MAX_BAR ? n : null
}

/**
 * Positions (in document order) whose line id must be renewed: missing, malformed, or already
 * used by an earlier line (a split or a paste copies the id; the first holder keeps it).
 */
export function idsToRenew(ids: ReadonlyArray<string | null | undefined>, pattern = /^[\w-]{1,64}$/): number[] {
  const seen = new Set<string>()
  const renew: number[] = []
  ids.forEach((id, i) => {
    if (!id || !pattern.test(id) || seen.has(id)) renew.push(i)
    else seen.add(id)
  })
  return renew
}

/** Lines whose text or bar differs from what was analysed last (by id), and ids no longer there. */
export function changedLines(analysed: ReadonlyMap<string, { bar: number, text: string }>, lines: readonly LyricLine[]): { changed: LyricLine[], gone: string[] } {
  const changed = lines.filter((l) => {
    const before = analysed.get(l.id)
    return !before || before.text !== l.text || before.bar !== l.bar
  })
  const ids = new Set(lines.map(l => l.id))
  const gone = [...analysed.keys()].filter(id => !ids.has(id))
  return { changed, gone }
}

/**
 * A stored document ready for the editor: blocks without lines are dropped and an empty draft
 * gets one empty line on the first bar of the song's first section (bar 1 without sections).
 */
export function editableDoc(doc: LyricDoc | null | undefined, sections: readonly SectionRef[], makeId: () => string): LyricDoc {
  const content: BlockNode[] = (doc?.content ?? []).filter(b => (b.content ?? []).some(n => n.type === 'line'))
  if (content.length) return { type: 'doc', content }
  const first = [...sections].sort((a, b) => a.startBar - b.startBar)[0]
  return docFromLines([{ id: makeId(), bar: first?.startBar ?? 1, text: '' }], sections)
}

/** The section a line falls in by its bar, for "loop this section". */
export function sectionRangeOf(sections: readonly SectionRef[], bar: number): { startBar: number, endBar: number, label: string } | null {
  const s = sections.find(x => bar >= x.startBar && bar <= x.endBar)
  return s ? { startBar: s.startBar, endBar: s.endBar, label: sectionTitle(s.kind, s.label) } : null
}

/** A section's name as the desk shows it: its own label, else the name of its kind. */
export function sectionTitle(kind: string | null | undefined, label: string | null | undefined): string {
  return label || (kind ? (SECTION_KIND_LABELS as Record<string, string>)[kind] ?? kind : '')
}

/** Ad-lib spans in a line's text: the parenthesised parts, as [from, to) character offsets. */
export function adlibRanges(text: string): Array<[number, number]> {
  const out: Array<[number, number]> = []
  const re = /\([^()]*\)/g
  let m: RegExpExecArray | null
  while ((m = re.exec(text))) out.push([m.index, m.index + m[0].length])
  return out
}
