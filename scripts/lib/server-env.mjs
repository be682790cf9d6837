import { resolve } from 'node:path'
import { dataDir } from './paths.mjs'

/** The environment the built server gets from the local scripts. */
export function serverEnv({ databaseUrl, secrets, appUrl, smtpPort, mailboxDir, storageDir = resolve(dataDir, 'storage'), seed = true }) {
  return {
    DATABASE_URL: databaseUrl,
    NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD || secrets.sessionPassword,
    APP_URL: appUrl,
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    MAILBOX_DIR: mailboxDir,
    STORAGE_DIR: storageDir,
    BARSMITH_SEED_DEMO: seed ? '1' : '0',
    DEMO_PASSWORD: process.env.DEMO_PASSWORD || 'barsmith-demo',
  }
}
