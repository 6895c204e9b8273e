// A CSRF token on demand. Pages served to signed-out visitors come from a snapshot shared by
// everyone (server/utils/snapshots.ts), so they carry no token; useApi() asks here before its
// first write. Each caller gets its own secret cookie (nuxt-csurf's, made here when missing)
// and a token for it; the answer is never stored by a cache.
import * as csrf from 'uncsrf'

type Algorithm = Parameters<typeof csrf.create>[2]
let key: Promise<csrf.EncryptSecret> | undefined

export default defineEventHandler(async (event): Promise<{ token: string }> => {
  const config = useRuntimeConfig().csurf as {
    cookieKey: string
    cookie: Parameters<typeof setCookie>[3]
    encryptSecret: string
    encryptAlgorithm?: Algorithm
  }
  key ??= csrf.importEncryptSecret(config.encryptSecret, config.encryptAlgorithm)
  let secret = getCookie(event, config.cookieKey)
  if (!secret) {
    secret = csrf.randomSecret()
    setCookie(event, config.cookieKey, secret, config.cookie)
  }
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return { token: await csrf.create(secret, await key, config.encryptAlgorithm) }
})
