// The stores keep their own state in localStorage: read back as the store is created (on any
// page), written on every change, and gone from memory and storage after reset().
// Plain Node has no localStorage: a Map stands in for the browser's.
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import { useCartStore } from '../../../stores/cart'
import { draftForRig, usePlannerStore, type PlannerDraft } from '../../../stores/planner'
import { KIT_PRESETS } from '../../../shared/utils/planner/presets'
import type { RigView } from '../../../shared/types/build'

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

describe('planner store, a saved draft the planner refuses', () => {
  it('does not restore a 5000 Hz loop rate and names the range, before and after a reload', () => {
    const draft = usePlannerStore()
    draft.form.beamLengthMm = 450
    draft.form.loopRateHz = 5000
    reload()
    const store = usePlannerStore()
    // The kit's own values, not the refused draft (none of it: the beam length too).
    expect(store.form.loopRateHz).toBe(KIT_PRESETS[0]!.rig.loopRate)
    expect(store.form.beamLengthMm).toBe(KIT_PRESETS[0]!.rig.beamLength * 1000)
    expect(store.refusedDraft).toEqual([expect.stringMatching(/Loop rate must be at most 1000 Hz/)])
    // The refused draft is gone from storage: the next reload starts clean, without the notice.
    expect(localStorage.getItem(PLANNER)).toBeNull()
    reload()
    expect(usePlannerStore().form.loopRateHz).toBe(KIT_PRESETS[0]!.rig.loopRate)
    expect(usePlannerStore().refusedDraft).toBeNull()
  })

  it('gives an old draft without the servo and sensor details their defaults', () => {
    const {
      sensorReversed: _r,
      servoCenterUs: _c,
      servoResolution: _s,
      adcNoiseCounts: _n,
      ...old
    } = { ...usePlannerStore().form, beamLengthMm: 420 }
    localStorage.setItem(PLANNER, JSON.stringify({ form: old }))
    reload()
    const store = usePlannerStore()
    expect(store.refusedDraft).toBeNull()
    expect(store.form).toMatchObject({
      beamLengthMm: 420,
      sensorReversed: false,
      servoCenterUs: null,
      servoResolution: 'microsecond',
      adcNoiseCounts: null,
    })
  })
})

describe('planner store, planning for a rig (?rig=)', () => {
  const benchRig = { id: 3, name: 'Tall Tower', serial: 'TW-10001-03', groupLabel: 'Bench 2' }
  const rigValues = (d: PlannerDraft): PlannerDraft => ({
    ...d,
    form: { ...d.form, beamLengthMm: 612 },
    calibration: [{ reading: 1, positionMm: 2 }],
  })
  const saved = () => JSON.parse(localStorage.getItem(PLANNER)!)

  it('puts the draft aside, keeps only the draft in storage, and brings it back on leaving', () => {
    const store = usePlannerStore()
    store.form.beamLengthMm = 450
    store.sheet = { id: 9, title: 'Mine' }
    store.planForRig(benchRig, rigValues)
    expect(store.rig).toEqual(benchRig)
    expect(store.form.beamLengthMm).toBe(612)
    store.form.leverArmMm = 31
    expect(saved().form.beamLengthMm).toBe(450)
    expect(saved().form.leverArmMm).not.toBe(31)
    store.leaveRig()
    expect(store.rig).toBeNull()
    expect(store.form.beamLengthMm).toBe(450)
    expect(store.form.leverArmMm).not.toBe(31)
    expect(store.sheet).toEqual({ id: 9, title: 'Mine' })
    expect(store.calibration).toHaveLength(5)
    expect(saved().form.beamLengthMm).toBe(450)
  })

  it('reloads as the ordinary draft: the rig is never kept', () => {
    const store = usePlannerStore()
    store.form.beamLengthMm = 450
    store.planForRig(benchRig, rigValues)
    reload()
    const again = usePlannerStore()
    expect(again.rig).toBeNull()
    expect(again.form.beamLengthMm).toBe(450)
  })

  it('a second rig starts from the draft, not from the first rig', () => {
    const store = usePlannerStore()
    store.form.beamLengthMm = 450
    store.planForRig(benchRig, rigValues)
    store.form.beamLengthMm = 700
    store.planForRig({ ...benchRig, id: 4 }, d => d)
    expect(store.form.beamLengthMm).toBe(450)
    store.leaveRig()
    expect(store.form.beamLengthMm).toBe(450)
  })

  it('reset() (signing out) leaves the rig and forgets the draft too', () => {
    const store = usePlannerStore()
    store.form.beamLengthMm = 450
    store.planForRig(benchRig, rigValues)
    store.reset()
    expect(store.rig).toBeNull()
    expect(localStorage.getItem(PLANNER)).toBeNull()
    store.leaveRig()
    expect(store.form.beamLengthMm).not.toBe(450)
  })
})

describe('draftForRig', () => {
  const preset = KIT_PRESETS.find(p => p.id === 'classroom-12')!.rig
  const draft = (): PlannerDraft => {
    const d = JSON.parse(JSON.stringify(usePlannerStore().$state)) as PlannerDraft
    d.form.overshootPct = 4
    d.form.form = 'PID'
    d.form.beamLengthMm = 999
    return d
  }
  const sheetWith = (overshootPct: number) => ({
    id: 7,
    title: 'Newest',
    inputs: {
      rig: preset,
      targets: {
        overshootPct,
        settlingTime: 3,
        form: 'PD' as const,
        derivativeFilterN: 10,
        method: 'lag-aware' as const,
        derivativeOn: 'measurement' as const,
      },
      gains: { kp: 5, kd: 1.5, ki: 0, n: 10, derivativeOn: 'measurement' as const },
    },
  }) as unknown as RigView['sheets'][number]

  it('fills the rig from its dimensions and keeps the draft\'s targets without sheets', () => {
    const d = draftForRig(draft(), { dimensions: preset, calibration: null, sheets: [] })
    expect(d.form.beamLengthMm).toBe(400)
    expect(d.form.leverArmMm).toBe(12)
    expect(d.form.overshootPct).toBe(4)
    expect(d.form.form).toBe('PID')
    expect(d.presetId).toBeNull()
    expect(d.gainSource).toBe(draft().gainSource)
  })

  it('takes the newest sheet\'s targets and gains', () => {
    const d = draftForRig(draft(), {
      dimensions: preset,
      calibration: null,
      sheets: [sheetWith(12), sheetWith(30)],
    })
    expect(d.form.overshootPct).toBe(12)
    expect(d.form.settlingTime).toBe(3)
    expect(d.form.form).toBe('PD')
    expect(d.gainSource).toBe('own')
    expect(d.ownGains).toEqual({ kp: 5, kd: 1.5, ki: 0 })
    expect(d.sheet).toBeNull()
  })

  it('keeps the draft\'s rig when the rig has no dimensions yet', () => {
    const d = draftForRig(draft(), { dimensions: null, calibration: null, sheets: [] })
    expect(d.form).toEqual(draft().form)
  })

  it('brings the rig\'s calibration readings in mm', () => {
    const d = draftForRig(draft(), {
      dimensions: null,
      calibration: {
        adcBits: 10,
        pairs: [
          { reading: 100, position: 0.04 },
          { reading: 920, position: 0.36 },
        ],
      } as RigView['calibration'],
      sheets: [],
    })
    expect(d.calibration).toEqual([
      { reading: 100, positionMm: 40 },
      { reading: 920, positionMm: 360 },
    ])
  })
})
