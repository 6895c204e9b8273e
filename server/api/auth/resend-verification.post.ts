export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  if (user.verified) return { sent: false, verified: true }
  await useDb().transaction((tx) => sendVerification(tx, user))
  return { sent: true }
})
