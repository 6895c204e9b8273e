// The planner draft: the form in the builder's units, which gains are on the rig (the
// suggestion or the builder's own), and the calibration readings. Kept across reloads.
import { defineStore } from 'pinia'
import { DEFAULT_TARGETS, KIT_PRESETS } from '~~/shared/utils/planner/presets'
import { formFrom, type PlannerForm } from '~~/shared/utils/planner-form'
import type { Gains } from '~~/shared/utils/planner/schema'

const firstPreset = KIT_PRESETS[0]!

export interface CalibrationRow {
  reading: number | null
  positionMm: number | null
}

export const usePlannerStore = defineStore('planner', () => {
  const form = ref<PlannerForm>(formFrom(firstPreset.rig, DEFAULT_TARGETS))
  const presetId = ref<string | null>(firstPreset.id)
  const gainSource = ref<'suggested' | 'own'>('suggested')
  const ownGains = ref<Pick<Gains, 'kp' | 'kd' | 'ki'>>({ kp: 0, kd: 0, ki: 0 })
  const calibration = ref<CalibrationRow[]>([
    { reading: 102, positionMm: 40 },
    { reading: 310, positionMm: 120 },
    { reading: 512, positionMm: 200 },
    { reading: 716, positionMm: 280 },
    { reading: 921, positionMm: 360 },
  ])
  /** The sheet the draft was opened from, if any. */
  const sheet = ref<{ id: number, title: string, note?: string | null } | null>(null)

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

  function reset() {
    form.value = formFrom(firstPreset.rig, DEFAULT_TARGETS)
    presetId.value = firstPreset.id
    gainSource.value = 'suggested'
    sheet.value = null
  }

  return { form, presetId, gainSource, ownGains, calibration, sheet, applyPreset, reset }
})
