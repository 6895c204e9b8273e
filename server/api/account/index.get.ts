import { eq } from 'drizzle-orm'
import { schools } from '../../database/schema'
import type { AccountReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<AccountReply> => {
  const user = await requireUser(event)
  const [school] = user.schoolId
    ? await useDb().select().from(schools).where(eq(schools.id, user.schoolId)).limit(1)
    : []
  return { user, school: school ?? null }
})
