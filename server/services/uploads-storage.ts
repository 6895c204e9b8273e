// Where uploads (purchase orders, tax certificates, ticket attachments) are kept is a matter of
// configuration alone. The build mounts Nitro storage `uploads` on local disk; with
// TILTWRIGHT_UPLOADS_DRIVER=s3 the plugin server/plugins/uploads.ts mounts an S3-compatible
// bucket in its place when the server starts, so one build serves either. Several app
// instances must share one bucket: local disk is per machine. The keys come from the
// environment, never from the source.

export interface S3UploadsConfig {
  driver: 's3'
  endpoint: string
  bucket: string
  region: string
  accessKeyId: string
  secretAccessKey: string
}

export type UploadsConfig = { driver: 'fs' } | S3UploadsConfig | { problems: string[] }

/** The uploads storage the environment asks for, or what is missing from it. */
export function uploadsStorageFromEnv(env: Record<string, string | undefined>): UploadsConfig {
  const driver = (env.TILTWRIGHT_UPLOADS_DRIVER || 'fs').trim()
  if (driver === 'fs') return { driver: 'fs' }
  if (driver !== 's3')
    return { problems: [`TILTWRIGHT_UPLOADS_DRIVER must be fs or s3, not "${driver}"`] }
  const need = {
    endpoint: 'TILTWRIGHT_S3_ENDPOINT',
    bucket: 'TILTWRIGHT_S3_BUCKET',
    accessKeyId: 'TILTWRIGHT_S3_ACCESS_KEY_ID',
    secretAccessKey: 'TILTWRIGHT_S3_SECRET_ACCESS_KEY',
  } as const
  const problems = Object.values(need)
    .filter(name => !env[name]?.trim())
    .map(name => `${name} is not set`)
  const endpoint = env.TILTWRIGHT_S3_ENDPOINT?.trim() ?? ''
  if (endpoint && !/^https?:\/\/[^/\s]+/.test(endpoint))
    problems.push('TILTWRIGHT_S3_ENDPOINT must be an http(s) address')
  if (problems.length) return { problems }
  return {
    driver: 's3',
    endpoint,
    bucket: env.TILTWRIGHT_S3_BUCKET!.trim(),
    region: env.TILTWRIGHT_S3_REGION?.trim() || 'us-east-1',
    accessKeyId: env.TILTWRIGHT_S3_ACCESS_KEY_ID!.trim(),
    secretAccessKey: env.TILTWRIGHT_S3_SECRET_ACCESS_KEY!.trim(),
  }
}
