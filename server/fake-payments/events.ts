// The fake's events: stored, then delivered to the app's webhook endpoint signed the way
// the SDK's constructEvent verifies them. A failed delivery is retried a few times.
import { signWebhookPayload } from '../services/payments'
import { getObject, newId, nowSeconds, publicView, putObject, type FakeObject } from './store'

const RETRY_DELAYS_MS = [1000, 5000, 20_000]

export async function emitEvent(type: string, object: FakeObject): Promise<FakeObject> {
  const evt: FakeObject = {
    id: newId('evt'), object: 'event', api_version: '2026-10-28.endive', created: nowSeconds(), livemode: false,
    type, pending_webhooks: 1, request: { id: null, idempotency_key: null }, data: { object: publicView(object) },
    _delivered: false, _attempts: 0,
  }
  await putObject(evt)
  await deliver(evt.id)
  return evt
}

async function deliver(eventId: string, attempt = 0): Promise<void> {
  const evt = await getObject('event', eventId)
  if (!evt || evt._delivered) return
  const payload = JSON.stringify(publicView(evt), null, 2)
  const target = new URL('/api/webhooks/payments', useRuntimeConfig().publicUrl).toString()
  let ok = false
  try {
    const res = await fetch(target, {
      method: 'POST', body: payload, signal: AbortSignal.timeout(8000),
      headers: { 'content-type': 'application/json', 'stripe-signature': signWebhookPayload(payload), 'user-agent': 'Tiltwright-FakePayments/1.0' },
    })
    ok = res.ok
  } catch { /* counted as a failed attempt */ }
  await putObject({ ...evt, _delivered: ok, _attempts: (evt._attempts ?? 0) + 1, pending_webhooks: ok ? 0 : 1 })
  const delay = RETRY_DELAYS_MS[attempt]
  if (!ok && delay !== undefined) setTimeout(() => { void deliver(eventId, attempt + 1).catch(() => {}) }, delay).unref?.()
}
