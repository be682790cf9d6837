// Beat ingest: decode + peaks + tempo + bar 1 for a 4-minute 44.1 kHz stereo WAV and the same
// as MP3 (each in a fresh process, so peak RSS is the ingest's own), and tempo estimation
// beside the general-purpose `music-tempo` package on the synthesized test set.
// Figures are printed and written to bench/out/beats.json; nothing is asserted.
import { execFileSync, spawnSync } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { createRequire } from 'node:module'
import { root } from '../scripts/lib/paths.mjs'
import { audioModules } from './lib/audio-bundle.mjs'

const outDir = resolve(root, 'bench/out')
mkdirSync(outDir, { recursive: true })
const bundle = await audioModules()
const audio = await import(bundle)
const MusicTempo = createRequire(import.meta.url)('music-tempo')

// --- ingest -----------------------------------------------------------------------------
const wavPath = resolve(outDir, '.cache/four-minutes.wav')
const mp3Path = resolve(outDir, '.cache/four-minutes.mp3')
{
  // 90 BPM × 90 bars = 240 s (invented loop).
  const beat = audio.synthBeat({ bpm: 90, bars: 90, leadInMs: 500, seed: 4, channels: 2, sampleRate: 44_100 })
  writeFileSync(wavPath, audio.encodeWav16(beat.channelData, beat.sampleRate))
  execFileSync('lame', ['--quiet', '-b', '192', wavPath, mp3Path])
}

function ingest(path, format) {
  const script = `
    import { readFileSync } from 'node:fs'
    const audio = await import(${JSON.stringify(bundle)})
    const t0 = performance.now()
    const bytes = readFileSync(${JSON.stringify(path)})
    const a = await audio.analyseFile(bytes, ${JSON.stringify(format)})
    const wallMs = performance.now() - t0
    console.log(JSON.stringify({ wallMs, maxRssMb: process.resourceUsage().maxRSS / 1024, bpm: a.bpm, offsetMs: a.offsetMs, durationMs: a.durationMs, fileMb: bytes.length / 1048576 }))
  `
  const res = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8' })
  if (res.status !== 0) throw new Error(res.stderr)
  return JSON.parse(res.stdout.trim().split('\n').pop())
}

const runs = 3
const ingestRows = []
for (const [label, path, format] of [['WAV 4 min 44.1 kHz stereo', wavPath, 'wav'], ['MP3 192 kb/s, same audio', mp3Path, 'mp3']]) {
  const all = Array.from({ length: runs }, () => ingest(path, format))
  const best = all.reduce((a, b) => (a.wallMs < b.wallMs ? a : b))
  ingestRows.push({ label, format, runs, wallMsBest: Math.round(best.wallMs), wallMsMedian: Math.round(all.map(r => r.wallMs).sort((a, b) => a - b)[1]), maxRssMb: Math.round(Math.max(...all.map(r => r.maxRssMb))), fileMb: Math.round(best.fileMb * 10) / 10, bpm: best.bpm, offsetMs: best.offsetMs })
}

// --- tempo beside music-tempo --------------------------------------------------------------
// Gouyon et al. 2006 (ISMIR 2004 / MIREX conventions): Acc1 ±4 % of the truth; Acc2 also × 2, 3, ½, ⅓.
const acc1 = (e, t) => Math.abs(e - t) <= 0.04 * t
const acc2 = (e, t) => [1, 2, 3, 1 / 2, 1 / 3].some(k => acc1(e, t * k))
const cases = []
for (const bpm of [70, 85, 93, 120, 140, 160]) {
  for (const swing of [0, 1 / 3]) {
    cases.push({ bpm, bars: 16, swing, seed: bpm + (swing ? 1 : 0), leadInMs: 350 + (bpm % 7) * 180, pattern: bpm >= 120 ? 'backbeat' : 'boombap', hatsPerBeat: bpm <= 85 ? 4 : 2 })
  }
}
const tempoRows = []
for (const c of cases) {
  const beat = audio.synthBeat(c)
  const mono = new Float32Array(beat.channelData[0].length)
  for (const ch of beat.channelData) for (let i = 0; i < mono.length; i++) mono[i] += ch[i] / beat.channelData.length
  let t0 = performance.now()
  const ours = await audio.analyseDecoded(beat)
  const oursMs = performance.now() - t0
  t0 = performance.now()
  let theirs
  try {
    theirs = Number(new MusicTempo(mono).tempo)
  }
  catch {
    theirs = Number.NaN
  }
  const theirsMs = performance.now() - t0
  tempoRows.push({
    truth: c.bpm, swing: c.swing ? 'swung' : 'straight',
    barsmith: ours.bpm, barsmithMs: Math.round(oursMs), barsmithOffsetErrorMs: Math.round((ours.offsetMs - beat.firstDownbeatMs) * 10) / 10,
    musicTempo: Math.round(theirs * 100) / 100, musicTempoMs: Math.round(theirsMs),
  })
}
const score = key => ({
  acc1: tempoRows.filter(r => acc1(r[key], r.truth)).length / tempoRows.length,
  acc2: tempoRows.filter(r => acc2(r[key], r.truth)).length / tempoRows.length,
  totalMs: tempoRows.reduce((s, r) => s + r[`${key}Ms`], 0),
})
const summary = { barsmith: score('barsmith'), musicTempo: score('musicTempo') }

console.log('\nBeat ingest (decode + peaks + tempo + bar 1), best of', runs, 'runs in a fresh process each')
console.table(ingestRows.map(r => ({ 'file': r.label, 'MB': r.fileMb, 'wall ms (best)': r.wallMsBest, 'wall ms (median)': r.wallMsMedian, 'peak RSS MB': r.maxRssMb, 'BPM': r.bpm, 'bar 1 ms': r.offsetMs })))
console.log('targets for the WAV: ≤ 2000 ms and ≤ 300 MB')
console.log('\nTempo on the synthesized set (analysis includes peaks and bar 1 for Barsmith; tempo only for music-tempo)')
console.table(tempoRows)
console.table({ 'Barsmith': summary.barsmith, 'music-tempo 1.0.3': summary.musicTempo })

writeFileSync(resolve(outDir, 'beats.json'), `${JSON.stringify({
  when: new Date().toISOString(),
  machine: { node: process.version, cpus: (await import('node:os')).cpus().length },
  targets: { wavWallMs: 2000, wavPeakRssMb: 300 },
  ingest: ingestRows,
  tempo: { cases: tempoRows, summary },
}, null, 2)}\n`)
console.log(`\nwrote ${resolve(outDir, 'beats.json')}`)
