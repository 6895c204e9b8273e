// Staff read what the local fake SMTP server caught. Exists only while the fakes are on.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'support', 'admin')
  const cfg = useRuntimeConfig()
  if (!cfg.fakePayments) throw notFound()
  try {
    return await $fetch<{ data: unknown[] }>('/messages', { baseURL: cfg.mailCatcherUrl })
  } catch {
    throw createError({ statusCode: 503, message: 'The local mail catcher is not running.', data: { code: 'catcher-down' } })
  }
})
