// A form's state: field errors from the shared zod schema first (instant, in the page),
// then from the server (the real gate). Input is never cleared on an error; a field's error
// clears once its value changes. `failures` counts failed submits: the form's
// BaseErrorSummary takes the focus on each.
import type { z } from 'zod'
import { fieldErrorsOf, type FieldErrors } from '~~/shared/utils/field-errors'

/** What a form's error summary reads from the form. */
export interface FormOutcome {
  errors: Ref<FieldErrors>
  message: Ref<string>
  failures: Ref<number>
}

function valueAt(values: unknown, path: string): string {
  let v: unknown = values
  for (const k of path.split('.')) v = (v as Record<string, unknown> | null)?.[k]
  return JSON.stringify(v ?? null)
}

export function useForm<S extends z.ZodType>(schema: S, initial: z.input<S>) {
  const values = reactive(structuredClone(initial as object)) as z.input<S>
  const errors = ref<FieldErrors>({})
  const message = ref('')
  const pending = ref(false)
  const failures = ref(0)
  // The value each erroneous field had when its error was given.
  let given: Record<string, string> = {}

  function fail(fields: FieldErrors, text: string) {
    errors.value = fields
    message.value = text
    given = Object.fromEntries(Object.keys(fields).map(k => [k, valueAt(values, k)]))
    failures.value++
  }

  watch(
    () => values,
    () => {
      const kept = Object.entries(errors.value).filter(
        ([k]) => !(k in given) || valueAt(values, k) === given[k],
      )
      if (kept.length < Object.keys(errors.value).length) errors.value = Object.fromEntries(kept)
    },
    { deep: true },
  )

  async function submit(send: (data: z.output<S>) => Promise<unknown>) {
    message.value = ''
    const parsed = schema.safeParse(toRaw(values))
    if (!parsed.success) {
      fail(fieldErrorsOf(parsed.error), 'Some fields need attention.')
      return false
    }
    errors.value = {}
    pending.value = true
    try {
      await send(parsed.data)
      return true
    } catch (e) {
      const f = toApiFailure(e)
      fail(f.fields, f.message)
      return false
    } finally {
      pending.value = false
    }
  }
  const outcome: FormOutcome = { errors, message, failures }
  return { values, errors, message, pending, failures, outcome, submit, fail }
}
