// A form's state: field errors from the shared zod schema first (instant, in the page),
// then from the server (the real gate). Input is never cleared on an error.
import type { z } from 'zod'
import { fieldErrorsOf, type FieldErrors } from '~~/shared/utils/field-errors'

export function useForm<S extends z.ZodType>(schema: S, initial: z.input<S>) {
  const values = reactive(structuredClone(initial as object)) as z.input<S>
  const errors = ref<FieldErrors>({})
  const message = ref('')
  const pending = ref(false)

  async function submit(send: (data: z.output<S>) => Promise<unknown>) {
    message.value = ''
    const parsed = schema.safeParse(toRaw(values))
    if (!parsed.success) {
      errors.value = fieldErrorsOf(parsed.error)
      message.value = 'Some fields need attention.'
      return false
    }
    errors.value = {}
    pending.value = true
    try {
      await send(parsed.data)
      return true
    } catch (e) {
      const f = toApiFailure(e)
      errors.value = f.fields
      message.value = f.message
      return false
    } finally {
      pending.value = false
    }
  }
  return { values, errors, message, pending, submit }
}
