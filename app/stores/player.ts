import { barRangeMs, DEFAULT_GRID, positionAt, type Grid, type GridPosition } from '~~/shared/utils/grid'

/**
 * What actually makes sound. The beat lane (components/beat/BeatLane.client.vue) registers
 * one with `attach`; anything else (the lyric desk, a keyboard shortcut) drives playback
 * through the store's actions, never through wavesurfer directly.
 */
export interface PlayerEngine {
  play(): void | Promise<void>
  pause(): void
  /** Jump to `seconds` into the audio. */
  seekTo(seconds: number): void
}

/** A loop over project bars, both ends included. */
export interface LoopRange { startBar: number, endBar: number, label?: string }

/**
 * The player: one per page, shared by the beat lane and the lyric desk.
 *
 * State: `positionS` (seconds into the audio), `playing`, `durationS`, `grid`, `loop`.
 * Derived: `position` (bar, beat, lyric bar at the playhead), `currentBar`, `loopSeconds`.
 * Actions: `play`, `pause`, `toggle`, `seek(seconds)`, `playFromBar(bar)`,
 * `setLoop({ startBar, endBar })`, `clearLoop`. The engine reports back with `report`;
 * the store wraps the playhead to the loop start when it passes the loop end.
 */
export const usePlayerStore = defineStore('player', () => {
  const engine = shallowRef<PlayerEngine | null>(null)
  const positionS = ref(0)
  const durationS = ref(0)
  const playing = ref(false)
  const grid = ref<Grid>({ ...DEFAULT_GRID })
  const loop = ref<LoopRange | null>(null)
  /** How many times the playhead went back to the loop start (tests and the UI read it). */
  const loopWraps = ref(0)

  const position = computed<GridPosition>(() => positionAt(grid.value, positionS.value * 1000))
  const currentBar = computed(() => position.value.bar)
  /** Whether the beat lane has an engine attached, so play does something. */
  const ready = computed(() => !!engine.value)
  const loopSeconds = computed(() => {
    if (!loop.value) return null
    const { startMs, endMs } = barRangeMs(grid.value, loop.value.startBar, loop.value.endBar)
    return { start: startMs / 1000, end: Math.min(endMs / 1000, durationS.value || Infinity) }
  })

  function attach(e: PlayerEngine, duration: number) {
    engine.value = e
    durationS.value = duration
  }
  function detach(e: PlayerEngine) {
    if (engine.value !== e) return
    engine.value = null
    playing.value = false
  }
  function setGrid(g: Grid) {
    grid.value = { ...g }
  }

  /** Called by the engine on every time update. */
  function report(seconds: number, isPlaying: boolean) {
    playing.value = isPlaying
    const l = loopSeconds.value
    if (l && isPlaying && (seconds >= l.end || seconds < l.start - 0.25)) {
      loopWraps.value++
      positionS.value = l.start
      engine.value?.seekTo(l.start)
      return
    }
    // A seek lands on the nearest decoded frame, a few ms before the loop start at times:
    // show the loop's first bar, not the end of the bar before it.
    positionS.value = l && isPlaying && seconds < l.start ? l.start : seconds
  }

  async function play() {
    const l = loopSeconds.value
    if (l && (positionS.value < l.start || positionS.value >= l.end)) seek(l.start)
    await engine.value?.play()
  }
  function pause() {
    engine.value?.pause()
  }
  async function toggle() {
    if (playing.value) pause()
    else await play()
  }
  function seek(seconds: number) {
    const s = Math.max(0, Math.min(seconds, durationS.value || seconds))
    positionS.value = s
    engine.value?.seekTo(s)
  }
  /** Moves the playhead to the start of project bar `bar` and plays. */
  async function playFromBar(bar: number) {
    const { startMs } = barRangeMs(grid.value, bar, bar)
    seek(Math.max(0, startMs / 1000))
    await engine.value?.play()
  }
  function setLoop(range: LoopRange) {
    const startBar = Math.min(range.startBar, range.endBar)
    const endBar = Math.max(range.startBar, range.endBar)
    loop.value = { ...range, startBar, endBar }
    loopWraps.value = 0
  }
  function clearLoop() {
    loop.value = null
  }

  return {
    engine, positionS, durationS, playing, grid, loop, loopWraps, position, currentBar, loopSeconds,
    ready, attach, detach, setGrid, report, play, pause, toggle, seek, playFromBar, setLoop, clearLoop,
  }
})
