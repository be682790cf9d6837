import { runMigrations } from '../database/migrate'
import { seedDemoIfEmpty } from '../database/seed'

/**
 * Migrates (and seeds the demo when asked and the database is empty) before the first
 * request is answered. Nitro does not await async plugins, so the promise is held and
 * awaited in a request hook; if it fails the process exits instead of serving errors.
 */
export default defineNitroPlugin((nitroApp) => {
  const env = useEnv()
  const ready = (async () => {
    await runMigrations(env.DATABASE_URL)
    if (env.BARSMITH_SEED_DEMO === '1') await seedDemoIfEmpty(useDb())
  })()
  ready.then(
    () => { globalThis.__barsmithReady = true },
    (error) => {
      console.error('[barsmith] database preparation failed:', error)
      process.exit(1)
    },
  )
  nitroApp.hooks.hook('request', async () => {
    if (!globalThis.__barsmithReady) await ready
  })
})

declare global {
  var __barsmithReady: boolean | undefined
}
