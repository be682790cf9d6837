import type { CadenceTick } from '~~/shared/utils/cadence'

/** What the last play scheduled, read by the browser test (window.__barsmithCadence). */
export interface CadenceSchedule {
  /** AudioContext time (s) at which song time `startMs` sounds in the first pass. */
  contextStart: number
  startMs: number
  endMs: number
  loop: boolean
  /** Every scheduled tick: the slot's song time and the context time it was started at. */
  ticks: Array<{ lineId: string, index: number, slotMs: number, pass: number, at: number, scheduledAt: number }>
  beat: boolean
  /** The context's state when the first pass was scheduled (running means the clock moves). */
  state: AudioContextState
}

declare global {
  interface Window { __barsmithCadence?: Readonly<CadenceSchedule> }
}

// Pitches of the blip per stress: primary higher so the stresses stand out (a choice, not a rule).
const PITCH = { 0: 520, 1: 880, 2: 660 } as const
const LEAD_S = 0.12
const AHEAD_S = 1.5

/**
 * Plays a stretch of the beat with a short blip at each syllable's slot time, all scheduled
 * on the AudioContext clock (not timers), so the ticks sit on the grid whatever the page does.
 * Looping schedules each pass ahead of time.
 */
export function useCadencePlayer() {
  const playing = ref(false)
  const message = ref('')
  let ctx: AudioContext | null = null
  let beatBuffer: AudioBuffer | null = null
  let beatUrl: string | null = null
  let timer: ReturnType<typeof setInterval> | null = null
  let nodes: AudioScheduledSourceNode[] = []

  async function loadBeat(url: string | null) {
    if (!url || url === beatUrl || !ctx) return
    try {
      const bytes = await (await fetch(url, { credentials: 'same-origin' })).arrayBuffer()
      beatBuffer = await ctx.decodeAudioData(bytes)
      beatUrl = url
    }
    catch {
      message.value = 'The beat could not be decoded here; playing the ticks alone.'
      beatBuffer = null
    }
  }

  function stop() {
    if (timer) clearInterval(timer)
    timer = null
    for (const n of nodes) {
      try {
        n.stop()
      }
      catch { /* already stopped */ }
    }
    nodes = []
    playing.value = false
  }

  async function play(options: { ticks: CadenceTick[], startMs: number, endMs: number, loop: boolean, beatUrl: string | null }) {
    stop()
    message.value = ''
    ctx ??= new AudioContext()
    if (ctx.state === 'suspended') await ctx.resume()
    await loadBeat(options.beatUrl)
    const c = ctx
    const length = (options.endMs - options.startMs) / 1000
    const contextStart = c.currentTime + LEAD_S
    const schedule: CadenceSchedule = { contextStart, startMs: options.startMs, endMs: options.endMs, loop: options.loop, ticks: [], beat: !!beatBuffer, state: c.state }
    const passStart = (pass: number) => contextStart + pass * length
    const schedulePass = (pass: number) => {
      const at0 = passStart(pass)
      if (beatBuffer && options.startMs / 1000 < beatBuffer.duration) {
        const src = c.createBufferSource()
        src.buffer = beatBuffer
        src.connect(c.destination)
        src.start(at0, options.startMs / 1000, length)
        nodes.push(src)
      }
      for (const t of options.ticks) {
        const at = at0 + (t.slotMs - options.startMs) / 1000
        const osc = c.createOscillator()
        const gain = c.createGain()
        osc.frequency.value = PITCH[t.stress]
        gain.gain.setValueAtTime(0.25, at)
        gain.gain.exponentialRampToValueAtTime(0.001, at + 0.05)
        osc.connect(gain).connect(c.destination)
        osc.start(at)
        osc.stop(at + 0.06)
        nodes.push(osc)
        schedule.ticks.push({ lineId: t.lineId, index: t.index, slotMs: t.slotMs, pass, at, scheduledAt: c.currentTime })
      }
      window.__barsmithCadence = Object.freeze({ ...schedule, ticks: schedule.ticks.map(x => Object.freeze({ ...x })) })
    }
    let next = 0
    schedulePass(next++)
    playing.value = true
    timer = setInterval(() => {
      if (!options.loop) {
        if (c.currentTime > passStart(1)) stop()
        return
      }
      // Old nodes have finished: keep the list short on a long loop.
      nodes = nodes.slice(-4 * (options.ticks.length + 1))
      while (passStart(next) - c.currentTime < AHEAD_S) schedulePass(next++)
    }, 200)
  }

  onBeforeUnmount(() => {
    stop()
    void ctx?.close()
  })
  return { playing, message, play, stop }
}
