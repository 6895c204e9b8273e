// An admin marks a shipped order delivered.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const id = await visibleOrderId(event, admin)
  await markDelivered(admin, id)
  return replyWithOrder(id, admin)
})
