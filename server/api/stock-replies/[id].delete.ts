// Archives a stock reply: gone from the list, still named on the messages that used it.
import { and, eq, isNull } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { stockReplies } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'support', 'admin')
  const { id } = paramsAs(event, idParams, 'That stock reply')
  await useDb().transaction(async (tx) => {
    const [res] = await tx
      .update(stockReplies)
      .set({ archivedAt: new Date() })
      .where(and(eq(stockReplies.id, id), isNull(stockReplies.archivedAt)))
    if (res.affectedRows !== 1) throw notFound('That stock reply')
    await audit(tx, {
      actorId: user.id,
      action: 'stock-reply.archive',
      subjectType: 'stock-reply',
      subjectId: id,
    })
  })
  return sendNoContent(event)
})
