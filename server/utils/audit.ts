import { auditLog } from '../database/schema'

export async function audit(
  tx: DbOrTx,
  entry: {
    actorId: number | null
    action: string
    subjectType?: string
    subjectId?: number
    detail?: Record<string, unknown>
  },
) {
  await tx
    .insert(auditLog)
    .values({
      actorId: entry.actorId,
      action: entry.action,
      subjectType: entry.subjectType,
      subjectId: entry.subjectId,
      detail: entry.detail,
    })
}
