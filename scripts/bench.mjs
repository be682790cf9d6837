// npm run bench: runs every bench/*.bench.mjs in turn (discovered, so a new one joins by its
// name), each in its own process; each prints its figures and writes bench/out/<name>.json.
// Then writes bench/REPORT.md: the machine, and every figure beside its target. Nothing here
// asserts on time. `npm run bench -- load` runs only the benchmarks whose name contains "load"
// and leaves the report alone.
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs'
import { cpus, loadavg, totalmem } from 'node:os'
import { resolve } from 'node:path'
import { ensureNodeModules, postgresBinDir } from './lib/deps.mjs'
import { root } from './lib/paths.mjs'
import { reportMarkdown } from './lib/bench-report.mjs'

await ensureNodeModules()
const only = process.argv[2]
const files = readdirSync(resolve(root, 'bench')).filter(f => f.endsWith('.bench.mjs') && (!only || f.includes(only))).sort()

const binDir = postgresBinDir()
const machine = {
  cpu: cpus()[0]?.model ?? 'unknown',
  cores: cpus().length,
  ramGb: totalmem() / 1024 ** 3,
  node: process.version,
  postgres: binDir ? spawnSync(resolve(binDir, 'postgres'), ['--version'], { encoding: 'utf8' }).stdout.trim() : 'not found',
  loadAvg: loadavg(),
  startedAt: new Date().toISOString(),
  finishedAt: '',
}
console.log(`machine: ${machine.cpu}, ${machine.cores} cores, ${machine.ramGb.toFixed(1)} GB, node ${machine.node}, ${machine.postgres}, load ${machine.loadAvg.map(x => x.toFixed(2)).join(' ')}`)

const results = []
for (const file of files) {
  const name = file.replace(/\.bench\.mjs$/, '')
  const out = resolve(root, 'bench/out', `${name}.json`)
  console.log(`\n=== ${file} ===`)
  const started = Date.now()
  const loadAtStart = loadavg()[0]
  const exitCode = await new Promise(r => spawn(process.execPath, ['--expose-gc', resolve(root, 'bench', file)], { cwd: root, stdio: 'inherit' }).on('exit', code => r(code ?? 1)))
  const result = { name, file, exitCode, seconds: (Date.now() - started) / 1000, loadAtStart, json: null }
  // Only this run's output counts: a JSON left by an earlier run is not reported as current.
  if (existsSync(out) && statSync(out).mtimeMs >= started) {
    try {
      result.json = JSON.parse(readFileSync(out, 'utf8'))
    }
    catch (error) {
      result.error = `its JSON could not be read (${error.message})`
    }
  }
  else {
    result.error = exitCode === 0 ? 'it wrote no bench/out JSON' : `it exited with code ${exitCode} before writing its figures`
  }
  results.push(result)
}
machine.finishedAt = new Date().toISOString()

if (!only) {
  writeFileSync(resolve(root, 'bench/REPORT.md'), reportMarkdown({ machine, results }))
  console.log('\nwrote bench/REPORT.md')
}
process.exit(results.some(r => r.exitCode !== 0) ? 1 : 0)
