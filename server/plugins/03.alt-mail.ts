/**
 * Batches alt notifications into e-mails: checks a few times per batching window for people
 * whose pending alts have gone quiet. Runs in every instance unless BARSMITH_WORKERS=0.
 */
export default defineNitroPlugin((nitroApp) => {
  const env = useEnv()
  if (env.BARSMITH_WORKERS !== '1') return
  let running = false
  const tick = async () => {
    if (!globalThis.__barsmithReady || running) return
    running = true
    try {
      await deliverDueAltMail(useDb())
    }
    catch (error) {
      console.warn('[alt-mail] batch round failed:', (error as Error).message)
    }
    finally {
      running = false
    }
  }
  const timer = setInterval(tick, Math.max(100, Math.min(env.ALT_MAIL_WINDOW_MS / 4, 15_000)))
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
