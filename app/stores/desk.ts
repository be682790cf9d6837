/**
 * The lyric desk's own state (client only, never server rows): which side panel is open,
 * the line the cursor is on, the editor preferences (count-in, follow-along, stress shown)
 * and the word waiting to be taught. Playback position and the loop live in the player store.
 */
export type DeskPanel = 'line' | 'rhymes' | 'takes'

export const useDeskStore = defineStore('desk', () => {
  const panel = ref<DeskPanel>('line')
  /** The line the cursor is on, and its bar. */
  const currentLineId = ref<string | null>(null)
  const currentBar = ref<number | null>(null)
  /** One bar of clicks before playback starts (common practice for a count-in). */
  const countIn = ref(false)
  /** Scroll the playing bar's lines into view while the beat plays. */
  const followAlong = ref(true)
  /** Show every line's stress pattern beside its count, not only the current one's. */
  const showStress = ref(false)
  /** The word "teach this word" is open for, in the side panel. */
  const teachWord = ref<string | null>(null)
  /** The words the rhyme finder was opened for, and where they sit in the editor. */
  const rhymeFor = ref<{ text: string, from: number, to: number } | null>(null)

  function setCursor(lineId: string | null, bar: number | null) {
    currentLineId.value = lineId
    currentBar.value = bar
  }
  function openTeach(word: string) {
    teachWord.value = word
    panel.value = 'line'
  }
  function openRhymes(range: { text: string, from: number, to: number }) {
    rhymeFor.value = range
    panel.value = 'rhymes'
  }

  return { panel, currentLineId, currentBar, countIn, followAlong, showStress, teachWord, rhymeFor, setCursor, openTeach, openRhymes }
})
