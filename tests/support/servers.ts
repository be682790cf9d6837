import { openSync } from 'node:fs'
import { resolve } from 'node:path'
import { inject } from 'vitest'
import { dataDir } from '../../scripts/lib/paths.mjs'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { spawnServer, stopChild } from '../../scripts/lib/processes.mjs'

/**
 * Another instance of the built server on the same test database (a second process, as
 * behind a load balancer), with the same settings as the first. Its log is
 * .data/test-run/server-<name>.log.
 */
export async function startAnotherServer(name = 'b', extraEnv: Record<string, string> = {}) {
  const port = await randomFreePort()
  const output = openSync(resolve(dataDir, 'test-run', `server-${name}.log`), 'a')
  const child = await spawnServer({ port, env: { ...inject('serverEnv'), ...extraEnv, APP_URL: inject('baseUrl') }, output })
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    pid: child.pid as number,
    stop: () => stopChild(child),
  }
}
