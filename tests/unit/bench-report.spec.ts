import { describe, expect, it } from 'vitest'
import { reportMarkdown, summarise } from '../../scripts/lib/bench-report.mjs'

const machine = { cpu: 'Test CPU', cores: 2, ramGb: 4, node: 'v20.20.2', postgres: 'postgres (PostgreSQL) 15.14', loadAvg: [1.5, 1, 0.5], startedAt: '2026-01-01T00:00:00Z', finishedAt: '2026-01-01T00:10:00Z' }

describe('the benchmark report', () => {
  it('holds each figure against its target as a bound: times and memory at most, accuracy at least', () => {
    const rows = summarise('beats', {
      targets: { wavWallMs: 2000, wavPeakRssMb: 300 },
      ingest: [{ label: '4 min WAV', wallMsBest: 2100, maxRssMb: 120 }],
      tempo: { summary: { barsmith: { acc1: 0.95, acc2: 1 }, musicTempo: { acc1: 0.4, acc2: 0.9 } } },
    })
    expect(rows.map(r => [r.what.slice(0, 20), r.met])).toEqual([
      ['ingest 4 min WAV: wa', false],
      ['ingest 4 min WAV: pe', true],
      ['tempo Acc1 (within 4', true],
      ['tempo Acc2 (4 %, or ', true],
      ['music-tempo 1.0.3 Ac', null],
    ])
  })

  it('holds the sign-in timing gap and the cadence tick distance to their bounds', () => {
    const auth = summarise('auth-timing', { rows: { 'reset request': { 'known p50 ms': 60, 'unknown p50 ms': 40, 'gap ms': 20 }, 'sign-up': { 'known p50 ms': 250, 'unknown p50 ms': 251, 'gap ms': 1 } } })
    expect(auth.map(r => r.met)).toEqual([false, true])
    const cadence = summarise('cadence', { figures: { ticks: 8, tickDeviationMaxMs: 0.4, txtP50Ms: 1, txtP95Ms: 2 } })
    expect(cadence[0]).toMatchObject({ met: true })
    expect(summarise('cadence', { figures: { ticks: 8, tickDeviationMaxMs: 6 } })[0]).toMatchObject({ met: false })
  })

  it('reads a benchmark it does not know by its report rows, or by figures and targets with the same keys', () => {
    expect(summarise('future', { report: [{ what: 'x p95', value: 12, unit: 'ms', target: '≤ 10 ms', met: false }] })[0]).toMatchObject({ what: 'x p95', met: false })
    const byKeys = summarise('other', { figures: { mapP95Ms: 250, rssGrowthMb: 90, bars: 64 }, targets: { mapP95Ms: 300, rssGrowthMb: 80 } })
    expect(byKeys.map(r => [r.what, r.met])).toEqual([['mapP95Ms', true], ['rssGrowthMb', false], ['bars', null]])
  })

  it('lists the machine, every benchmark (also one that failed) and every missed target', () => {
    const md = reportMarkdown({
      machine,
      results: [
        { name: 'vocal-map', file: 'vocal-map.bench.mjs', exitCode: 0, seconds: 12, json: { figures: { mapP95Ms: 400 }, targets: { mapP95Ms: 300 } } },
        { name: 'broken', file: 'broken.bench.mjs', exitCode: 1, seconds: 1, json: null, error: 'it exited with code 1 before writing its figures' },
      ],
    })
    expect(md).toContain('| cores | 2 |')
    expect(md).toContain('postgres (PostgreSQL) 15.14')
    expect(md).toContain('1.50 / 1.00 / 0.50')
    expect(md).toContain('1 figures have a target: 0 met, 1 missed. 1 of 2 benchmarks did not finish.')
    expect(md).toContain('- mapP95Ms: 400 ms (target ≤ 300 ms')
    expect(md).toContain('## broken (`bench/broken.bench.mjs`)')
    expect(md).toContain('No figures: it exited with code 1')
  })
})

describe('the benchmark report on a busy machine', () => {
  it('says when a benchmark started with the cores already busy', () => {
    const result = { name: 'vocal-map', file: 'vocal-map.bench.mjs', exitCode: 0, seconds: 5, json: { figures: { mapP95Ms: 10 }, targets: { mapP95Ms: 300 } } }
    expect(reportMarkdown({ machine, results: [{ ...result, loadAtStart: 1.8 }] })).toContain('already busy')
    expect(reportMarkdown({ machine, results: [{ ...result, loadAtStart: 0.4 }] })).not.toContain('already busy')
  })
})
