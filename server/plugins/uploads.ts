// Mounts the uploads storage the environment names (server/services/uploads-storage.ts): the
// build's local-disk mount stays unless TILTWRIGHT_UPLOADS_DRIVER=s3, which replaces it with
// unstorage's S3 driver before the first request. A half-configured bucket stops the server
// with the names of what is missing, rather than losing files to local disk.
import s3Driver from 'unstorage/drivers/s3'
import { uploadsStorageFromEnv } from '../services/uploads-storage'

export default defineNitroPlugin(() => {
  const cfg = uploadsStorageFromEnv(process.env)
  if ('problems' in cfg) {
    console.error(`[tiltwright] refusing to start: ${cfg.problems.join('; ')}.`)
    process.exit(1)
  }
  if (cfg.driver === 'fs') return
  const storage = useStorage()
  // Without disposing, unmount finishes at once, so the new mount can take its place now.
  void storage.unmount('uploads', false)
  storage.mount(
    'uploads',
    s3Driver({
      endpoint: cfg.endpoint,
      bucket: cfg.bucket,
      region: cfg.region,
      accessKeyId: cfg.accessKeyId,
      secretAccessKey: cfg.secretAccessKey,
    }),
  )
  console.info(`[tiltwright] uploads are stored in the S3 bucket ${cfg.bucket} at ${cfg.endpoint}`)
})
