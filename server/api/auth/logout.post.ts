// Ends this browser's session: its row is revoked, so a copy of the cookie stops working too.
export default defineEventHandler(async (event) => {
  await endSession(event)
  return { ok: true }
})
