// Admins read what the local fake SMTP server caught: only in fake mode, and with every
// single-use link masked, so the viewer cannot be used to take over a customer's account.
import { maskSingleUseLinks } from '../../../shared/utils/mask-links'
import type { CaughtMailReply } from '../../../shared/types/staff'

interface Caught {
  text?: string
  html?: string | null
  [k: string]: unknown
}

export default defineEventHandler(async (event): Promise<CaughtMailReply> => {
  await requireRole(event, 'admin')
  const cfg = useRuntimeConfig()
  if (!cfg.fakePayments) throw notFound()
  let caught: { data: Caught[] }
  try {
    caught = await $fetch<{ data: Caught[] }>('/messages', { baseURL: cfg.mailCatcherUrl })
  } catch {
    throw createError({
      statusCode: 503,
      message: 'The local mail catcher is not running.',
      data: { code: 'catcher-down' },
    })
  }
  return {
    data: caught.data.map(m => ({
      ...m,
      text: maskSingleUseLinks(m.text ?? ''),
      html: m.html ? maskSingleUseLinks(m.html) : null,
    })),
  }
})
