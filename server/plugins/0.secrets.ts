// No secret ships in the source: the session password, the CSRF secret, the payment key and
// the webhook signing secret come from the environment (`npm start` makes per-install ones
// under data/ in fake mode). Without them the server says which are missing and stops.
import { missingSecrets } from '../../shared/utils/secrets-check'

export default defineNitroPlugin(() => {
  const cfg = useRuntimeConfig()
  const missing = missingSecrets({
    sessionPassword: String(cfg.session?.password ?? ''),
    csrfSecretFromEnv: process.env.NUXT_CSURF_ENCRYPT_SECRET ?? '',
    paymentsSecretKey: String(cfg.paymentsSecretKey ?? ''),
    paymentsWebhookSecret: String(cfg.paymentsWebhookSecret ?? ''),
  })
  if (!missing.length) return
  const how = cfg.fakePayments
    ? 'Start Tiltwright with `npm start`, which makes per-install secrets under data/, or set '
    + 'them yourself.'
    : 'Outside fake-payment mode, set the payment provider\'s real key and webhook signing secret.'
  console.error(`[tiltwright] refusing to start: missing ${missing.join(', ')}. ${how}`)
  process.exit(1)
})
