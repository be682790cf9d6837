import { Extension } from '@tiptap/core'
import { Plugin, PluginKey } from '@tiptap/pm/state'
import { Decoration, DecorationSet } from '@tiptap/pm/view'
import { docLines } from './BarLine'

/** One analysed word to mark: where it sits in its line's text as analysed. */
export interface WordMark {
  start: number
  end: number
  /** Gutter letter of its rhyme family, if any. */
  letter?: string
  /** Which of the drawn patterns the family gets (0…5). */
  pattern?: number
  kind?: 'perfect' | 'near' | 'multi'
  guessed?: boolean
}
export interface LineMarks { text: string, words: WordMark[] }

export const rhymeMarksKey = new PluginKey('rhymeMarks')

/**
 * Rhyme families and guessed words drawn on the words as decorations (never document marks):
 * each family has a letter (written after the word) and its own underline pattern, so it reads
 * without colour; a guessed word gets a dashed box. Marks apply only while the line's text is
 * still the one analysed; `editor.commands.refreshRhymeMarks()` redraws after an analysis.
 */
export const RhymeMarks = Extension.create<{ marksOf: (lineId: string) => LineMarks | undefined }>({
  name: 'rhymeMarks',
  addOptions() {
    return { marksOf: () => undefined }
  },
  addCommands() {
    return {
      refreshRhymeMarks: () => ({ tr, dispatch }) => {
        if (dispatch) tr.setMeta(rhymeMarksKey, true).setMeta('addToHistory', false)
        return true
      },
    }
  },
  addProseMirrorPlugins() {
    const marksOf = this.options.marksOf
    const build = (doc: Parameters<typeof docLines>[0]) => {
      const decos: Decoration[] = []
      for (const { pos, node, line } of docLines(doc)) {
        const marks = marksOf(node.attrs.lineId)
        if (!marks || marks.text !== line.text) continue
        for (const w of marks.words) {
          if (w.end > line.text.length || w.start >= w.end) continue
          const cls = [w.letter ? `desk-rhyme desk-rhyme-${w.pattern ?? 0}` : '', w.guessed ? 'desk-guess' : ''].filter(Boolean).join(' ')
          if (!cls) continue
          decos.push(Decoration.inline(pos + 1 + w.start, pos + 1 + w.end, {
            class: cls,
            ...(w.letter ? { 'data-family': w.letter } : {}),
            ...(w.guessed ? { 'data-guess': 'true' } : {}),
          }))
        }
      }
      return DecorationSet.create(doc, decos)
    }
    return [new Plugin({
      key: rhymeMarksKey,
      state: {
        init: (_, state) => build(state.doc),
        apply: (tr, set, _old, state) => (tr.getMeta(rhymeMarksKey) || tr.docChanged ? build(state.doc) : set),
      },
      props: { decorations: state => rhymeMarksKey.getState(state) },
    })]
  },
})

declare module '@tiptap/core' {
  interface Commands<ReturnType> {
    rhymeMarks: { refreshRhymeMarks: () => ReturnType }
  }
}
