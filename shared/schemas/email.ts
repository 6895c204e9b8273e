// The one e-mail address rule of every form and route that takes an address.
import { z } from 'zod'

/** An e-mail address, trimmed and lower-cased; `label` names it in the "Enter …" message. */
export const emailAddress = (label = 'the e-mail address') =>
  z
    .string({ error: `Enter ${label}.` })
    .trim()
    .toLowerCase()
    .min(1, `Enter ${label}.`)
    .max(254, 'That e-mail address is too long.')
    .pipe(z.email({ error: 'That does not look like an e-mail address.' }))
