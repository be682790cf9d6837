import { Extension } from '@tiptap/core'
import { Plugin, PluginKey } from '@tiptap/pm/state'
import { idsToRenew } from '../../../../shared/utils/desk-lines'
import { LINE_ID_PATTERN, newLineId } from '../../../../shared/utils/lyric-doc'
import { docLines } from './BarLine'

export const stableLineIdsKey = new PluginKey('stableLineIds')

/**
 * Keeps line ids unique and stable: after any change, a line with no id, a malformed one, or
 * the same id as an earlier line (the copy a split or a paste makes) gets a new id; the first
 * holder always keeps its own, so alts and diffs keep pointing at the same line.
 */
export const StableLineIds = Extension.create({
  name: 'stableLineIds',
  addProseMirrorPlugins() {
    return [new Plugin({
      key: stableLineIdsKey,
      appendTransaction(transactions, _old, state) {
        if (!transactions.some(t => t.docChanged)) return null
        const lines = docLines(state.doc)
        const renew = idsToRenew(lines.map(l => l.node.attrs.lineId as string | null), LINE_ID_PATTERN)
        if (!renew.length) return null
        const tr = state.tr
        for (const i of renew) {
          const { pos, node } = lines[i]!
          tr.setNodeMarkup(pos, undefined, { ...node.attrs, lineId: newLineId() })
        }
        return tr.setMeta('addToHistory', false)
      },
    })]
  },
})
