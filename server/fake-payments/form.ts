// The provider's request bodies are form-encoded with brackets:
// `line_items[0][price_data][unit_amount]=1200&metadata[orderId]=7`. This turns them back
// into nested objects, with all-numeric keys becoming arrays.
export type FormValue = string | FormValue[] | { [k: string]: FormValue }

export function parseBracketForm(body: string): Record<string, FormValue> {
  const root: Record<string, any> = {}
  for (const [key, value] of new URLSearchParams(body)) {
    const parts = key.replace(/\]/g, '').split('[')
    let node = root
    parts.forEach((part, i) => {
      if (i === parts.length - 1) node[part] = value
      else node = node[part] ??= {}
    })
  }
  return arrayify(root) as Record<string, FormValue>
}

function arrayify(node: unknown): unknown {
  if (node === null || typeof node !== 'object') return node
  const obj = node as Record<string, unknown>
  const keys = Object.keys(obj)
  const out: Record<string, unknown> = {}
  for (const k of keys) out[k] = arrayify(obj[k])
  if (keys.length && keys.every(k => /^\d+$/.test(k)))
    return keys
      .map(Number)
      .sort((a, b) => a - b)
      .map(k => out[String(k)])
  return out
}

export const asInt = (v: FormValue | undefined, fallback = 0) =>
  typeof v === 'string' && /^-?\d+$/.test(v) ? Number(v) : fallback
export const asString = (v: FormValue | undefined) => (typeof v === 'string' ? v : undefined)
export const asRecord = (v: FormValue | undefined): Record<string, string> =>
  v && typeof v === 'object' && !Array.isArray(v)
    ? (Object.fromEntries(Object.entries(v).filter(([, x]) => typeof x === 'string')) as Record<
        string,
        string
      >)
    : {}
export const asList = (v: FormValue | undefined): FormValue[] => (Array.isArray(v) ? v : [])
