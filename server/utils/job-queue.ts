import PgBoss from 'pg-boss'

export const BEAT_ANALYSIS_QUEUE = 'beat-analysis'
/** Jobs land here once their retries are spent (a process killed three times, say). */
export const BEAT_ANALYSIS_DEAD = 'beat-analysis-dead'

let boss: Promise<PgBoss> | undefined

/**
 * The pg-boss instance of this process (jobs live in PostgreSQL, schema `pgboss`), started
 * once. Every process can send; maintenance runs only where workers run.
 */
export function useJobQueue(): Promise<PgBoss> {
  boss ??= (async () => {
    const env = useEnv()
    const workers = env.BARSMITH_WORKERS === '1'
    const instance = new PgBoss({ connectionString: env.DATABASE_URL, schema: 'pgboss', max: 3, supervise: workers, maintenanceIntervalSeconds: env.JOB_MAINTENANCE_SECONDS, schedule: false, application_name: 'barsmith-jobs' })
    instance.on('error', error => console.warn('[jobs]', error.message))
    await instance.start()
    await instance.createQueue(BEAT_ANALYSIS_DEAD, { name: BEAT_ANALYSIS_DEAD })
    // A job whose process died stays active until it expires, then runs again: nothing stays stuck.
    await instance.createQueue(BEAT_ANALYSIS_QUEUE, { name: BEAT_ANALYSIS_QUEUE, retryLimit: 2, retryDelay: 5, expireInSeconds: env.BEAT_JOB_EXPIRE_SECONDS, deadLetter: BEAT_ANALYSIS_DEAD })
    return instance
  })().catch((error) => {
    boss = undefined
    throw error
  })
  return boss
}

export async function stopJobQueue() {
  if (!boss) return
  const b = await boss.catch(() => null)
  boss = undefined
  await b?.stop({ graceful: true, timeout: 5000 }).catch(() => {})
}
