import { eq } from 'drizzle-orm'
import { accountSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'
import type { UserReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<UserReply> => {
  const user = await requireUser(event)
  const { name } = await readBodyAs(event, accountSchema)
  await useDb().update(users).set({ name }).where(eq(users.id, user.id))
  const updated = { ...user, name }
  await refreshSessionUser(event, updated)
  return { user: updated }
})
