import { Extension } from '@tiptap/core'
import { Plugin, PluginKey } from '@tiptap/pm/state'
import { Decoration, DecorationSet } from '@tiptap/pm/view'
import { adlibRanges } from '../../../../shared/utils/desk-lines'
import { docLines } from './BarLine'

/** Ad-libs (text in parentheses) drawn apart, as decorations: the stored text stays plain. */
export const AdlibMarks = Extension.create({
  name: 'adlibMarks',
  addProseMirrorPlugins() {
    return [new Plugin({
      key: new PluginKey('adlibMarks'),
      props: {
        decorations(state) {
          const decos: Decoration[] = []
          for (const { pos, line } of docLines(state.doc)) {
            for (const [from, to] of adlibRanges(line.text)) decos.push(Decoration.inline(pos + 1 + from, pos + 1 + to, { class: 'desk-adlib' }))
          }
          return DecorationSet.create(state.doc, decos)
        },
      },
    })]
  },
})
