import { z } from 'zod'

/** GET /api/songs/:songId/vocal-map: one draft (default: the main draft), optionally compared with a second. */
export const VocalMapQuerySchema = z.object({
  draftId: z.uuid({ error: 'draftId must be a draft id (?draftId=<draft id>).' }).optional(),
  compare: z.uuid({ error: 'compare must be a draft id (?compare=<draft id>).' }).optional(),
}).refine(q => !q.compare || q.compare !== q.draftId, { path: ['compare'], message: 'Compare the draft with a different draft.' })

/** What a bar carries, from what is performed there. */
export type BarState = 'vocals' | 'adlibs' | 'alts' | 'open'

/**
 * How packed a bar is, in sung syllables per second (4/4: syllables per bar × BPM / 240):
 * 0 nothing sung; 1 up to conversational pace; 2 up to read speech; 3 dense; 4 over-packed.
 */
export type DensityGrade = 0 | 1 | 2 | 3 | 4

export interface MapLine {
  id: string
  text: string
  /** First lyric bar and how many it holds. */
  bar: number
  bars: number
  out: boolean
  /** Only ad-libs (in parentheses): performed, counted apart. */
  adlibOnly: boolean
  /** Open alts proposed for this line. */
  openAlts: number
}

export interface MapBar {
  /** Lyric bar (one per two project bars under a half-time feel). */
  bar: number
  /** First project bar of this lyric bar (the beat room's numbering). */
  projectBar: number
  startMs: number
  endMs: number
  /** Row (section or stretch between sections) the bar belongs to. */
  rowId: string
  state: BarState
  /** Sung syllables of performed lines (a line over two bars shares its syllables between them). */
  syllables: number
  adlibSyllables: number
  syllablesPerSecond: number
  density: DensityGrade
  /** Every line on the bar, out ones included (shown apart, never counted). */
  lines: MapLine[]
  outLines: number
  openAlts: number
}

export interface MapRow {
  id: string
  /** The section's id; null for bars between (or after) sections. */
  sectionId: string | null
  kind: string | null
  title: string
  startBar: number
  endBar: number
  totals: MapTotals
}

export interface MapTotals {
  bars: number
  barsWithVocals: number
  barsAdlibsOnly: number
  barsAltsOnly: number
  barsOpen: number
  /** Performed lines starting in the stretch (out lines and empty lines are not counted). */
  lines: number
  outLines: number
  syllables: number
  /** Sung syllables ÷ bars of the stretch. */
  averageSyllablesPerBar: number | null
  /** Sung syllables ÷ bars carrying vocals. */
  averageSyllablesPerVocalBar: number | null
  /** Malmi et al. (KDD 2016) rhyme density of the stretch's performed lines; null with fewer than two words. */
  rhymeDensity: number | null
}

export interface VocalMapDraftRef { id: string, name: string, isMain: boolean, versionId: string | null, versionNumber: number | null }

export interface VocalMap {
  grid: { bpm: number, beatsPerBar: number, offsetMs: number, feel: 'normal' | 'half' }
  bars: MapBar[]
  rows: MapRow[]
  totals: MapTotals
  /** Where the thresholds of the density grades come from. */
  densityScale: Array<{ grade: DensityGrade, label: string, upToPerSecond: number | null, source: string }>
  rhymeDensityDefinition: string
}

export interface VocalMapResponse extends VocalMap {
  /** The draft shown; null while the song has none. */
  draft: VocalMapDraftRef | null
  drafts: VocalMapDraftRef[]
  /** The bar the beat ends in (lyric bars), when the song has an analysed beat. */
  beatBars: number | null
  compare: null | {
    draft: VocalMapDraftRef
    bars: Array<Pick<MapBar, 'bar' | 'state' | 'syllables' | 'density'> & { texts: string[] }>
    /** Lyric bars whose performed words or state differ between the two drafts. */
    differingBars: number[]
  }
}
