import { BEAT_ANALYSIS_DEAD, BEAT_ANALYSIS_QUEUE } from '../utils/job-queue'

/**
 * Runs beat analysis in every server process (unless BARSMITH_WORKERS=0), one job at a time,
 * once the database is migrated. Jobs are pg-boss rows, so queued work survives a restart.
 */
export default defineNitroPlugin((nitroApp) => {
  if (useEnv().BARSMITH_WORKERS !== '1') return
  let stopped = false
  let orphanTimer: ReturnType<typeof setInterval> | undefined
  const start = async () => {
    while (!globalThis.__barsmithReady && !stopped) await new Promise(r => setTimeout(r, 200))
    if (stopped) return
    const boss = await useJobQueue()
    await boss.work<{ beatId: string }>(BEAT_ANALYSIS_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
      if (job) await runBeatAnalysis(job.data.beatId)
    })
    await boss.work<{ beatId: string }>(BEAT_ANALYSIS_DEAD, { batchSize: 1, pollingIntervalSeconds: 5 }, async ([job]) => {
      if (job) await failStuckBeat(job.data.beatId)
    })
    const sweep = () => requeueOrphanBeats().then(
      n => n && console.info(`[jobs] queued ${n} beat(s) stored without an analysis job`),
      error => console.warn('[jobs] could not look for beats without a job:', (error as Error).message),
    )
    await sweep()
    orphanTimer = setInterval(sweep, 60_000)
  }
  start().catch(error => console.error('[jobs] the beat worker did not start:', (error as Error).message))
  nitroApp.hooks.hook('close', async () => {
    stopped = true
    clearInterval(orphanTimer)
    await stopJobQueue()
  })
})
