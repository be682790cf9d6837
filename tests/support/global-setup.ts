// Prepares what the integration and browser tests run against: the local PostgreSQL cluster
// with a fresh test database, the fake SMTP server, and the built server on a free port.
import { existsSync, mkdirSync, openSync, rmSync } from 'node:fs'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { dataDir, pgDir } from '../../scripts/lib/paths.mjs'
import { ensureDatabase, startCluster } from '../../scripts/lib/pg.mjs'
import { localSecrets } from '../../scripts/lib/secrets.mjs'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { startFakeSmtp } from '../../scripts/lib/fake-smtp.mjs'
import { spawnServer, stopChild } from '../../scripts/lib/processes.mjs'
import { serverEnv } from '../../scripts/lib/server-env.mjs'
import { serverEntry } from '../../scripts/lib/build.mjs'

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    databaseUrl: string
    mailboxDir: string
    storageDir: string
    serverEnv: Record<string, string>
  }
}

export default async function setup(project: TestProject) {
  if (!existsSync(serverEntry)) throw new Error('No build found: run `npm test` (it builds), or `npm run build` first.')
  const secrets = localSecrets()
  const cluster = await startCluster(pgDir)
  const databaseUrl = await ensureDatabase(pgDir, cluster.port, 'barsmith_test', { password: secrets.dbPassword, fresh: true })

  const runDir = resolve(dataDir, 'test-run')
  rmSync(runDir, { recursive: true, force: true })
  const mailboxDir = resolve(runDir, 'mailbox')
  const storageDir = resolve(runDir, 'storage')
  mkdirSync(storageDir, { recursive: true })
  const smtp = await startFakeSmtp({ port: 0, dir: mailboxDir })

  const port = await randomFreePort()
  const baseUrl = `http://127.0.0.1:${port}`
  const env = {
    ...serverEnv({ databaseUrl, secrets, appUrl: baseUrl, smtpPort: smtp.port, mailboxDir, storageDir }),
    // Tests stand in for many clients behind one proxy: each sends its own X-Forwarded-For.
    TRUST_PROXY: '1',
    // Short live heartbeats and alt-mail batching windows, so tests see them within seconds.
    LIVE_HEARTBEAT_MS: '1000',
    ALT_MAIL_WINDOW_MS: '2000',
  }
  const log = openSync(resolve(runDir, 'server.log'), 'a')
  const server = await spawnServer({ port, env, output: log })

  project.provide('baseUrl', baseUrl)
  project.provide('databaseUrl', databaseUrl)
  project.provide('mailboxDir', mailboxDir)
  project.provide('storageDir', storageDir)
  project.provide('serverEnv', env)

  return async () => {
    await stopChild(server)
    await smtp.close()
    if (cluster.startedHere) await cluster.stop()
  }
}
