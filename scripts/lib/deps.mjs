import { existsSync, statSync, readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { root } from './paths.mjs'
import { commandExists, run } from './run.mjs'
import { step } from './log.mjs'

/**
 * `npm ci` when node_modules is missing or older than the lock file. Runs before anything
 * that imports a dependency, so this module itself uses only Node built-ins.
 */
export async function ensureNodeModules() {
  const marker = resolve(root, 'node_modules/.package-lock.json')
  const lock = resolve(root, 'package-lock.json')
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return
  step('installing npm packages (npm ci)')
  await run('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root })
}

/** Debian packages, installed with apt-get only when the binary that proves them is absent. */
export async function ensureDebianPackages(wanted) {
  const missing = wanted.filter(({ present }) => !present()).map(({ pkg }) => pkg)
  if (missing.length === 0) return
  if (process.getuid?.() !== 0) {
    throw new Error(`Missing Debian packages: ${missing.join(' ')}. Install them with: sudo apt-get install -y ${missing.join(' ')}`)
  }
  step(`installing Debian packages: ${missing.join(' ')}`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  try {
    await run('apt-get', ['install', '-y', '--no-install-recommends', ...missing], { env, quiet: true })
  }
  catch {
    // A fresh machine may have no package lists yet.
    await run('apt-get', ['update'], { env, quiet: true })
    await run('apt-get', ['install', '-y', '--no-install-recommends', ...missing], { env, quiet: true })
  }
}

export function postgresBinDir() {
  const base = '/usr/lib/postgresql'
  if (!existsSync(base)) return null
  const versions = readdirSync(base)
    .filter(v => existsSync(resolve(base, v, 'bin/initdb')) && existsSync(resolve(base, v, 'bin/postgres')))
    .sort((a, b) => Number(b) - Number(a))
  return versions.length ? resolve(base, versions[0], 'bin') : null
}

export const postgresPackage = { pkg: 'postgresql', present: () => postgresBinDir() !== null }
export const chromiumPackage = { pkg: 'chromium', present: () => existsSync('/usr/bin/chromium') }
/** Encoders the tests use to make beat fixtures in every accepted format, and a PDF reader. */
export const fixtureToolPackages = [
  { pkg: 'sox', present: () => commandExists('sox') },
  { pkg: 'lame', present: () => commandExists('lame') },
  { pkg: 'flac', present: () => commandExists('flac') },
  { pkg: 'vorbis-tools', present: () => commandExists('oggenc') },
  { pkg: 'poppler-utils', present: () => commandExists('pdftotext') },
]
