import type { BlockNode, LineNode, LyricDoc, LyricLine } from './lyric-doc'

/**
 * A copy of `doc` with one line's text replaced (its marks dropped), or null when no line
 * has that id. Blocks, sections and the other lines stay as they are.
 */
export function replaceLineText(doc: LyricDoc, lineId: string, text: string): LyricDoc | null {
  let found = false
  const content = doc.content.map(block => ({
    ...block,
    content: block.content?.map((node) => {
      if (node.type !== 'line' || node.attrs.lineId !== lineId) return node
      found = true
      const { content: _old, ...rest } = node
      return text ? { ...rest, content: [{ type: 'text' as const, text }] } : rest
    }),
  }))
  return found ? { ...doc, content } : null
}

/**
 * A document for `lines` that keeps the sections of `previous`: each line stays in the
 * block it was in, a new line joins the block of the line before it. The lines come out in
 * the given order (`linesFromDoc` of the result equals `lines`).
 */
export function docWithLines(previous: LyricDoc | null | undefined, lines: readonly LyricLine[]): LyricDoc {
  const blocks = previous?.content ?? []
  const blockOf = new Map<string, number>()
  blocks.forEach((b, i) => b.content?.forEach(n => blockOf.set(n.attrs.lineId, i)))
  const content: BlockNode[] = []
  let at = blocks.length ? 0 : -1
  let lastAt: number | null = null
  for (const line of lines) {
    at = blockOf.get(line.id) ?? at
    const node: LineNode = { type: 'line', attrs: { lineId: line.id, bar: line.bar, bars: line.bars ?? 1, out: !!line.out } }
    if (line.text) node.content = [{ type: 'text', text: line.text }]
    if (lastAt !== at || !content.length) {
      const attrs = at >= 0 ? { ...blocks[at]!.attrs } : { sectionId: null, kind: null, label: null }
      content.push({ type: 'block', attrs, content: [] })
      lastAt = at
    }
    content.at(-1)!.content!.push(node)
  }
  return { type: 'doc', content }
}
