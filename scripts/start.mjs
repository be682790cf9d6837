// npm start: install what is missing, start PostgreSQL and the fake SMTP server on loopback,
// migrate, seed the demo crew (first run only), build and serve. Ctrl-C stops it all.
import { resolve } from 'node:path'
import { ensureNodeModules } from './lib/deps.mjs'
import { dataDir } from './lib/paths.mjs'
import { fail, step } from './lib/log.mjs'

await ensureNodeModules()
const { prepare } = await import('./lib/prepare.mjs')
const { buildIfStale } = await import('./lib/build.mjs')
const { portIsFree } = await import('./lib/net.mjs')
const { spawnFakeSmtp, spawnServer, stopChild } = await import('./lib/processes.mjs')
const { serverEnv } = await import('./lib/server-env.mjs')

const host = process.env.HOST || '127.0.0.1'
const port = Number(process.env.PORT || 3000)
const smtpPort = Number(process.env.SMTP_PORT || 2525)
const mailboxDir = resolve(dataDir, 'mailbox')

let cluster, smtp, server
let stopping = false
async function stopAll(code) {
  if (stopping) return
  stopping = true
  step('stopping')
  await stopChild(server)
  await stopChild(smtp)
  if (cluster?.startedHere) {
    step('stopping PostgreSQL')
    await cluster.stop().catch(e => console.error(e.message))
  }
  process.exit(code)
}
process.on('SIGINT', () => stopAll(0))
process.on('SIGTERM', () => stopAll(0))

try {
  for (const [p, what] of [[port, 'the app (PORT)'], [smtpPort, 'the fake SMTP server (SMTP_PORT)']]) {
    if (!(await portIsFree(p, host))) fail(`Port ${p} for ${what} is already in use. Stop what uses it, or choose another port.`)
  }
  const prepared = await prepare({ database: process.env.BARSMITH_DB || 'barsmith' })
  cluster = prepared.cluster
  await buildIfStale()
  smtp = await spawnFakeSmtp({ port: smtpPort, dir: mailboxDir })
  step(`fake SMTP server on 127.0.0.1:${smtpPort}`)
  const appUrl = process.env.APP_URL || `http://${host}:${port}`
  server = await spawnServer({ host, port, env: serverEnv({ ...prepared, appUrl, smtpPort, mailboxDir }) })
  server.once('exit', (code) => {
    if (!stopping) {
      console.error(`[barsmith] the server exited (${code}); stopping the rest`)
      void stopAll(1)
    }
  })
  smtp.once('exit', () => {
    if (!stopping) console.error('[barsmith] the fake SMTP server stopped; mail waits in the outbox')
  })
  const password = process.env.DEMO_PASSWORD || 'barsmith-demo'
  console.log(`
  Barsmith is running at ${appUrl}

  Demo logins (password: ${password}):
    owner@barsmith.test      owner
    producer@barsmith.test   producer
    writer@barsmith.test     writer
    cowriter@barsmith.test   co-writer
    listener@barsmith.test   listener

  Local mailbox: ${appUrl}/dev/mailbox
  Press Ctrl-C to stop.
`)
}
catch (error) {
  console.error(`\n[barsmith] could not start: ${error.message}\n`)
  await stopAll(1)
}
