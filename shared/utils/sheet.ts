/**
 * The final sheet of one version: what is performed (lines marked out and empty lines are
 * left off), grouped by the document's sections, each line timed from the grid. The page,
 * the PDF, the WebVTT and the plain-text exports are all drawn from this one model.
 */
import { exactBefore, formatClock, formatMinutes, lyricBarStartExact, roundMs, type ExactMs, type Grid } from './grid'
import type { LyricDoc, LyricLine } from './lyric-doc'
import { formatShare } from './shares'

export interface Segment { text: string, adlib: boolean }

export interface SheetLine {
  id: string
  bar: number
  bars: number
  text: string
  segments: Segment[]
  /** The whole line is ad-libs (styled apart, still performed). */
  adlibOnly: boolean
  startMs: number
  endMs: number
  /** The cadence as a row of slots (`cadenceRow`), when the sheet was asked for this bar's. */
  cadence?: string
}

export interface SheetSection {
  kind: string | null
  heading: string | null
  lines: SheetLine[]
}

export interface SheetSplitLine { name: string, role: string | null, shareBp: number, member: boolean, confirmed: boolean }

export interface SheetModel {
  songId: string
  title: string
  crewName: string
  version: { id: string, number: number, draftId: string, draftName: string, createdAt: string }
  grid: Grid
  seal: { id: string, sealedAt: string, signers: Array<{ name: string, role: string }> } | null
  credits: { writers: string[], producers: string[] }
  sections: SheetSection[]
  /** Lines kept in the draft but marked out (not printed, not timed). */
  omitted: number
  split: { lines: SheetSplitLine[], totalBp: number } | null
  caution: string
}

/** Splits a line into spoken text and ad-libs (written in parentheses; an unclosed one runs to the end). */
export function adlibSegments(text: string): Segment[] {
  const out: Segment[] = []
  let last = 0
  for (const m of text.matchAll(/\([^)]*\)?/g)) {
    if (m.index > last) out.push({ text: text.slice(last, m.index), adlib: false })
    out.push({ text: m[0], adlib: true })
    last = m.index + m[0].length
  }
  if (last < text.length) out.push({ text: text.slice(last), adlib: false })
  return out
}

/** A line is performed unless it is marked out or has no words. */
export function isPerformed(line: Pick<LyricLine, 'text' | 'out'>): boolean {
  return !line.out && line.text.trim().length > 0
}

/**
 * Start and end of every performed line. Lines sharing a bar divide it equally; a line runs
 * from its start to the next performed line's start, and no further than its own bars reach
 * (so open bars for the beat show no words).
 */
export function timeLines(grid: Grid, lines: readonly LyricLine[]): Map<string, { startMs: number, endMs: number }> {
  const performed = lines.map((l, i) => ({ l, i })).filter(x => isPerformed(x.l))
    .sort((a, b) => a.l.bar - b.l.bar || a.i - b.i).map(x => x.l)
  const countInBar = new Map<number, number>()
  for (const l of performed) countInBar.set(l.bar, (countInBar.get(l.bar) ?? 0) + 1)
  const seen = new Map<number, number>()
  const starts: ExactMs[] = []
  const ownEnds: ExactMs[] = []
  for (const l of performed) {
    const part = seen.get(l.bar) ?? 0
    const parts = countInBar.get(l.bar)!
    seen.set(l.bar, part + 1)
    starts.push(lyricBarStartExact(grid, l.bar, part, parts))
    ownEnds.push(part + 1 < parts ? lyricBarStartExact(grid, l.bar, part + 1, parts) : lyricBarStartExact(grid, l.bar + (l.bars ?? 1)))
  }
  const out = new Map<string, { startMs: number, endMs: number }>()
  performed.forEach((l, k) => {
    const next = starts[k + 1]
    const end = next && exactBefore(next, ownEnds[k]!) ? next : ownEnds[k]!
    out.set(l.id, { startMs: roundMs(starts[k]!), endMs: roundMs(end) })
  })
  return out
}

const KIND_LABELS: Record<string, string> = { 'intro': 'Intro', 'verse': 'Verse', 'hook': 'Hook', 'pre-hook': 'Pre-hook', 'bridge': 'Bridge', 'break': 'Break', 'outro': 'Outro' }

/** The sections of a document with their performed, timed lines; loose lines form unnamed runs. */
export function sheetSections(doc: LyricDoc, lines: readonly LyricLine[], grid: Grid): { sections: SheetSection[], omitted: number } {
  const times = timeLines(grid, lines)
  const byId = new Map(lines.map(l => [l.id, l]))
  const sections: SheetSection[] = []
  let omitted = 0
  for (const block of doc.content ?? []) {
    const heading = block.attrs.label?.trim() || (block.attrs.kind ? (KIND_LABELS[block.attrs.kind] ?? block.attrs.kind) : null)
    const sheetLines: SheetLine[] = []
    for (const node of block.content ?? []) {
      const line = byId.get(node.attrs.lineId)
      if (!line) continue
      if (line.out) omitted++
      const t = times.get(line.id)
      if (!t) continue
      const segments = adlibSegments(line.text)
      sheetLines.push({
        id: line.id, bar: line.bar, bars: line.bars ?? 1, text: line.text, segments,
        adlibOnly: segments.every(s => s.adlib || !s.text.trim()), ...t,
      })
    }
    if (!sheetLines.length && !heading) continue
    const last = sections.at(-1)
    if (!heading && last && !last.heading) last.lines.push(...sheetLines)
    else sections.push({ kind: block.attrs.kind, heading, lines: sheetLines })
  }
  return { sections: sections.filter(s => s.lines.length), omitted }
}

export const sealDate = (iso: string) => iso.slice(0, 10)

/** "version 3, sealed 2026-05-02" or "version 3 (draft, not sealed)". */
export function versionLabel(model: Pick<SheetModel, 'version' | 'seal'>): string {
  return model.seal ? `version ${model.version.number}, sealed ${sealDate(model.seal.sealedAt)}` : `version ${model.version.number} (not sealed)`
}

export function creditLine(model: Pick<SheetModel, 'credits'>): string {
  const parts: string[] = []
  if (model.credits.writers.length) parts.push(`Written by ${model.credits.writers.join(', ')}`)
  if (model.credits.producers.length) parts.push(`Produced by ${model.credits.producers.join(', ')}`)
  return parts.join(' · ')
}

export function gridLine(grid: Grid): string {
  return `${grid.bpm} BPM · ${grid.beatsPerBar} beats per bar${grid.feel === 'half' ? ' · half-time feel' : ''} · bar 1 at ${(grid.offsetMs / 1000).toFixed(3)} s`
}

// "-->" ends a cue's timing line and may not appear in headers, notes or identifiers (W3C WebVTT §4).
const noArrow = (s: string) => s.replace(/-->/g, '→').replace(/[\r\n]+/g, ' ')
const cueText = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;')

/** WebVTT of the performed lines, one cue each, in time order. */
export function renderVtt(model: SheetModel): string {
  const cues = model.sections.flatMap(s => s.lines.map(l => ({ ...l, section: s.heading })))
    .sort((a, b) => a.startMs - b.startMs || a.bar - b.bar)
  const out = [
    `WEBVTT - ${noArrow(model.title)}, ${versionLabel(model)}`,
    '',
    'NOTE',
    noArrow(`Barsmith final sheet of "${model.title}" by ${model.crewName}, ${versionLabel(model)}.`),
    noArrow(`Timed from the grid: ${gridLine(model.grid)}.`),
    '',
  ]
  for (const c of cues) {
    out.push(noArrow(`bar ${c.bar} ${c.id}`), `${formatClock(c.startMs, true)} --> ${formatClock(c.endMs, true)}`, cueText(c.text.trim()), '')
  }
  return out.join('\n')
}

/** The sheet as plain text: bar numbers and times in the margin, ad-libs as written. */
export function renderText(model: SheetModel): string {
  const out = [model.title, `${model.crewName} — ${versionLabel(model)}`]
  const credits = creditLine(model)
  if (credits) out.push(credits)
  out.push(gridLine(model.grid), '')
  for (const s of model.sections) {
    if (s.heading) out.push(`[${s.heading.toUpperCase()}]`)
    for (const l of s.lines) {
      out.push(`${String(l.bar).padStart(4)}  ${formatMinutes(l.startMs).padStart(5)}  ${l.text.trim()}`)
      if (l.cadence) out.push(`${' '.repeat(13)}${l.cadence}`)
    }
    out.push('')
  }
  if (model.split?.lines.length) {
    out.push('SPLIT SHEET')
    for (const l of model.split.lines) out.push(`  ${l.name}${l.role ? ` (${l.role})` : ''}  ${formatShare(l.shareBp)} %${l.member ? (l.confirmed ? '  confirmed' : '  not yet confirmed') : ''}`)
    out.push(`  Total ${formatShare(model.split.totalBp)} %`, `  ${model.caution}`, '')
  }
  if (model.seal) out.push(`Signed off by ${model.seal.signers.map(s => s.name).join(', ')}.`)
  return `${out.join('\n').trimEnd()}\n`
}
