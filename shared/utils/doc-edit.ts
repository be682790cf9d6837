import type { LyricDoc } from './lyric-doc'

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
