// A table's sort, filter and page kept in the address, so a reload or a shared link shows the
// same rows. Each key is read from the query through the route's own schema (a bad value
// falls back to its default) and written back with router.replace, defaults left out.
import type { z } from 'zod'

export function useUrlQuery<T extends Record<string, string | number>>(
  schema: z.ZodType,
  defaults: T,
): { [K in keyof T]: Ref<T[K]> } {
  const route = useRoute()
  const router = useRouter()
  const refs = {} as { [K in keyof T]: Ref<T[K]> }
  for (const key of Object.keys(defaults) as (keyof T & string)[]) {
    const raw = route.query[key]
    const text = Array.isArray(raw) ? raw[0] : raw
    let value = defaults[key]
    if (typeof text === 'string' && text !== '') {
      const one = schema.safeParse({ [key]: text })
      const parsed = one.success ? (one.data as Record<string, unknown>)[key] : undefined
      if (parsed !== undefined && typeof parsed === typeof defaults[key])
        value = parsed as T[typeof key]
    }
    refs[key] = ref(value) as Ref<T[typeof key]>
  }
  watch(Object.values(refs), () => {
    const query: Record<string, string | undefined> = {}
    for (const [k, v] of Object.entries(route.query)) if (typeof v === 'string') query[k] = v
    for (const key of Object.keys(defaults)) {
      const v = refs[key as keyof T].value
      query[key] = v === defaults[key] ? undefined : String(v)
    }
    router.replace({ query })
  })
  return refs
}
