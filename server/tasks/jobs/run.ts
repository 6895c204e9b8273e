// Runs every due durable job (server/utils/jobs.ts); scheduled in nuxt.config.ts.
export default defineTask({
  meta: {
    name: 'jobs:run',
    description: 'Run due jobs: mail, payment-provider calls, webhook deliveries, sweeps',
  },
  async run() {
    const finished = await runDueJobs()
    return { result: { finished } }
  },
})
