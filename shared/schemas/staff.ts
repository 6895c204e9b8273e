import { z } from 'zod'
import { listQuerySchema } from './list'
import { singleLine } from './text'

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
  email: z
    .string({ error: 'Enter the e-mail address.' })
    .trim()
    .toLowerCase()
    .min(1, 'Enter the e-mail address.')
    .max(254, 'That e-mail address is too long.')
    .pipe(z.email({ error: 'That does not look like an e-mail address.' })),
  role: z.enum(['support', 'admin'], { error: 'Staff are support or admin.' }),
})
