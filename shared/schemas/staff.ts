import { z } from 'zod'
import { emailAddress } from './email'
import { listQuerySchema } from './list'
import { singleLine } from './text'
import { STAFF_ROLES } from '../utils/roles'

const staffRole = z.enum(STAFF_ROLES, { error: 'Staff are support or admin.' })

export const staffListQuery = listQuerySchema(
  ['name', 'email', 'role', 'createdAt'] as const,
  'name',
)

export const createStaffSchema = z.object({
  name: singleLine(
    z
      .string({ error: 'Enter the name.' })
      .trim()
      .min(1, 'Enter the name.')
      .max(120, 'Keep the name to 120 characters or fewer.'),
  ),
  email: emailAddress(),
  role: staffRole,
})

/** PATCH /api/admin/staff/[id]: a new role, or disabling (true) or enabling (false) the account. */
export const updateStaffSchema = z
  .object({
    role: staffRole.optional(),
    disabled: z.boolean({ error: 'Disabled is true or false.' }).optional(),
  })
  .refine(v => v.role !== undefined || v.disabled !== undefined, {
    message: 'Say what to change: the role or whether the account is disabled.',
  })
export type UpdateStaffInput = z.output<typeof updateStaffSchema>
