// Where uploads go is read from the environment alone (server/services/uploads-storage.ts).
import { describe, expect, it } from 'vitest'
import { uploadsStorageFromEnv } from '../../server/services/uploads-storage'

const s3 = {
  TILTWRIGHT_UPLOADS_DRIVER: 's3',
  TILTWRIGHT_S3_ENDPOINT: 'http://127.0.0.1:9000',
  TILTWRIGHT_S3_BUCKET: 'school-files',
  TILTWRIGHT_S3_ACCESS_KEY_ID: 'made-up-id',
  TILTWRIGHT_S3_SECRET_ACCESS_KEY: 'made-up-secret',
}

describe('uploads storage from the environment', () => {
  it('keeps the build\'s local disk when nothing is said', () => {
    expect(uploadsStorageFromEnv({})).toEqual({ driver: 'fs' })
  })

  it('reads a whole S3 configuration, the region defaulting', () => {
    expect(uploadsStorageFromEnv(s3)).toEqual({
      driver: 's3',
      endpoint: 'http://127.0.0.1:9000',
      bucket: 'school-files',
      region: 'us-east-1',
      accessKeyId: 'made-up-id',
      secretAccessKey: 'made-up-secret',
    })
  })

  it('names every missing or malformed setting instead of guessing', () => {
    const r = uploadsStorageFromEnv({
      ...s3,
      TILTWRIGHT_S3_BUCKET: ' ',
      TILTWRIGHT_S3_SECRET_ACCESS_KEY: undefined,
      TILTWRIGHT_S3_ENDPOINT: 'bucket.example',
    })
    expect(r).toEqual({
      problems: [
        'TILTWRIGHT_S3_BUCKET is not set',
        'TILTWRIGHT_S3_SECRET_ACCESS_KEY is not set',
        'TILTWRIGHT_S3_ENDPOINT must be an http(s) address',
      ],
    })
    expect(uploadsStorageFromEnv({ TILTWRIGHT_UPLOADS_DRIVER: 'ftp' })).toEqual({
      problems: ['TILTWRIGHT_UPLOADS_DRIVER must be fs or s3, not "ftp"'],
    })
  })
})
