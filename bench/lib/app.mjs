// Starts what a benchmark over HTTP needs: the local cluster with a fresh `barsmith_bench`
// database (seeded with the demo crew), the fake SMTP server and the built server.
import { mkdirSync, openSync, rmSync } from 'node:fs'
import { resolve } from 'node:path'
import { buildIfStale } from '../../scripts/lib/build.mjs'
import { startFakeSmtp } from '../../scripts/lib/fake-smtp.mjs'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { dataDir, pgDir } from '../../scripts/lib/paths.mjs'
import { ensureDatabase, startCluster } from '../../scripts/lib/pg.mjs'
import { spawnServer, stopChild } from '../../scripts/lib/processes.mjs'
import { localSecrets } from '../../scripts/lib/secrets.mjs'
import { serverEnv } from '../../scripts/lib/server-env.mjs'

export async function startBenchApp({ extraEnv = {} } = {}) {
  await buildIfStale()
  const secrets = localSecrets()
  const cluster = await startCluster(pgDir)
  const databaseUrl = await ensureDatabase(pgDir, cluster.port, 'barsmith_bench', { password: secrets.dbPassword, fresh: true })
  const runDir = resolve(dataDir, 'bench-run')
  rmSync(runDir, { recursive: true, force: true })
  mkdirSync(runDir, { recursive: true })
  const smtp = await startFakeSmtp({ port: 0, dir: resolve(runDir, 'mailbox') })
  const port = await randomFreePort()
  const baseUrl = `http://127.0.0.1:${port}`
  const env = {
    ...serverEnv({ databaseUrl, secrets, appUrl: baseUrl, smtpPort: smtp.port, mailboxDir: resolve(runDir, 'mailbox'), storageDir: resolve(runDir, 'storage') }),
    TRUST_PROXY: '1',
    ...extraEnv,
  }
  const server = await spawnServer({ port, env, output: openSync(resolve(runDir, 'server.log'), 'a') })
  return {
    baseUrl,
    databaseUrl,
    /** The server's environment, to start more instances on the same database. */
    env,
    serverPid: server.pid,
    async stop() {
      await stopChild(server)
      await smtp.close()
      if (cluster.startedHere) await cluster.stop()
    },
  }
}

/** Signs in over HTTP and returns the session cookie header. */
export async function signInCookie(baseUrl, email, password = process.env.DEMO_PASSWORD || 'barsmith-demo') {
  const res = await fetch(`${baseUrl}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) })
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

/** Resident set size of a process in MB (Linux /proc). */
export async function rssMb(pid) {
  const { readFile } = await import('node:fs/promises')
  const status = await readFile(`/proc/${pid}/status`, 'utf8')
  return Number(status.match(/VmRSS:\s+(\d+)/)[1]) / 1024
}
