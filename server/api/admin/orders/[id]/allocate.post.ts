// An admin confirms the units held for the order, batch by batch, for packing.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const id = await visibleOrderId(event, admin)
  await allocateOrder(admin, id)
  return replyWithOrder(id, admin)
})
