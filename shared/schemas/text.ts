// Text rules shared by every schema: what a person types, never control characters.
import { z } from 'zod'

// C0 and C1 control characters and DEL; multi-line text may keep tab, line feed and carriage
// return.
// eslint-disable-next-line no-control-regex -- finding control characters is the point
const SINGLE_LINE_BAD = /[\u0000-\u001f\u007f-\u009f]/
// eslint-disable-next-line no-control-regex -- as above
const MULTI_LINE_BAD = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/

export const SINGLE_LINE_MESSAGE
  = 'Use ordinary characters only: no line breaks or control characters.'
export const MULTI_LINE_MESSAGE = 'Use ordinary characters only: no control characters.'

/**
 * A one-line field (names, titles, codes): refuses NUL, CR, LF and every other control character.
 */
export const singleLine = <S extends z.ZodType<string>>(schema: S) =>
  schema.refine(v => !SINGLE_LINE_BAD.test(v), SINGLE_LINE_MESSAGE)

/** A free-text field (a note, a reason): line breaks are fine, other control characters are not. */
export const multiLine = <S extends z.ZodType<string | null | undefined>>(schema: S) =>
  schema.refine(v => v == null || !MULTI_LINE_BAD.test(v), MULTI_LINE_MESSAGE)

/** A whole number written as a number or as plain decimal digits; never true, [3] or "0x10".
 *  `message` answers what is no number at all, `fractionMessage` a number with a fraction. */
export const wholeNumber = (message: string, fractionMessage = message) =>
  z.preprocess(
    v => (typeof v === 'string' && /^\s*\d{1,9}\s*$/.test(v) ? Number(v) : v),
    z.number({ error: message }).int(fractionMessage),
  )

/** A database id: a positive whole number, written in plain decimal when it arrives as text. */
export const plainId = (message: string) =>
  z.preprocess(
    v => (typeof v === 'string' && /^[1-9]\d{0,15}$/.test(v) ? Number(v) : v),
    z
      .number({ error: message })
      .int(message)
      .positive(message)
      .max(Number.MAX_SAFE_INTEGER, message),
  )
