// The simulator's fault switch, kept with its objects in the database so every app instance
// sees it. `api: 'fail'` answers every SDK call with a 503, `api: 'slow'` answers after a
// pause, `webhooks: 'fail'` makes every event delivery fail. Set through
// POST /v1/simulator/settings (with the secret key), which tests use to rehearse outages.
import { getObject, putObject } from './store'

export interface SimulatorSettings {
  api: 'normal' | 'fail' | 'slow'
  webhooks: 'deliver' | 'fail'
  slowMs: number
}

const DEFAULTS: SimulatorSettings = { api: 'normal', webhooks: 'deliver', slowMs: 1500 }
const ID = 'simulator_settings'

export async function simulatorSettings(): Promise<SimulatorSettings> {
  const row = await getObject('simulator', ID)
  return { ...DEFAULTS, ...(row?.settings ?? {}) }
}

export async function updateSimulator(change: Partial<Record<keyof SimulatorSettings, string>>) {
  const now = await simulatorSettings()
  const next: SimulatorSettings = {
    api: (['normal', 'fail', 'slow'] as const).find(v => v === change.api) ?? now.api,
    webhooks: (['deliver', 'fail'] as const).find(v => v === change.webhooks) ?? now.webhooks,
    slowMs: Math.min(30_000, Math.max(0, Number(change.slowMs ?? now.slowMs) || 0)),
  }
  await putObject({ id: ID, object: 'simulator', settings: next })
  return next
}
