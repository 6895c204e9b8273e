// The stores keep their own state in localStorage: read back as the store is created (on any
// page), written on every change, and gone from memory and storage after reset().
// Plain Node has no localStorage: a Map stands in for the browser's.
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import { useCartStore } from '../../../stores/cart'
import { usePlannerStore } from '../../../stores/planner'

class MemoryStorage {
  private items = new Map<string, string>()
  getItem(key: string) {
    return this.items.get(key) ?? null
  }

  setItem(key: string, value: string) {
    this.items.set(key, String(value))
  }

  removeItem(key: string) {
    this.items.delete(key)
  }

  clear() {
    this.items.clear()
  }
}
Object.defineProperty(globalThis, 'localStorage', { value: new MemoryStorage() })

const CART = 'tiltwright-cart-v1'
const PLANNER = 'tiltwright.planner.v1'

beforeEach(() => {
  localStorage.clear()
  setActivePinia(createPinia())
})

/** A new page load: a fresh Pinia over the same storage. */
const reload = () => setActivePinia(createPinia())

describe('cart store', () => {
  it('writes every change and reads it back after a reload', () => {
    const cart = useCartStore()
    cart.add(7, 2)
    cart.add(7, 1)
    expect(JSON.parse(localStorage.getItem(CART)!)).toEqual([{ productId: 7, quantity: 3 }])
    reload()
    expect(useCartStore().lines).toEqual([{ productId: 7, quantity: 3 }])
    expect(useCartStore().count).toBe(3)
  })

  it('drops damaged lines and damaged entries', () => {
    localStorage.setItem(CART, JSON.stringify([{ productId: 'x' }, { productId: 4, quantity: 1 }]))
    expect(useCartStore().lines).toEqual([{ productId: 4, quantity: 1 }])
    reload()
    localStorage.setItem(CART, '{not json')
    expect(useCartStore().lines).toEqual([])
    expect(localStorage.getItem(CART)).toBeNull()
  })

  it('reset() empties the cart in memory and in storage', () => {
    const cart = useCartStore()
    cart.add(3, 5)
    cart.reset()
    expect(cart.lines).toEqual([])
    expect(localStorage.getItem(CART)).toBeNull()
    reload()
    expect(useCartStore().lines).toEqual([])
    // Still kept after a reset: the next change is saved again.
    useCartStore().add(9, 1)
    expect(localStorage.getItem(CART)).toContain('"productId":9')
  })
})

describe('planner store', () => {
  it('restores the draft when first used on a page other than the planner', () => {
    const draft = usePlannerStore()
    draft.form.beamLengthMm = 450
    draft.gainSource = 'own'
    draft.ownGains.kp = 4.5
    draft.calibration[0]!.reading = 99
    reload()
    const again = usePlannerStore()
    expect(again.form.beamLengthMm).toBe(450)
    expect(again.gainSource).toBe('own')
    expect(again.ownGains.kp).toBe(4.5)
    expect(again.calibration[0]!.reading).toBe(99)
  })

  it('reset() forgets everything, in memory and in storage, even unopened since a reload', () => {
    const fresh = usePlannerStore()
    const defaults = JSON.parse(JSON.stringify(fresh.$state))
    fresh.form.beamLengthMm = 450
    fresh.presetId = null
    fresh.ownGains.kd = 2
    fresh.calibration.pop()
    fresh.sheet = { id: 5, title: 'Bench' }
    reload()
    // Sign-out on another page: the store is created there only to be reset.
    const store = usePlannerStore()
    expect(store.sheet?.title).toBe('Bench')
    store.reset()
    expect(localStorage.getItem(PLANNER)).toBeNull()
    expect(JSON.parse(JSON.stringify(store.$state))).toEqual(defaults)
    reload()
    expect(JSON.parse(JSON.stringify(usePlannerStore().$state))).toEqual(defaults)
  })
})
