// An admin adds a support or admin colleague. They get a link to choose their password.
import { randomBytes } from 'node:crypto'
import { createStaffSchema } from '../../../../shared/schemas/staff'
import { users } from '../../../database/schema'
import { staffInvitationMail } from '../../../emails/staff'
import { hoursToMs, LINK_LIFETIME_HOURS } from '../../../../shared/utils/lifetimes'
import type { CreatedReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, createStaffSchema)
  const passwordHash = await hashPassword(randomBytes(24).toString('base64url'))
  const id = await uniqueOr409('email', 'Someone already uses that e-mail address.', () =>
    transactionWithRetry(async (tx) => {
      const [row] = await tx
        .insert(users)
        .values({ ...input, passwordHash, verifiedAt: null })
        .$returningId()
      // After the insert: its unique e-mail key keeps two invitations of one address apart.
      if (!(await takeMailQuota(tx, 'staff-invitation', input.email))) {
        throw tooManyRequests(
          'That address was sent several invitations this hour. Try again later.',
          3600,
        )
      }
      // The invitation is a password-setting link that lives longer than a reset's.
      const lifetime = hoursToMs(LINK_LIFETIME_HOURS.invitation)
      const token = await issueToken(tx, row!.id, 'reset-password', lifetime)
      await enqueueMail(
        tx,
        'staff-invitation',
        input.email,
        staffInvitationMail(input.name, admin.name, input.role, appUrl(`/reset-password/${token}`)),
      )
      await audit(tx, {
        actorId: admin.id,
        action: 'staff.created',
        subjectType: 'user',
        subjectId: row!.id,
        detail: { role: input.role },
      })
      return row!.id
    }),
  )
  setResponseStatus(event, 201)
  return { id }
})
