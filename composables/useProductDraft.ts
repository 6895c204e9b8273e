// Editing one catalog product: the draft in the admin's units (dollars), the field errors the
// shared product schema finds, and the confirm-then-publish step that shows the tier table
// as the shop will before the prices go live.
import type { ProductDetail } from '~~/shared/types/shop'
import { productSchema } from '~~/shared/schemas/shop'
import { fieldErrorsOf } from '~~/shared/utils/field-errors'
import { parseDollars } from '~~/shared/utils/pricing'

export interface ProductDraft {
  id: number | null
  slug: string
  name: string
  kind: 'kit' | 'part'
  summary: string
  description: string
  weightGrams: number
  active: boolean
  image: string
  tiers: { minQuantity: number, price: string }[]
}

function draftOf(p: ProductDetail | null): ProductDraft {
  if (!p) {
    return {
      id: null,
      slug: '',
      name: '',
      kind: 'part',
      summary: '',
      description: '',
      weightGrams: 100,
      active: true,
      image: '/catalog/part.svg',
      tiers: [{ minQuantity: 1, price: '' }],
    }
  }
  return {
    id: p.id,
    slug: p.slug,
    name: p.name,
    kind: p.kind,
    summary: p.summary,
    description: p.description,
    weightGrams: p.weightGrams,
    active: p.active,
    image: p.image,
    tiers: p.priceTiers.map(t => ({
      minQuantity: t.minQuantity,
      price: (t.unitPriceCents / 100).toFixed(2),
    })),
  }
}

/** The draft as the route reads it, plus the field errors the shared schema finds in it (a
 *  price that is not a price gets its own message, since the schema only sees cents). */
export function checkProductDraft(d: ProductDraft) {
  const found: Record<string, string> = {}
  const tiers = d.tiers.map((t, i) => {
    const cents = parseDollars(String(t.price ?? ''))
    if (cents === null) found[`tiers.${i}.unitPriceCents`] = 'Enter a price like 24.50.'
    return { minQuantity: Number(t.minQuantity), unitPriceCents: cents ?? 1 }
  })
  const { id: _id, tiers: _t, ...rest } = d
  const body = { ...rest, tiers }
  const parsed = productSchema.safeParse(body)
  return { body, errors: { ...(parsed.success ? {} : fieldErrorsOf(parsed.error)), ...found } }
}

export function useProductDraft(product: ProductDetail | null) {
  const api = useApi()
  const draft = ref<ProductDraft>(draftOf(product))
  const errors = ref<Record<string, string>>({})
  const message = ref('')
  /** The checked body waiting for the admin to confirm its tier table (the shop's wording). */
  const preview = ref<ReturnType<typeof checkProductDraft>['body'] | null>(null)

  // Once errors show, each one goes away as soon as the user corrects its field; no new ones
  // appear while typing (those wait for the next Save). Any change takes the preview away.
  watch(
    draft,
    (d) => {
      preview.value = null
      if (!Object.keys(errors.value).length) return
      const now = checkProductDraft(d).errors
      errors.value = Object.fromEntries(
        Object.entries(errors.value)
          .filter(([k]) => k in now)
          .map(([k]) => [k, now[k]!]),
      )
      if (!Object.keys(errors.value).length) message.value = ''
    },
    { deep: true },
  )

  function save() {
    const { body, errors: found } = checkProductDraft(draft.value)
    errors.value = found
    message.value = ''
    if (Object.keys(found).length) {
      message.value = 'Some fields need attention.'
      return
    }
    const tiers = [...body.tiers].sort((a, b) => a.minQuantity - b.minQuantity)
    preview.value = { ...body, tiers }
  }

  /** Sends the previewed product; true once the server has it. */
  async function publish() {
    const d = draft.value
    const body = preview.value!
    try {
      if (d.id) await api(`/api/admin/products/${d.id}`, { method: 'PATCH', body })
      else await api('/api/admin/products', { method: 'POST', body })
      return true
    } catch (e) {
      const f = toApiFailure(e)
      errors.value = f.fields
      message.value = f.message
      return false
    }
  }

  function addTier() {
    const last = draft.value.tiers.at(-1)?.minQuantity ?? 0
    draft.value.tiers.push({ minQuantity: last + 5, price: '' })
  }

  return { draft, errors, message, preview, save, publish, addTier }
}
