// The planner draft: the form in the builder's units, which gains are on the rig (the
// suggestion or the builder's own), and the calibration readings. Kept across reloads.
import { defineStore } from 'pinia'
import { ref } from 'vue'
import { DEFAULT_TARGETS, KIT_PRESETS } from '~~/shared/utils/planner/presets'
import { formFrom, type PlannerForm } from '~~/shared/utils/planner-form'
import type { Gains } from '~~/shared/utils/planner/schema'
import { persistInStorage } from './persist'

const KEY = 'tiltwright.planner.v1'
const firstPreset = KIT_PRESETS[0]!

export interface CalibrationRow {
  reading: number | null
  positionMm: number | null
}
type OwnGains = Pick<Gains, 'kp' | 'kd' | 'ki'>
type GainSource = 'suggested' | 'own'
interface OpenedSheet {
  id: number
  title: string
  note?: string | null
}

const defaultForm = () => formFrom(firstPreset.rig, DEFAULT_TARGETS)
const defaultOwnGains = (): OwnGains => ({ kp: 0, kd: 0, ki: 0 })
const defaultCalibration = (): CalibrationRow[] => [
  { reading: 102, positionMm: 40 },
  { reading: 310, positionMm: 120 },
  { reading: 512, positionMm: 200 },
  { reading: 716, positionMm: 280 },
  { reading: 921, positionMm: 360 },
]

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v)

export const usePlannerStore = defineStore('planner', () => {
  const form = ref<PlannerForm>(defaultForm())
  const presetId = ref<string | null>(firstPreset.id)
  const gainSource = ref<GainSource>('suggested')
  const ownGains = ref<OwnGains>(defaultOwnGains())
  const calibration = ref<CalibrationRow[]>(defaultCalibration())
  /** The sheet the draft was opened from, if any. */
  const sheet = ref<OpenedSheet | null>(null)

  const storage = persistInStorage(
    KEY,
    [form, presetId, gainSource, ownGains, calibration, sheet],
    () => ({
      form: form.value,
      presetId: presetId.value,
      gainSource: gainSource.value,
      ownGains: ownGains.value,
      calibration: calibration.value,
      sheet: sheet.value,
    }),
    (saved) => {
      if (!isObject(saved)) return
      // A field the draft did not have when it was saved keeps its default.
      if (isObject(saved.form)) form.value = { ...defaultForm(), ...saved.form } as PlannerForm
      if (typeof saved.presetId === 'string' || saved.presetId === null)
        presetId.value = saved.presetId
      if (saved.gainSource === 'suggested' || saved.gainSource === 'own')
        gainSource.value = saved.gainSource
      if (isObject(saved.ownGains)) ownGains.value = { ...defaultOwnGains(), ...saved.ownGains }
      if (Array.isArray(saved.calibration))
        calibration.value = saved.calibration.filter(isObject) as unknown as CalibrationRow[]
      if (isObject(saved.sheet) || saved.sheet === null)
        sheet.value = saved.sheet as OpenedSheet | null
    },
  )

  function applyPreset(id: string) {
    const preset = KIT_PRESETS.find(p => p.id === id)
    if (!preset) return
    const targets = { ...form.value }
    form.value = {
      ...formFrom(preset.rig, DEFAULT_TARGETS),
      overshootPct: targets.overshootPct,
      settlingTime: targets.settlingTime,
      form: targets.form,
      method: targets.method,
      derivativeOn: targets.derivativeOn,
      derivativeFilterN: targets.derivativeFilterN,
    }
    presetId.value = id
  }

  function defaults() {
    form.value = defaultForm()
    presetId.value = firstPreset.id
    gainSource.value = 'suggested'
    ownGains.value = defaultOwnGains()
    calibration.value = defaultCalibration()
    sheet.value = null
  }

  /** Forgets the draft in memory and in storage: "Start again", and signing out of a shared
   *  classroom computer. */
  function reset() {
    storage.forget(defaults)
  }

  return {
    form,
    presetId,
    gainSource,
    ownGains,
    calibration,
    sheet,
    applyPreset,
    reset,
  }
})
