// npm test: the same preparation as npm start (packages, PostgreSQL, a build), then every
// test: unit, integration against the built server and a fresh database, and Chromium.
import { spawn } from 'node:child_process'
import { resolve } from 'node:path'
import { ensureNodeModules } from './lib/deps.mjs'
import { root } from './lib/paths.mjs'
import { step } from './lib/log.mjs'

await ensureNodeModules()
const { ensureDebianPackages, postgresPackage, chromiumPackage, fixtureToolPackages } = await import('./lib/deps.mjs')
const { buildIfStale } = await import('./lib/build.mjs')

try {
  await ensureDebianPackages([postgresPackage, chromiumPackage, ...fixtureToolPackages])
  await buildIfStale()
}
catch (error) {
  console.error(`\n[barsmith] test preparation failed: ${error.message}\n`)
  process.exit(1)
}

step('running the tests (vitest)')
const child = spawn(resolve(root, 'node_modules/.bin/vitest'), ['run', ...process.argv.slice(2)], { cwd: root, stdio: 'inherit' })
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)))
