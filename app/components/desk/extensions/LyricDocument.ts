import { Node } from '@tiptap/core'

/** The top node of a lyric document: one or more section blocks (doc > block+). */
export const LyricDocument = Node.create({
  name: 'doc',
  topNode: true,
  content: 'block+',
})
