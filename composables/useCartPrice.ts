// The cart as the server prices it, refreshed whenever the cart's lines change.
import type { PricedCart } from '~~/shared/types/shop'

export function useCartPrice() {
  const cart = useCartStore()
  const api = useApi()
  const priced = ref<PricedCart | null>(null)
  const pending = ref(false)
  const error = ref('')
  let seq = 0

  async function refresh() {
    const mine = ++seq
    if (!cart.lines.length) { priced.value = null; return }
    pending.value = true
    try {
      const r = await api<PricedCart>('/api/cart/price', { method: 'POST', body: { lines: cart.lines } })
      if (mine === seq) { priced.value = r; error.value = '' }
    } catch (e) {
      if (mine === seq) error.value = toApiFailure(e).message
    } finally {
      if (mine === seq) pending.value = false
    }
  }
  onMounted(() => {
    cart.restore()
    watch(() => cart.lines, refresh, { deep: true, immediate: true })
  })
  return { priced, pending, error, refresh }
}
