// The cart: only product ids and quantities, kept in localStorage across reloads. Prices,
// tiers, shipping and tax are never stored here; the server works them out every time.
// A quantity is kept exactly as the teacher typed it (even 0 or 99999): the cart page says
// what is wrong beside the line instead of quietly changing it (lineQuantityProblem).
import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { CartLine } from '~~/shared/schemas/shop'
import { lineQuantityProblem } from '~~/shared/utils/cart-lines'
import { persistInStorage } from './persist'

const KEY = 'tiltwright-cart-v1'

/** The lines of a saved cart that still make sense; anything else is dropped. */
function savedLines(saved: unknown): CartLine[] {
  if (!Array.isArray(saved)) return []
  return saved
    .filter(
      (l): l is CartLine => Number.isInteger(l?.productId) && typeof l?.quantity === 'number',
    )
    .map(l => ({ productId: l.productId, quantity: l.quantity }))
}

export const useCartStore = defineStore('cart', () => {
  const lines = ref<CartLine[]>([])
  const storage = persistInStorage(
    KEY,
    [lines],
    () => lines.value,
    (saved) => {
      lines.value = savedLines(saved)
    },
  )
  function add(productId: number, quantity: number) {
    const line = lines.value.find(l => l.productId === productId)
    if (line) line.quantity += quantity
    else lines.value.push({ productId, quantity })
  }
  function setQuantity(productId: number, quantity: number) {
    const line = lines.value.find(l => l.productId === productId)
    if (line) line.quantity = quantity
  }
  function remove(productId: number) {
    lines.value = lines.value.filter(l => l.productId !== productId)
  }
  function clear() {
    lines.value = []
  }
  /** Empties the cart in memory and in storage (signing out of a shared computer). */
  function reset() {
    storage.forget(clear)
  }
  const count = computed(() =>
    lines.value.reduce((s, l) => s + (lineQuantityProblem(l.quantity) ? 0 : l.quantity), 0),
  )
  /** The lines whose quantity can be priced and ordered at all (stock aside). */
  const validLines = computed(() => lines.value.filter(l => !lineQuantityProblem(l.quantity)))
  /** True when the cart holds exactly these lines (same products, same quantities). */
  function holds(other: readonly CartLine[]) {
    const key = (ls: readonly CartLine[]) =>
      ls
        .map(l => `${l.productId}:${l.quantity}`)
        .sort()
        .join(',')
    return lines.value.length > 0 && key(lines.value) === key(other)
  }

  return {
    lines,
    add,
    setQuantity,
    remove,
    clear,
    reset,
    count,
    validLines,
    holds,
  }
})
