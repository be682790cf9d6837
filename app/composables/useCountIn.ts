/**
 * One bar of clicks before playback (Web Audio, no file): the first beat higher, the rest
 * lower, at the song's tempo. Resolves when the bar is over.
 */
export function useCountIn() {
  let ctx: AudioContext | null = null
  async function countIn(grid: { bpm: number, beatsPerBar: number }): Promise<void> {
    ctx ??= new AudioContext()
    if (ctx.state === 'suspended') await ctx.resume()
    const beat = 60 / grid.bpm
    const t0 = ctx.currentTime + 0.05
    for (let i = 0; i < grid.beatsPerBar; i++) {
      const osc = ctx.createOscillator()
      const gain = ctx.createGain()
      osc.frequency.value = i === 0 ? 1500 : 1000
      // A short, quiet click: kept well below full scale.
      gain.gain.setValueAtTime(0.25, t0 + i * beat)
      gain.gain.exponentialRampToValueAtTime(0.001, t0 + i * beat + 0.05)
      osc.connect(gain).connect(ctx.destination)
      osc.start(t0 + i * beat)
      osc.stop(t0 + i * beat + 0.06)
    }
    await new Promise(r => setTimeout(r, (0.05 + beat * grid.beatsPerBar) * 1000))
  }
  onBeforeUnmount(() => void ctx?.close())
  return { countIn }
}
