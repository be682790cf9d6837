// npm run bench: runs every bench/*.bench.mjs in turn. Each prints its figures and writes
// bench/out/<name>.json; nothing here asserts on time.
import { spawn } from 'node:child_process'
import { readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { ensureNodeModules } from './lib/deps.mjs'
import { root } from './lib/paths.mjs'

await ensureNodeModules()
const only = process.argv[2]
const files = readdirSync(resolve(root, 'bench')).filter(f => f.endsWith('.bench.mjs') && (!only || f.includes(only))).sort()
let failed = 0
for (const file of files) {
  console.log(`\n=== ${file} ===`)
  const code = await new Promise(r => spawn(process.execPath, ['--expose-gc', resolve(root, 'bench', file)], { cwd: root, stdio: 'inherit' }).on('exit', r))
  if (code !== 0) failed++
}
process.exit(failed ? 1 : 0)
