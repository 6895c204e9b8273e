// Per-install secrets: made once, on first start, and kept in data/secrets.json (mode 600,
// never committed; data/ is ignored). The environment wins where it sets one, and outside
// fake-payment mode the payment key and webhook secret must come from the environment.
import { randomBytes } from 'node:crypto'
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname } from 'node:path'

export interface InstallSecrets {
  sessionPassword: string
  csrfSecret: string
  paymentsSecretKey: string
  paymentsWebhookSecret: string
}

/** New random secrets in the shapes their users expect (the CSRF cipher takes 32 bytes). */
export function newSecrets(): InstallSecrets {
  return {
    sessionPassword: randomBytes(32).toString('hex'),
    csrfSecret: randomBytes(16).toString('hex'),
    paymentsSecretKey: `sk_test_${randomBytes(24).toString('hex')}`,
    paymentsWebhookSecret: `whsec_${randomBytes(24).toString('hex')}`,
  }
}

/** The install's secrets, made and saved on first use; a file missing a field gets it added. */
export function installSecrets(file: string): InstallSecrets {
  const saved = existsSync(file)
    ? (JSON.parse(readFileSync(file, 'utf8')) as Partial<InstallSecrets>)
    : {}
  const fresh = newSecrets()
  const all = {
    ...fresh,
    ...Object.fromEntries(Object.entries(saved).filter(([, v]) => typeof v === 'string' && v)),
  }
  if (JSON.stringify(all) !== JSON.stringify(saved)) {
    mkdirSync(dirname(file), { recursive: true })
    writeFileSync(file, `${JSON.stringify(all, null, 2)}\n`, { mode: 0o600 })
  }
  chmodSync(file, 0o600)
  return all
}

/** The environment variables the app reads them from (Nuxt's runtime config). */
export function secretsEnv(
  s: InstallSecrets,
  fakePayments: boolean,
  env: NodeJS.ProcessEnv = process.env,
) {
  return {
    NUXT_SESSION_PASSWORD: env.NUXT_SESSION_PASSWORD || s.sessionPassword,
    NUXT_CSURF_ENCRYPT_SECRET: env.NUXT_CSURF_ENCRYPT_SECRET || s.csrfSecret,
    // Real payment credentials are never made up: outside fake mode only the environment's count.
    NUXT_PAYMENTS_SECRET_KEY:
      env.NUXT_PAYMENTS_SECRET_KEY || (fakePayments ? s.paymentsSecretKey : ''),
    NUXT_PAYMENTS_WEBHOOK_SECRET:
      env.NUXT_PAYMENTS_WEBHOOK_SECRET || (fakePayments ? s.paymentsWebhookSecret : ''),
  }
}
