import { eq } from 'drizzle-orm'
import { schools } from '../../database/schema'
import type { AccountReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<AccountReply> => {
  const user = await requireUser(event)
  // A builder (a student) is told nothing about the school's address or tax standing: their
  // build spaces name the school (GET /api/build-spaces).
  const [school] = user.schoolId && user.role !== 'builder'
    ? await useDb().select().from(schools).where(eq(schools.id, user.schoolId)).limit(1)
    : []
  return { user, school: school ?? null }
})
