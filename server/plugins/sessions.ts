// nuxt-auth-utils answers /api/_auth/session from the cookie alone. These hooks make that
// answer agree with the database: a revoked session reads as signed out (and its cookie is
// cleared), and a live one carries the user as stored now (a confirmed address, a new name).
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const live = await liveSession(event)
    if (!live) {
      for (const key of Object.keys(session)) Reflect.deleteProperty(session, key)
      await getUserSession(event).then(s => s.user && clearUserSession(event))
      return
    }
    const user = toSessionUser(live.row)
    session.user = user
    await refreshSessionUser(event, user)
  })
  // DELETE /api/_auth/session (the client's clear()) ends the session's row too.
  sessionHooks.hook('clear', async (data) => {
    const sid = (data as { secure?: { sid?: string } }).secure?.sid
    if (sid) await revokeSessionBySid(sid)
  })
})
