import Text from '@tiptap/extension-text'
import { UndoRedo } from '@tiptap/extensions'
import { AdlibMarks } from './AdlibMarks'
import { BarLine } from './BarLine'
import { LyricDocument } from './LyricDocument'
import { StableLineIds } from './StableLineIds'
import { SectionBlock } from './SectionBlock'

export { AdlibMarks, BarLine, LyricDocument, SectionBlock, StableLineIds }
export { RhymeMarks, type LineMarks, type WordMark } from './RhymeMarks'
export { docLines } from './BarLine'

/** The extensions that make up the stored lyric document's schema and editing rules. */
export const lyricSchemaExtensions = [LyricDocument, SectionBlock, BarLine, Text, StableLineIds, AdlibMarks]
export { UndoRedo }
