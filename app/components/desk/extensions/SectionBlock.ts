import { mergeAttributes, Node } from '@tiptap/core'
import { sectionTitle } from '../../../../shared/utils/desk-lines'

/**
 * A block of lines: one of the song's sections (sectionId, kind, label) or loose lines (all null).
 * Its heading is drawn from the label by CSS so it is never part of the text.
 */
export const SectionBlock = Node.create({
  name: 'block',
  group: 'block',
  content: 'line+',
  defining: true,
  addAttributes() {
    return {
      sectionId: { default: null, parseHTML: el => el.getAttribute('data-section-id'), renderHTML: a => (a.sectionId ? { 'data-section-id': a.sectionId } : {}) },
      kind: { default: null, parseHTML: el => el.getAttribute('data-kind'), renderHTML: a => (a.kind ? { 'data-kind': a.kind } : {}) },
      label: { default: null, parseHTML: el => el.getAttribute('data-label'), renderHTML: a => (a.label || a.kind ? { 'data-label': sectionTitle(a.kind, a.label) } : {}) },
    }
  },
  parseHTML() {
    return [{ tag: 'section[data-desk-block]' }]
  },
  renderHTML({ HTMLAttributes }) {
    return ['section', mergeAttributes(HTMLAttributes, { 'data-desk-block': '', 'class': 'desk-block' }), 0]
  },
})
