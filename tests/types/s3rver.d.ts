// s3rver ships no types: the little of it the uploads test uses.
declare module 's3rver' {
  export default class S3rver {
    constructor(options: {
      address?: string
      port?: number
      silent?: boolean
      directory: string
      configureBuckets?: { name: string, configs: string[] }[]
    })

    run(): Promise<unknown>
    close(): Promise<void>
  }
}

declare module 's3rver/lib/models/account.js' {
  interface Account {
    createKeyPair(accessKeyId: string, secretAccessKey: string): void
    revokeAccessKey(accessKeyId: string): void
  }
  const AWSAccount: { DUMMY_ACCOUNT: Account }
  export default AWSAccount
}
