import { useMailTransport } from '../services/mail'

// Starts the outbox's delivery loop with the server and closes the pool and SMTP
// connections when the server stops.
export default defineNitroPlugin((nitro) => {
  const interval = setInterval(() => { void runOutbox().catch((e) => console.error('[outbox]', e)) }, 5000)
  interval.unref?.()
  scheduleOutboxRun(1000)
  nitro.hooks.hook('close', async () => {
    clearInterval(interval)
    useMailTransport().close()
    await closeDb()
  })
})
