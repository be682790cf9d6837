import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { root } from './paths.mjs'
import { run } from './run.mjs'
import { step } from './log.mjs'

const SOURCES = ['app', 'server', 'shared', 'public', 'drizzle', 'nuxt.config.ts', 'tailwind.config.ts', 'package-lock.json']
const STAMP = resolve(root, '.output/barsmith-build.json')

function newestMtime(path) {
  if (!existsSync(path)) return 0
  const s = statSync(path)
  if (!s.isDirectory()) return s.mtimeMs
  let newest = s.mtimeMs
  for (const entry of readdirSync(path)) newest = Math.max(newest, newestMtime(resolve(path, entry)))
  return newest
}

/** Builds the app (with the local mailbox compiled in) unless the last build is newer than every source. */
export async function buildIfStale({ force = false } = {}) {
  const sourcesAt = Math.max(...SOURCES.map(s => newestMtime(resolve(root, s))))
  if (!force && existsSync(STAMP)) {
    const stamp = JSON.parse(readFileSync(STAMP, 'utf8'))
    if (stamp.localMail && stamp.builtAt >= sourcesAt) {
      step('build is up to date')
      return
    }
  }
  step('building the app (nuxt build)')
  await run(resolve(root, 'node_modules/.bin/nuxt'), ['build'], {
    cwd: root,
    quiet: true,
    env: { ...process.env, BARSMITH_LOCAL_MAIL: '1', NODE_ENV: 'production' },
  })
  writeFileSync(STAMP, JSON.stringify({ builtAt: Date.now(), localMail: true }))
  step('build done')
}

export const serverEntry = resolve(root, '.output/server/index.mjs')
