/**
 * The outbox worker: sends due mail when woken by NOTIFY barsmith_outbox and every few
 * seconds otherwise (retries, or a missed notification). Runs in every instance unless
 * BARSMITH_WORKERS=0; rows are claimed with SKIP LOCKED so instances never send twice.
 */
const MAIL_BATCH = 20

export default defineNitroPlugin((nitroApp) => {
  if (useEnv().BARSMITH_WORKERS !== '1') return
  let running = false
  let again = false
  const tick = async () => {
    if (!globalThis.__barsmithReady) return
    if (running) {
      again = true
      return
    }
    running = true
    try {
      let claimed = 0
      do {
        again = false
        // A full batch (sent or not) means more may be waiting: go on without waiting for the timer.
        claimed = (await deliverDueMail(useDb(), MAIL_BATCH)).claimed
      } while (again || claimed >= MAIL_BATCH)
    }
    catch (error) {
      console.warn('[outbox] delivery round failed:', (error as Error).message)
    }
    finally {
      running = false
    }
  }
  const timer = setInterval(tick, 2000)
  void listenTo('barsmith_outbox', () => void tick())
  nitroApp.hooks.hook('close', async () => {
    clearInterval(timer)
    await closeListener()
  })
})
