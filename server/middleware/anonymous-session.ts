// A caller without a session cookie is signed out: answer nuxt-auth-utils' session read
// (GET /api/_auth/session, which every page render asks too) at once. The module's own handler
// would make a new empty session, seal it and set it as a cookie on every such call.
export default defineEventHandler((event) => {
  if (event.method !== 'GET' || event.path.split('?')[0] !== '/api/_auth/session') return
  if (hasSessionCookie(event)) return
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return {}
})
