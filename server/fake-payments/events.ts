// The fake's events: stored, then delivered to the app's webhook endpoint by a durable job
// (kind `fake-webhook`), signed the way the SDK's constructEvent verifies them. A failed
// delivery is retried with back-off and survives a restart, as the provider's retries do.
import { signWebhookPayload } from '../services/payments'
import type { JobDefinition } from '../utils/jobs'
import { enqueueJob } from '../utils/jobs'
import { useDb } from '../utils/db'
import { getObject, newId, nowSeconds, publicView, putObject, type FakeObject } from './store'
import { simulatorSettings } from './simulator'

export async function emitEvent(type: string, object: FakeObject): Promise<FakeObject> {
  const evt: FakeObject = {
    id: newId('evt'),
    object: 'event',
    api_version: '2026-10-28.endive',
    created: nowSeconds(),
    livemode: false,
    type,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    data: { object: publicView(object) },
    _delivered: false,
    _attempts: 0,
  }
  await putObject(evt)
  await enqueueJob(useDb(), 'fake-webhook', { eventId: evt.id })
  return evt
}

export const fakeWebhookJob: JobDefinition<{ eventId: string }> = {
  maxAttempts: 10,
  async run({ eventId }) {
    const evt = await getObject('event', eventId)
    if (!evt || evt._delivered) return
    const attempts = (evt._attempts ?? 0) + 1
    let ok = false
    let why = ''
    try {
      if ((await simulatorSettings()).webhooks === 'fail')
        throw new Error('the simulator is set to fail webhook deliveries')
      const payload = JSON.stringify(publicView(evt), null, 2)
      const target = new URL('/api/webhooks/payments', useRuntimeConfig().publicUrl).toString()
      const res = await fetch(target, {
        method: 'POST',
        body: payload,
        signal: AbortSignal.timeout(8000),
        headers: {
          'content-type': 'application/json',
          'stripe-signature': signWebhookPayload(payload),
          'user-agent': 'Tiltwright-PaymentSimulator/1.0',
        },
      })
      ok = res.ok
      if (!ok) why = `the webhook answered ${res.status}`
    } catch (e) {
      why = e instanceof Error ? e.message : String(e)
    }
    await putObject({ ...evt, _delivered: ok, _attempts: attempts, pending_webhooks: ok ? 0 : 1 })
    if (!ok) throw new Error(`delivery ${attempts} of ${eventId} failed: ${why}`)
  },
}
