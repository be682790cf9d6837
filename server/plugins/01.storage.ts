import fsDriver from 'unstorage/drivers/fs'
import s3Driver from 'unstorage/drivers/s3'

/**
 * The `files` mount holds beats, scratch takes and exports: the file system under
 * STORAGE_DIR locally, any S3-compatible bucket when STORAGE_DRIVER=s3.
 */
export default defineNitroPlugin(() => {
  const env = useEnv()
  const driver = env.STORAGE_DRIVER === 's3'
    ? s3Driver({
        endpoint: env.S3_ENDPOINT!,
        region: env.S3_REGION,
        bucket: env.S3_BUCKET!,
        accessKeyId: env.S3_ACCESS_KEY_ID!,
        secretAccessKey: env.S3_SECRET_ACCESS_KEY!,
      })
    : fsDriver({ base: env.STORAGE_DIR })
  useStorage().mount('files', driver)
  // Uploads half-received when a process died are removed; they were never stored under a key.
  void sweepIncoming().then(
    n => n && console.info(`[uploads] removed ${n} unfinished upload(s) left by a stopped process`),
    error => console.warn('[uploads] could not sweep unfinished uploads:', (error as Error).message),
  )
})
