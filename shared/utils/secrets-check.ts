// Which secrets the server lacks, by the environment variable that sets each. The server
// refuses to start while any is missing (server/plugins/0.secrets.ts).
export interface SecretsSeen {
  sessionPassword: string
  csrfSecretFromEnv: string
  paymentsSecretKey: string
  paymentsWebhookSecret: string
}

export function missingSecrets(s: SecretsSeen): string[] {
  return [
    s.sessionPassword.length < 32 && 'NUXT_SESSION_PASSWORD (32 characters or more)',
    s.csrfSecretFromEnv.length !== 32 && 'NUXT_CSURF_ENCRYPT_SECRET (exactly 32 characters)',
    !s.paymentsSecretKey && 'NUXT_PAYMENTS_SECRET_KEY',
    !s.paymentsWebhookSecret && 'NUXT_PAYMENTS_WEBHOOK_SECRET',
  ].filter((x): x is string => !!x)
}
