/**
 * Marking lines out: the producer decides what is performed without touching a writer's
 * words. A change qualifies only when ids, order, bars, spans and text are all unchanged.
 */
import type { LyricDoc, LyricLine } from './lyric-doc'

export type OutChange
  = | { ok: true, marked: string[], restored: string[] }
    | { ok: false, message: string, lineId?: string }

/** Compares `next` with the head's `lines`: which lines go out, which come back, or why it is not an out-only change. */
export function outOnlyChange(head: readonly LyricLine[], next: readonly LyricLine[]): OutChange {
  if (head.length !== next.length) {
    return { ok: false, message: `Only out marks may change here: send the same ${head.length} lines as the newest version (got ${next.length}).` }
  }
  const marked: string[] = []
  const restored: string[] = []
  for (let i = 0; i < head.length; i++) {
    const h = head[i]!
    const n = next[i]!
    if (h.id !== n.id) return { ok: false, message: `Only out marks may change here: line ${i + 1} should be ${h.id}, in the same order.`, lineId: n.id }
    if (h.bar !== n.bar || (h.bars ?? 1) !== (n.bars ?? 1)) return { ok: false, message: `Only out marks may change here: the bar of line "${h.text.slice(0, 40)}" changed.`, lineId: h.id }
    if (h.text !== n.text) return { ok: false, message: `Only out marks may change here: the words of line "${h.text.slice(0, 40)}" changed. A writer edits words on the desk.`, lineId: h.id }
    if (!h.out && n.out) marked.push(h.id)
    if (h.out && !n.out) restored.push(h.id)
  }
  return { ok: true, marked, restored }
}

/** The head's document with each line's `out` attribute set from `lines` (blocks and text kept as they were). */
export function withOutMarks(doc: LyricDoc, lines: readonly LyricLine[]): LyricDoc {
  const out = new Map(lines.map(l => [l.id, !!l.out]))
  return {
    ...doc,
    content: doc.content.map(block => ({
      ...block,
      content: block.content?.map(node => (node.type === 'line' && out.has(node.attrs.lineId)
        ? { ...node, attrs: { ...node.attrs, out: out.get(node.attrs.lineId)! } }
        : node)),
    })),
  }
}

/** "Marked 2 lines out, brought 1 back" for the version note. */
export function outNote(change: { marked: string[], restored: string[] }): string {
  const n = (k: number) => `${k} line${k === 1 ? '' : 's'}`
  const parts: string[] = []
  if (change.marked.length) parts.push(`marked ${n(change.marked.length)} out`)
  if (change.restored.length) parts.push(`brought ${n(change.restored.length)} back in`)
  const text = parts.join(', ')
  return text.charAt(0).toUpperCase() + text.slice(1)
}
