import { mergeAttributes, Node } from '@tiptap/core'
import { TextSelection } from '@tiptap/pm/state'
import type { Node as PmNode } from '@tiptap/pm/model'
import { barForNewLine, MAX_SPAN, movedBar } from '../../../../shared/utils/desk-lines'
import { newLineId, type LyricLine } from '../../../../shared/utils/lyric-doc'

declare module '@tiptap/core' {
  interface Commands<ReturnType> {
    barLine: {
      /** Moves the line at the cursor by `delta` bars (1…9999). */
      moveLineBar: (delta: number) => ReturnType
      /** Sets the bar of the line at the cursor. */
      setLineBar: (bar: number) => ReturnType
      /** Sets how many bars the line at the cursor holds (1 or 2). */
      setLineSpan: (bars: number) => ReturnType
      /** Marks the line at the cursor out (kept in the draft, not performed) or back in. */
      setLineOut: (out: boolean) => ReturnType
      /** Starts a new line after the cursor, on the next free bar. */
      startLine: () => ReturnType
    }
  }
}

/** Every line of a ProseMirror document with its position, in document order. */
export function docLines(doc: PmNode): Array<{ pos: number, node: PmNode, line: LyricLine }> {
  const out: Array<{ pos: number, node: PmNode, line: LyricLine }> = []
  doc.descendants((node, pos) => {
    if (node.type.name === 'line') {
      out.push({ pos, node, line: { id: node.attrs.lineId, bar: node.attrs.bar, bars: node.attrs.bars, text: node.textContent } })
      return false
    }
    return node.type.name === 'doc' || node.type.name === 'block'
  })
  return out
}

/**
 * A lyric line anchored to a bar: `lineId` is stable (kept on edits, renewed only for the copy
 * after a split or a paste, see StableLineIds), `bar` is the 1-based lyric bar, `bars` 1 or 2,
 * `out` keeps the line but leaves it out of counts. Text only; ad-libs are written in parentheses.
 */
export const BarLine = Node.create({
  name: 'line',
  content: 'text*',
  marks: '',
  defining: true,
  addAttributes() {
    return {
      lineId: { default: null, parseHTML: el => el.getAttribute('data-line-id'), renderHTML: a => ({ 'data-line-id': a.lineId }) },
      bar: { default: 1, parseHTML: el => Number(el.getAttribute('data-bar')) || 1, renderHTML: a => ({ 'data-bar': a.bar }) },
      bars: { default: 1, parseHTML: el => Number(el.getAttribute('data-bars')) || 1, renderHTML: a => ({ 'data-bars': a.bars }) },
      out: { default: false, parseHTML: el => el.getAttribute('data-out') === 'true', renderHTML: a => ({ 'data-out': String(!!a.out) }) },
    }
  },
  parseHTML() {
    return [{ tag: 'p[data-line-id]' }, { tag: 'p' }]
  },
  renderHTML({ HTMLAttributes }) {
    return ['p', mergeAttributes(HTMLAttributes, { class: 'desk-line' }), 0]
  },
  addCommands() {
    const lineAtCursor = (state: { selection: { $from: { depth: number, node: (d: number) => PmNode, before: (d: number) => number } } }) => {
      const $from = state.selection.$from
      for (let d = $from.depth; d > 0; d--) {
        if ($from.node(d).type.name === 'line') return { node: $from.node(d), pos: $from.before(d) }
      }
      return null
    }
    return {
      moveLineBar: delta => ({ state, tr, dispatch }) => {
        const at = lineAtCursor(state)
        if (!at) return false
        if (dispatch) tr.setNodeMarkup(at.pos, undefined, { ...at.node.attrs, bar: movedBar(at.node.attrs.bar, delta) })
        return true
      },
      setLineBar: bar => ({ state, tr, dispatch }) => {
        const at = lineAtCursor(state)
        if (!at) return false
        if (dispatch) tr.setNodeMarkup(at.pos, undefined, { ...at.node.attrs, bar: movedBar(bar, 0) })
        return true
      },
      setLineSpan: bars => ({ state, tr, dispatch }) => {
        const at = lineAtCursor(state)
        if (!at) return false
        if (dispatch) tr.setNodeMarkup(at.pos, undefined, { ...at.node.attrs, bars: Math.max(1, Math.min(MAX_SPAN, Math.round(bars))) })
        return true
      },
      setLineOut: out => ({ state, tr, dispatch }) => {
        const at = lineAtCursor(state)
        if (!at) return false
        if (dispatch) tr.setNodeMarkup(at.pos, undefined, { ...at.node.attrs, out })
        return true
      },
      startLine: () => ({ state, tr, dispatch }) => {
        const at = lineAtCursor(state)
        if (!at) return false
        const lines = docLines(state.doc)
        const index = lines.findIndex(l => l.pos === at.pos)
        const { $from, $to } = state.selection
        if (!dispatch) return true
        if (!state.selection.empty) tr.deleteSelection()
        const cursor = tr.mapping.map($from.pos)
        const startOfLine = at.pos + 1
        const type = state.schema.nodes.line!
        if ($from.pos === startOfLine && $to.pos === startOfLine && at.node.content.size > 0) {
          // At the start of a written line: an empty line goes in before it, sharing its bar, and the text keeps its id.
          tr.insert(at.pos, type.create({ lineId: newLineId(), bar: at.node.attrs.bar, bars: 1, out: false }))
          tr.setSelection(TextSelection.create(tr.doc, tr.mapping.map(startOfLine)))
          return true
        }
        // Elsewhere: the text after the cursor moves to a new line (a new id) on the next free bar.
        const bar = barForNewLine(lines.map(l => l.line), index)
        tr.split(cursor, 1, [{ type, attrs: { lineId: newLineId(), bar, bars: 1, out: false } }])
        return true
      },
    }
  },
  addKeyboardShortcuts() {
    return {
      'Enter': () => this.editor.commands.startLine(),
      'Alt-ArrowUp': () => this.editor.commands.moveLineBar(-1),
      'Alt-ArrowDown': () => this.editor.commands.moveLineBar(1),
      'Alt-Shift-ArrowRight': () => this.editor.commands.setLineSpan(2),
      'Alt-Shift-ArrowLeft': () => this.editor.commands.setLineSpan(1),
    }
  },
})
