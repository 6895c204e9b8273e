// Edge rules for every request. An id in an API path is plain decimal: a segment that would
// read as a number some other way (0x1, 1e0, 01, +1) is no id, so it answers 404 before any
// route turns it into one. A state-changing request that says where it comes from
// (Origin, else Referer) must come from Tiltwright's own pages; the CSRF token is checked as
// well (nuxt-security). Callers without a browser origin (the payment provider's webhook and
// the local fake's API and pages) are exempt. And answers about a signed-in person (any API
// reply, any page rendered with a session cookie) are never stored by a cache.
import { isDisguisedNumber } from '../../shared/utils/path-ids'

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
const NO_BROWSER_ORIGIN = ['/api/webhooks/', '/v1/', '/fake-pay/']

function hostOf(value: string): string | null {
  try {
    return new URL(value).host
  } catch {
    return null
  }
}

export default defineEventHandler((event) => {
  const path = event.path
  if (path.startsWith('/api/') && path.split('?')[0]!.split('/').some(isDisguisedNumber))
    throw notFound()
  if (path.startsWith('/api/') || hasSessionCookie(event)) {
    setResponseHeader(event, 'Cache-Control', 'no-store')
  }

  if (!STATE_CHANGING.has(event.method) || NO_BROWSER_ORIGIN.some(p => path.startsWith(p))) return
  const claimed = getRequestHeader(event, 'origin') ?? getRequestHeader(event, 'referer')
  if (claimed === undefined) return
  const allowed = [getRequestHost(event), hostOf(useRuntimeConfig().publicUrl)]
  const host = hostOf(claimed)
  if (!host || !allowed.includes(host)) {
    throw createError({
      statusCode: 403,
      statusMessage: 'Forbidden',
      message: 'This request did not come from a Tiltwright page.',
      data: { code: 'bad-origin' },
    })
  }
})
