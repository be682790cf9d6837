import { spawn } from 'node:child_process'
import { resolve } from 'node:path'
import { root } from './paths.mjs'
import { serverEntry } from './build.mjs'
import { waitForHttp } from './net.mjs'

/** Starts the fake SMTP server as its own process and resolves once it listens. */
export function spawnFakeSmtp({ port, dir }) {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(process.execPath, [resolve(root, 'scripts/fake-smtp.mjs'), String(port), dir], {
      stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    })
    child.once('error', reject)
    child.once('exit', code => reject(new Error(`fake SMTP server exited with ${code}`)))
    child.once('message', (m) => {
      if (m?.ready) {
        child.removeAllListeners('exit')
        resolvePromise(child)
      }
    })
  })
}

/**
 * Starts the built server with `env` and resolves once /api/health answers.
 * `output` chooses where its logs go ('inherit' or 'ignore' or a file descriptor).
 */
export async function spawnServer({ host = '127.0.0.1', port, env, output = 'inherit' }) {
  const child = spawn(process.execPath, [serverEntry], {
    cwd: root,
    env: { ...process.env, ...env, HOST: host, PORT: String(port), NITRO_HOST: host, NITRO_PORT: String(port), NODE_ENV: 'production' },
    stdio: ['ignore', output, output],
  })
  let alive = true
  child.once('exit', () => {
    alive = false
  })
  await waitForHttp(`http://${host}:${port}/api/health`, { timeoutMs: 90000, isAlive: () => alive })
  return child
}

export function stopChild(child, signal = 'SIGTERM', timeoutMs = 8000) {
  if (!child || child.exitCode !== null || child.signalCode !== null) return Promise.resolve()
  return new Promise((resolvePromise) => {
    const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs)
    child.once('exit', () => {
      clearTimeout(timer)
      resolvePromise()
    })
    child.kill(signal)
  })
}
