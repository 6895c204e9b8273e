import { useMailTransport } from '../services/mail'

// With the server: make sure the recurring card-hold sweep exists as a job, and run what is
// due soon after start. On close: stop the job timer, close SMTP and the database pool.
export default defineNitroPlugin((nitro) => {
  const start = setTimeout(() => {
    void enqueueJob(useDb(), 'sweep-card-holds', {}, { uniqueKey: 'sweep-card-holds' }).catch(e =>
      console.error(
        '[jobs] could not schedule the card-hold sweep:',
        e instanceof Error ? e.message : e,
      ),
    )
  }, 500)
  start.unref?.()
  nitro.hooks.hook('close', async () => {
    clearTimeout(start)
    stopJobTimer()
    useMailTransport().close()
    await closeDb()
  })
})
