import type { LineMarks } from '~/components/desk/extensions'

/** What a line's row shows beside its text: the engine's figures for the line as analysed. */
export interface LineFigures {
  text: string
  syllables: number
  syllablesMin: number
  syllablesMax: number
  adlibSyllables: number
  stress: string
  letters: string[]
  guessed: string[]
  words: Array<{ text: string, stress: string, syllables: number, source: string, isAdlib: boolean }>
}
export interface BarFigures { bar: number, syllables: number, lineCount: number, syllablesPerBeat?: number, dense?: boolean, overPacked?: boolean }

/**
 * The reactive bridge between the desk page and the editor's line rows (node views): the rows
 * read figures and the playing bar from it, and call back to play, teach and open alts.
 */
export interface DeskView {
  figures: (lineId: string) => LineFigures | undefined
  barFigures: (bar: number) => BarFigures | undefined
  marksOf: (lineId: string) => LineMarks | undefined
  openAlts: (lineId: string) => number
  playingBar: number | null
  showStress: boolean
  canPlay: boolean
  playFrom: (bar: number) => void
  teach: (word: string) => void
  showAlts: (lineId: string) => void
}
