/**
 * The lyric document: how a draft is stored (TipTap/ProseMirror JSON) and the flat list of
 * lines derived from it, which alts, diffs, analysis and exports point at by line id.
 *
 *   doc > block+            a block is a song section (sectionId set) or loose lines (null)
 *   block > line*           attrs: lineId (stable), bar (1-based lyric bar), bars (span), out
 *   line > text*            plain text; ad-libs are written in parentheses inside the text
 */

export interface LyricLine {
  id: string
  bar: number
  text: string
  /** How many bars the line holds (default 1). */
  bars?: number
  /** Kept in the draft but not performed: left out of counts and exports. */
  out?: boolean
}

export interface SectionRef {
  id: string
  kind: string
  label?: string | null
  startBar: number
  endBar: number
}

export interface TextNode { type: 'text', text: string, marks?: unknown[] }
export interface LineNode { type: 'line', attrs: { lineId: string, bar: number, bars: number, out: boolean }, content?: TextNode[] }
export interface BlockNode { type: 'block', attrs: { sectionId: string | null, kind: string | null, label: string | null }, content?: LineNode[] }
export interface LyricDoc { type: 'doc', content: BlockNode[] }

export const LINE_ID_PATTERN = /^[\w-]{1,64}$/

/** A new line id: 12 url-safe characters, unique enough for lines within a song. */
export function newLineId(): string {
  const alphabet = '0123456789abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ'
  const bytes = new Uint8Array(12)
  globalThis.crypto.getRandomValues(bytes)
  return `l${Array.from(bytes, b => alphabet[b % alphabet.length]).join('')}`
}

function lineText(node: LineNode): string {
  return (node.content ?? []).map(t => (t.type === 'text' ? t.text : '')).join('')
}

/** The lines of a document, in document order. */
export function linesFromDoc(doc: LyricDoc): LyricLine[] {
  const lines: LyricLine[] = []
  for (const block of doc.content ?? []) {
    for (const node of block.content ?? []) {
      if (node.type !== 'line') continue
      const line: LyricLine = { id: node.attrs.lineId, bar: node.attrs.bar, text: lineText(node) }
      if (node.attrs.bars && node.attrs.bars !== 1) line.bars = node.attrs.bars
      if (node.attrs.out) line.out = true
      lines.push(line)
    }
  }
  return lines
}

/** The section a bar falls in, if any. */
export function sectionOfBar(sections: readonly SectionRef[], bar: number): SectionRef | undefined {
  return sections.find(s => bar >= s.startBar && bar <= s.endBar)
}

function lineNode(line: LyricLine): LineNode {
  const node: LineNode = { type: 'line', attrs: { lineId: line.id, bar: line.bar, bars: line.bars ?? 1, out: !!line.out } }
  if (line.text) node.content = [{ type: 'text', text: line.text }]
  return node
}

/**
 * A document for `lines` (kept in their order), grouped into one block per run of lines that
 * fall in the same song section; lines outside every section form loose blocks.
 */
export function docFromLines(lines: readonly LyricLine[], sections: readonly SectionRef[] = []): LyricDoc {
  const content: BlockNode[] = []
  for (const line of lines) {
    const section = sectionOfBar(sections, line.bar)
    const last = content.at(-1)
    if (last && last.attrs.sectionId === (section?.id ?? null)) {
      last.content!.push(lineNode(line))
      continue
    }
    content.push({
      type: 'block',
      attrs: { sectionId: section?.id ?? null, kind: section?.kind ?? null, label: section?.label ?? null },
      content: [lineNode(line)],
    })
  }
  return { type: 'doc', content }
}

/** True when two line lists say the same thing (ids, bars, spans, out marks and text). */
export function sameLines(a: readonly LyricLine[], b: readonly LyricLine[]): boolean {
  if (a.length !== b.length) return false
  return a.every((l, i) => {
    const m = b[i]!
    return l.id === m.id && l.bar === m.bar && l.text === m.text && (l.bars ?? 1) === (m.bars ?? 1) && !!l.out === !!m.out
  })
}

/** The last bar any line reaches (a line spanning two bars from bar 7 reaches bar 8). */
export function lastBarOf(lines: readonly LyricLine[]): number {
  return lines.reduce((max, l) => Math.max(max, l.bar + (l.bars ?? 1) - 1), 0)
}
