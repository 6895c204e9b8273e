// The cart as the server prices it, refreshed whenever the cart's lines change. Only lines with
// a usable quantity are sent; the others are listed with their problem and no price, and the
// cart cannot be ordered or quoted until every line is fine (`problems`, `orderable`).
import type { PricedCart } from '~~/shared/types/shop'
import { lineQuantityProblem } from '~~/shared/utils/cart-lines'

interface LineInfo {
  name: string
  slug: string
  image: string
}

/** `shipToState`, when given, prices the tax for that destination (checkout's ship-to). */
export function useCartPrice(shipToState?: Ref<string | null | undefined>) {
  const cart = useCartStore()
  const api = useApi()
  const priced = ref<PricedCart | null>(null)
  const pending = ref(false)
  const error = ref('')
  /** Names and pictures of products seen so far, for lines that cannot be priced. */
  const info = ref<Record<number, LineInfo>>({})
  let seq = 0

  async function refresh() {
    const mine = ++seq
    if (!cart.lines.length) {
      priced.value = null
      return
    }
    pending.value = true
    try {
      const sent = cart.validLines
      const r = sent.length
        ? await api<PricedCart>('/api/cart/price', {
            method: 'POST',
            body: {
              lines: sent,
              ...(shipToState?.value ? { shipToState: shipToState.value } : {}),
            },
          })
        : null
      if (
        cart.lines.some(
          l => !info.value[l.productId] && !r?.lines.some(p => p.productId === l.productId),
        )
      ) {
        const all = await api<{ data: (LineInfo & { id: number })[] }>('/api/products')
        for (const p of all.data) info.value[p.id] = { name: p.name, slug: p.slug, image: p.image }
      }
      for (const l of r?.lines ?? [])
        info.value[l.productId] = { name: l.name, slug: l.slug, image: l.image }
      if (mine === seq) {
        priced.value = r
        error.value = ''
      }
    } catch (e) {
      if (mine === seq) error.value = toApiFailure(e).message
    } finally {
      if (mine === seq) pending.value = false
    }
  }

  /** Every cart line as typed, with its price when it has one and what is wrong with it. */
  const rows = computed(() =>
    cart.lines.map((l) => {
      const p = priced.value?.lines.find(x => x.productId === l.productId)
      const problem = lineQuantityProblem(l.quantity, p?.available)
      return {
        productId: l.productId,
        quantity: l.quantity,
        priced: problem ? null : (p ?? null),
        info: p ?? info.value[l.productId] ?? null,
        problem,
      }
    }),
  )
  const problems = computed(() => rows.value.filter(r => r.problem).length)
  const orderable = computed(
    () =>
      !!priced.value
      && !pending.value
      && cart.lines.length > 0
      && problems.value === 0
      && priced.value.lines.length === cart.lines.length,
  )

  onMounted(() => {
    watch(() => cart.lines, refresh, { deep: true, immediate: true })
    if (shipToState) watch(shipToState, refresh)
  })
  return { priced, pending, error, refresh, rows, problems, orderable }
}
