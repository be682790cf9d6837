// Turns the benchmarks' bench/out/<name>.json files into bench/REPORT.md: the machine, then per
// benchmark each figure beside its target with met/missed. Known benchmarks have a summary
// here; any other one is read by convention: a `report` array of rows
// `{ what, value, unit?, target?, met? }`, or `figures` + `targets` objects whose keys match
// (a target on `xP95Ms` applies to the figure `xP95Ms`, always as an upper bound), or, failing
// both, its top-level numbers are listed without targets.

const fmt = (x, digits = 1) => {
  if (x === null || x === undefined || Number.isNaN(x)) return '—'
  if (typeof x !== 'number') return String(x)
  if (Number.isInteger(x)) return String(x)
  return x.toFixed(Math.abs(x) < 10 ? Math.max(digits, 2) : digits)
}

/** A row: what was measured, the figure, the target (text), and whether it was met (null: no target). */
export function row(what, value, unit = '', target = null, met = null) {
  return { what, value, unit, target, met }
}
const atMost = (what, value, unit, limit, source) => row(what, value, unit, `≤ ${fmt(limit)}${unit ? ` ${unit}` : ''} (${source})`, typeof value === 'number' && !Number.isNaN(value) ? value <= limit : false)
const atLeast = (what, value, unit, limit, source) => row(what, value, unit, `≥ ${fmt(limit)}${unit ? ` ${unit}` : ''} (${source})`, typeof value === 'number' && !Number.isNaN(value) ? value >= limit : false)

const SUMMARIES = {
  beats(j) {
    const rows = []
    for (const r of j.ingest ?? []) {
      const wav = /wav/i.test(r.label)
      rows.push(wav
        ? atMost(`ingest ${r.label}: wall time (best)`, r.wallMsBest, 'ms', j.targets?.wavWallMs ?? 2000, 'issue 3')
        : row(`ingest ${r.label}: wall time (best)`, r.wallMsBest, 'ms'))
      rows.push(wav
        ? atMost(`ingest ${r.label}: peak RSS`, r.maxRssMb, 'MB', j.targets?.wavPeakRssMb ?? 300, 'issue 3')
        : row(`ingest ${r.label}: peak RSS`, r.maxRssMb, 'MB'))
    }
    const s = j.tempo?.summary
    if (s) {
      rows.push(atLeast('tempo Acc1 (within 4 %) on the synthesized set', s.barsmith.acc1 * 100, '%', 90, 'issue 3, MIREX convention'))
      rows.push(atLeast('tempo Acc2 (4 %, or half/double) on the synthesized set', s.barsmith.acc2 * 100, '%', 100, 'issue 3, MIREX convention'))
      rows.push(row('music-tempo 1.0.3 Acc1 / Acc2 on the same set, for comparison', `${fmt(s.musicTempo.acc1 * 100)} / ${fmt(s.musicTempo.acc2 * 100)}`, '%'))
    }
    return rows
  },
  prosody(j) {
    const d = j.dictionary ?? {}
    const ip = j.analysisInProcess ?? {}
    const h = j.analysisHttp ?? {}
    const rows = [
      atMost('dictionary load + index time', d.loadAndIndexMs, 'ms', d.target?.ms ?? 400, 'issue 4'),
      atMost('dictionary load + index heap', d.heapAllMb, 'MB', d.target?.heapMb ?? 80, 'issue 4'),
      atMost(`analysis in-process, ${ip.lines} lines, warm median (identical draft)`, ip.identical?.medianMs, 'ms', ip.target?.warmMedianMs ?? 1, 'issue 4'),
      row('analysis in-process, one line changed, median', ip.typing?.medianMs, 'ms'),
    ]
    for (const [mode, label] of [['identical', 'identical draft'], ['typing', 'one line changed per request']]) {
      const m = h[mode]
      if (!m) continue
      rows.push(atMost(`analysis over HTTP, ${h.connections} connections, ${label}: p95`, m.p95Ms, 'ms', h.target?.p95Ms ?? 15, 'issue 4'))
      rows.push(atMost(`analysis over HTTP, ${h.connections} connections, ${label}: errors`, m.errors, '', h.target?.errors ?? 0, 'issue 4'))
    }
    if (j.finder) rows.push(row('rhyme finder query, warm median', j.finder.medianMs, 'ms'))
    return rows
  },
  versions(j) {
    const t = j.targets ?? {}
    return [
      atMost(`save, ${j.saves?.writers} writers on their own drafts: p95`, j.saves?.ms?.p95, 'ms', t.saveP95Ms, 'Barsmith\'s own, for issue 6'),
      atMost(`save, ${j.contended?.writers} writers on one draft (201 or 409): p95`, j.contended?.ms?.p95, 'ms', t.contendedSaveP95Ms, 'Barsmith\'s own'),
      atMost('live event, saved through one process, out of another: p95', j.events?.acrossProcessesMs?.p95, 'ms', t.eventAcrossP95Ms, 'Barsmith\'s own, for issue 6'),
    ]
  },
  'auth-timing'(j) {
    // Enumeration by timing: known and unknown addresses must take about as long (issue 8).
    return Object.entries(j.rows ?? {}).map(([route, r]) => {
      const median = Math.max(r['known p50 ms'] ?? 0, r['unknown p50 ms'] ?? 0)
      const limit = Math.max(0.1 * median, 5)
      return atMost(`${route}: median gap, known vs unknown address (${fmt(r['known p50 ms'])} / ${fmt(r['unknown p50 ms'])} ms)`, r['gap ms'], 'ms', limit, 'Barsmith\'s own: 10 % of the median or 5 ms')
    })
  },
  cadence(j) {
    const f = j.figures ?? {}
    return [
      atMost(`cadence ticks in Chromium (${f.ticks} ticks): largest distance from the computed slot time`, f.tickDeviationMaxMs, 'ms', 5, 'issue 9'),
      row('sheet text, p50 / p95', `${fmt(f.txtP50Ms)} / ${fmt(f.txtP95Ms)}`, 'ms'),
      row('sheet text with cadence rows, p50 / p95', `${fmt(f.txtCadenceP50Ms)} / ${fmt(f.txtCadenceP95Ms)}`, 'ms'),
      row('sheet PDF, p50 / p95', `${fmt(f.pdfP50Ms)} / ${fmt(f.pdfP95Ms)}`, 'ms'),
      row('sheet PDF with cadence rows, p50 / p95', `${fmt(f.pdfCadenceP50Ms)} / ${fmt(f.pdfCadenceP95Ms)}`, 'ms'),
    ]
  },
  load(j) {
    const rows = (j.runs ?? []).map(r => row(
      `${r.scenario}, ${r.connections} connections (${r.requests} requests in ≤ ${r.durationS} s)`,
      `${fmt(r.rps)} req/s; p50 ${fmt(r.p50Ms)} / p95 ${fmt(r.p95Ms)} / p99 ${fmt(r.p99Ms)} ms; ${r.errors} errors; RSS ${fmt(r.rssBeforeMb)} → ${fmt(r.rssAfterMb)} MB; load ${fmt(r.loadAvgAfter, 2)}`,
    ))
    for (const r of j.report ?? []) rows.push(row(r.what, r.value, r.unit ?? '', r.target ? `${r.target} (Barsmith's own)` : null, r.met ?? null))
    if (j.rss) rows.push(row('server RSS before → after all load runs', `${fmt(j.rss.startMb)} → ${fmt(j.rss.endMb)}`, 'MB'))
    return rows
  },
}

function byConvention(j) {
  if (Array.isArray(j.report)) return j.report.map(r => row(r.what, r.value, r.unit ?? '', r.target ?? null, r.met ?? null))
  if (j.figures && j.targets) {
    const rows = []
    for (const [key, value] of Object.entries(j.figures)) {
      if (typeof value !== 'number') continue
      const limit = j.targets[key]
      const unit = /Ms$/.test(key) ? 'ms' : /Mb$/.test(key) ? 'MB' : ''
      rows.push(typeof limit === 'number' ? atMost(key, value, unit, limit, 'the benchmark\'s own') : row(key, value, unit))
    }
    return rows
  }
  return Object.entries(j).filter(([, v]) => typeof v === 'number').map(([k, v]) => row(k, v))
}

/** The summary rows of benchmark `name` from its JSON output. */
export function summarise(name, json) {
  return (SUMMARIES[name] ?? byConvention)(json)
}

const cell = s => String(s).replaceAll('|', '\\|').replaceAll('\n', ' ')

/**
 * The report's Markdown. `machine`: { cpu, cores, ramGb, node, postgres, loadAvg, startedAt,
 * finishedAt }; `results`: [{ name, file, exitCode, seconds, json | null, error? }].
 */
export function reportMarkdown({ machine, results }) {
  const all = results.flatMap(r => (r.json ? summarise(r.name, r.json) : []))
  const withTarget = all.filter(r => r.met !== null)
  const missed = withTarget.filter(r => !r.met)
  const out = []
  out.push('# Barsmith benchmark report', '')
  out.push(`Written by \`npm run bench\` (scripts/bench.mjs), which runs every \`bench/*.bench.mjs\`. Started ${machine.startedAt}, finished ${machine.finishedAt}.`, '')
  out.push('## Machine', '')
  out.push('| | |', '|---|---|')
  out.push(`| CPU | ${cell(machine.cpu)} |`, `| cores | ${machine.cores} |`, `| RAM | ${fmt(machine.ramGb)} GB |`, `| Node.js | ${machine.node} |`, `| PostgreSQL | ${cell(machine.postgres)} |`)
  out.push(`| load average at start (1 / 5 / 15 min) | ${machine.loadAvg.map(x => Number(x).toFixed(2)).join(' / ')} |`, '')
  out.push('## Summary', '')
  out.push(`${withTarget.length} figures have a target: ${withTarget.length - missed.length} met, ${missed.length} missed. ${results.filter(r => r.exitCode !== 0).length} of ${results.length} benchmarks did not finish.`, '')
  if (missed.length) {
    out.push('Missed:', '')
    for (const r of missed) out.push(`- ${r.what}: ${fmt(r.value)}${r.unit ? ` ${r.unit}` : ''} (target ${r.target})`)
    out.push('')
  }
  for (const r of results) {
    out.push(`## ${r.name} (\`bench/${r.file}\`)`, '')
    const busy = r.loadAtStart !== undefined && r.loadAtStart >= machine.cores * 0.75
    out.push(`Ran ${fmt(r.seconds)} s, exit code ${r.exitCode}${r.loadAtStart === undefined ? '' : `, 1-minute load average ${Number(r.loadAtStart).toFixed(2)} when it started (${machine.cores} cores)`}.${busy ? ' The cores were already busy with other work: its times are inflated by waiting for a core.' : ''}`, '')
    if (!r.json) {
      out.push(`No figures: ${r.error ?? 'the benchmark wrote no bench/out JSON in this run'}.`, '')
      continue
    }
    const rows = summarise(r.name, r.json)
    out.push('| measured | figure | target | met |', '|---|---|---|---|')
    for (const x of rows) out.push(`| ${cell(x.what)} | ${cell(fmt(x.value))}${x.unit ? ` ${x.unit}` : ''} | ${x.target ? cell(x.target) : '—'} | ${x.met === null ? '—' : x.met ? 'met' : '**missed**'} |`)
    out.push('')
  }
  out.push('## How to read this', '')
  out.push(
    '- Every figure comes from this one run on the machine above; the raw numbers are in `bench/out/<name>.json` (not committed).',
    '- Wall times depend on what else the cores were doing: compare the load average at start (and the per-run load figures in the JSON) with the number of cores before comparing runs.',
    '- "met" compares the figure with its target as a bound (≤ for times and memory, ≥ for accuracy). Targets name their source: an issue of this project, or "Barsmith\'s own" where no issue gives a number.',
    '- Latencies are per request as the client saw them on loopback (p50 / p95 / p99); "errors" counts socket errors, timeouts and non-2xx answers.',
    '- Nothing here is a test: no test asserts on time. A missed target is a finding to explain, not a failure of `npm test`.',
    '',
  )
  return out.join('\n')
}
