import { useMailTransport } from '../services/mail'

// Starts the outbox's delivery loop and the card-hold sweep with the server, and closes the pool and SMTP
// connections when the server stops.
export default defineNitroPlugin((nitro) => {
  const interval = setInterval(() => { void runOutbox().catch((e) => console.error('[outbox]', e)) }, 5000)
  interval.unref?.()
  scheduleOutboxRun(1000)
  // Unpaid card orders past their hold give their stock back (every 10 minutes unless configured).
  const sweepMs = Number(useRuntimeConfig().cardHoldSweepMs) || 600_000
  const sweep = setInterval(() => { void expireUnpaidCardOrders().catch((e) => console.error('[card holds]', e)) }, sweepMs)
  sweep.unref?.()
  nitro.hooks.hook('close', async () => {
    clearInterval(interval)
    clearInterval(sweep)
    useMailTransport().close()
    await closeDb()
  })
})
