// The cart: only product ids and quantities, kept in localStorage across reloads. Prices,
// tiers, shipping and tax are never stored here; the server works them out every time.
import { defineStore } from 'pinia'
import type { CartLine } from '~~/shared/schemas/shop'
import { MAX_LINE_QUANTITY } from '~~/shared/schemas/shop'

const KEY = 'tiltwright-cart-v1'

export const useCartStore = defineStore('cart', () => {
  const lines = ref<CartLine[]>([])
  const restored = ref(false)

  function restore() {
    if (!import.meta.client || restored.value) return
    try {
      const raw = JSON.parse(localStorage.getItem(KEY) ?? '[]') as unknown
      if (Array.isArray(raw)) {
        lines.value = raw.filter((l): l is CartLine => Number.isInteger(l?.productId) && Number.isInteger(l?.quantity) && l.quantity > 0)
          .map((l) => ({ productId: l.productId, quantity: Math.min(l.quantity, MAX_LINE_QUANTITY) }))
      }
    } catch { /* a damaged entry starts an empty cart */ }
    restored.value = true
  }

  watch(lines, (v) => { if (import.meta.client && restored.value) localStorage.setItem(KEY, JSON.stringify(v)) }, { deep: true })

  function add(productId: number, quantity: number) {
    const line = lines.value.find((l) => l.productId === productId)
    if (line) line.quantity = Math.min(MAX_LINE_QUANTITY, line.quantity + quantity)
    else lines.value.push({ productId, quantity: Math.min(MAX_LINE_QUANTITY, quantity) })
  }
  function setQuantity(productId: number, quantity: number) {
    const line = lines.value.find((l) => l.productId === productId)
    if (line && Number.isInteger(quantity) && quantity > 0) line.quantity = Math.min(MAX_LINE_QUANTITY, quantity)
  }
  function remove(productId: number) { lines.value = lines.value.filter((l) => l.productId !== productId) }
  function clear() { lines.value = [] }
  const count = computed(() => lines.value.reduce((s, l) => s + l.quantity, 0))

  return { lines, restored, restore, add, setQuantity, remove, clear, count }
})
