// Public pages for signed-out visitors come from a snapshot (server/utils/snapshots.ts): the
// page is rendered once per SNAPSHOT_MAX_AGE_MS for everyone without a session cookie, instead
// of once per visitor. A signed-in person (a session cookie) always gets a fresh render.
// A snapshot carries nothing of one visitor: no Set-Cookie and no CSRF token (useApi() fetches
// one from /api/csrf-token before the first write), and the CSP nonce is replaced by a fresh
// one on every reply, so no two replies share one. A path no page matches (modules/
// page-routes.ts) gets one shared snapshot of the 404 page, whoever asks: an unknown address
// costs what a static file costs instead of a whole render.
import { randomBytes } from 'node:crypto'
import pageRoutes from '#page-routes'

/** The internal render that makes a snapshot carries this header (and skips this middleware). */
const RENDERING = 'x-tiltwright-snapshot'
const PUBLIC_PAGES = [
  /^\/$/,
  /^\/kits$/,
  /^\/kits\/[a-z0-9][a-z0-9-]{0,79}$/,
  /^\/help$/,
  /^\/planner$/,
  /^\/safety$/,
]
const KNOWN_PAGES = pageRoutes.map(p => new RegExp(p))
/** Paths that are not pages: the API, built assets, the fake payment service. */
const NOT_PAGES = /^\/(api|_nuxt|__nuxt\w*|v1|fake-pay)(\/|$)/
/** What the shared 404 snapshot is rendered from: a path no page matches. */
const UNKNOWN = '/-/not-a-page'
const DROPPED_HEADERS = new Set(['set-cookie', 'content-length', 'transfer-encoding', 'date'])

interface Page {
  status: number
  headers: [string, string][]
  body: string
  nonce: string | null
}

const pages = snapshots(
  async (path: string): Promise<Page> => {
    const res = await useNitroApp().localFetch(path, {
      headers: { [RENDERING]: '1', accept: 'text/html' },
    })
    const body = (await res.text()).replace(/<meta name="csrf-token" content="[^"]*">/g, '')
    const headers = [...res.headers.entries()].filter(([k]) => !DROPPED_HEADERS.has(k))
    const csp = res.headers.get('content-security-policy') ?? ''
    return { status: res.status, headers, body, nonce: csp.match(/'nonce-([^']+)'/)?.[1] ?? null }
  },
  { maxKeys: 200, keep: p => p.status === 200 || p.status === 404 },
)

export default defineEventHandler(async (event) => {
  if (event.method !== 'GET' && event.method !== 'HEAD') return
  if (getRequestHeader(event, RENDERING) || hasSessionCookie(event)) return
  const pathname = event.path.split('?')[0]!
  let path = event.path
  if (!PUBLIC_PAGES.some(p => p.test(pathname))) {
    if (NOT_PAGES.test(pathname) || KNOWN_PAGES.some(p => p.test(pathname))) return
    path = UNKNOWN
  }
  const page = await pages(path)
  const nonce = page.nonce && randomBytes(16).toString('base64')
  setResponseStatus(event, page.status)
  for (const [k, v] of page.headers)
    setResponseHeader(event, k, nonce ? v.replaceAll(page.nonce!, nonce) : v)
  return nonce ? page.body.replaceAll(page.nonce!, nonce) : page.body
})
