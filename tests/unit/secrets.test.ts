import { mkdtempSync, readFileSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { installSecrets, secretsEnv } from '../../scripts/lib/secrets'
import { missingSecrets } from '../../shared/utils/secrets-check'

describe('per-install secrets', () => {
  it('are made once, kept private, and the same on the next start', () => {
    const file = join(mkdtempSync(join(tmpdir(), 'tw-secrets-')), 'secrets.json')
    const first = installSecrets(file)
    expect(statSync(file).mode & 0o777).toBe(0o600)
    expect(installSecrets(file)).toEqual(first)
    expect(first.csrfSecret).toHaveLength(32)
    expect(first.paymentsSecretKey).toMatch(/^sk_test_[0-9a-f]{48}$/)
    expect(JSON.parse(readFileSync(file, 'utf8'))).toEqual(first)
    const other = installSecrets(join(mkdtempSync(join(tmpdir(), 'tw-secrets-')), 'secrets.json'))
    expect(other.paymentsWebhookSecret).not.toBe(first.paymentsWebhookSecret)
  })

  it('never invents real payment credentials outside fake mode; the environment wins', () => {
    const s = installSecrets(join(mkdtempSync(join(tmpdir(), 'tw-secrets-')), 'secrets.json'))
    expect(secretsEnv(s, false, {}).NUXT_PAYMENTS_SECRET_KEY).toBe('')
    expect(secretsEnv(s, true, {}).NUXT_PAYMENTS_SECRET_KEY).toBe(s.paymentsSecretKey)
    expect(
      secretsEnv(s, false, { NUXT_PAYMENTS_SECRET_KEY: 'sk_live_x' }).NUXT_PAYMENTS_SECRET_KEY,
    ).toBe('sk_live_x')
  })

  it('names every missing secret by the variable that sets it', () => {
    const all = {
      sessionPassword: 'x'.repeat(32),
      csrfSecretFromEnv: 'y'.repeat(32),
      paymentsSecretKey: 'k',
      paymentsWebhookSecret: 'w',
    }
    expect(missingSecrets(all)).toEqual([])
    expect(
      missingSecrets({
        sessionPassword: '',
        csrfSecretFromEnv: '',
        paymentsSecretKey: '',
        paymentsWebhookSecret: '',
      }),
    ).toHaveLength(4)
  })
})
