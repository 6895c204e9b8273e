// The teacher corrects the school's own address (it prefills checkout's ship-to and bill-to).
// Orders already placed keep the addresses they were placed with.
import { eq } from 'drizzle-orm'
import { schoolAddressSchema } from '../../../shared/schemas/address'
import { schools } from '../../database/schema'
import type { AccountReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<AccountReply> => {
  const user = await requireRole(event, 'teacher')
  const input = await readBodyAs(event, schoolAddressSchema)
  if (!user.schoolId) throw notFound('Your school')
  const school = await transactionWithRetry(async (tx) => {
    await tx.update(schools).set(input).where(eq(schools.id, user.schoolId!))
    await audit(tx, {
      actorId: user.id,
      action: 'school.address-changed',
      subjectType: 'school',
      subjectId: user.schoolId!,
    })
    return loadSchool(tx, user.schoolId!)
  })
  return { user, school }
})
