// An admin rejects a purchase order with a reason: the order is cancelled, its stock
// released, and the teacher is told why.
import { and, eq } from 'drizzle-orm'
import { rejectSchema } from '../../../../../shared/schemas/shop'
import { purchaseOrders } from '../../../../database/schema'
import { poRejectedMail } from '../../../../emails/shop'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, rejectSchema)
  const id = await adminOrderStep(event, admin, 'reviewPo', async (tx, order) => {
    const [res] = await tx.update(purchaseOrders).set({ status: 'rejected', rejectReason: input.reason, reviewedById: admin.id, reviewedAt: new Date() })
      .where(and(eq(purchaseOrders.orderId, order.id), eq(purchaseOrders.status, 'review')))
    if (res.affectedRows !== 1) throw conflict('This purchase order has already been reviewed.', 'already-reviewed')
    await cancelOrderIn(tx, order, admin, `Rejected: ${input.reason.replace(/[.!]+$/, '')}.`)
    const { buyer, po } = await orderPeople(tx, order)
    const back = (await wayBackForOrder(tx, order, { status: 'rejected' }))!
    const what = { number: order.number!, poNumber: po!.poNumber, reason: input.reason }
    const mail = poRejectedMail(buyer.name, what, appUrl(`/orders/${order.id}`), { label: back.label, url: appUrl(back.url) })
    await enqueueMail(tx, 'po-rejected', buyer.email, mail)
    await audit(tx, { actorId: admin.id, action: 'order.po-rejected', subjectType: 'order', subjectId: order.id })
    return order.id
  })
  return replyWithOrder(id, admin)
})
