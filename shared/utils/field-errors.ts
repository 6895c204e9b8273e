// One shape for validation errors on both sides: { field.path: first message }.
import type { z } from 'zod'

export type FieldErrors = Record<string, string>

export function fieldErrorsOf(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {}
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_'
    if (!(key in out)) out[key] = issue.message
  }
  return out
}
