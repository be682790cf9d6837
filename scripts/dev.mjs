// npm run dev: the Nuxt dev server against the local cluster and fake SMTP server.
import { resolve } from 'node:path'
import { spawn } from 'node:child_process'
import { ensureNodeModules } from './lib/deps.mjs'
import { dataDir, root } from './lib/paths.mjs'

await ensureNodeModules()
const { prepare } = await import('./lib/prepare.mjs')
const { spawnFakeSmtp, stopChild } = await import('./lib/processes.mjs')
const { serverEnv } = await import('./lib/server-env.mjs')

const port = Number(process.env.PORT || 3000)
const smtpPort = Number(process.env.SMTP_PORT || 2525)
const mailboxDir = resolve(dataDir, 'mailbox')
const prepared = await prepare({ database: process.env.BARSMITH_DB || 'barsmith' })
const smtp = await spawnFakeSmtp({ port: smtpPort, dir: mailboxDir })
const env = { ...process.env, ...serverEnv({ ...prepared, appUrl: `http://127.0.0.1:${port}`, smtpPort, mailboxDir }), BARSMITH_LOCAL_MAIL: '1' }
const nuxt = spawn(resolve(root, 'node_modules/.bin/nuxt'), ['dev', '--host', '127.0.0.1', '--port', String(port)], { cwd: root, env, stdio: 'inherit' })
const stop = async () => {
  await stopChild(nuxt)
  await stopChild(smtp)
  if (prepared.cluster.startedHere) await prepared.cluster.stop()
  process.exit(0)
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
