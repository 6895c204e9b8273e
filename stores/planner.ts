// The planner draft: the form in the builder's units, which gains are on the rig (the
// suggestion or the builder's own), and the calibration readings. Kept across reloads.
import { defineStore, skipHydrate } from 'pinia'
import { ref, toRaw } from 'vue'
import { DEFAULT_TARGETS, KIT_PRESETS } from '~~/shared/utils/planner/presets'
import { checkPlannerForm, formFrom, type PlannerForm } from '~~/shared/utils/planner-form'
import type { Gains } from '~~/shared/utils/planner/schema'
import type { RigView } from '~~/shared/types/build'
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

/** The rig being planned for: what the planner's band names. */
export interface PlannerRig {
  id: number
  name: string
  serial: string
  groupLabel: string | null
}

/** Everything the draft holds, as one value (put aside while planning for a rig). */
export interface PlannerDraft {
  form: PlannerForm
  presetId: string | null
  gainSource: GainSource
  ownGains: OwnGains
  calibration: CalibrationRow[]
  sheet: OpenedSheet | null
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

/** The form's target fields: what a rig's measurements leave as they are. */
const TARGET_FIELDS = [
  'overshootPct',
  'settlingTime',
  'form',
  'derivativeFilterN',
  'method',
  'derivativeOn',
  'stepSizeMm',
  'integralPole',
  'discretization',
] as const satisfies readonly (keyof PlannerForm)[]

const targetsOf = (f: PlannerForm) =>
  Object.fromEntries(TARGET_FIELDS.map(k => [k, f[k]])) as Pick<
    PlannerForm,
    (typeof TARGET_FIELDS)[number]
  >

/**
 * The draft for planning on a rig: its measured dimensions (when saved) with the targets of its
 * newest sheet, or else the draft's own; the newest sheet's gains as the builder's own; the
 * rig's calibration readings. Without dimensions the draft's rig values stay.
 */
export function draftForRig(
  d: PlannerDraft,
  view: Pick<RigView, 'dimensions' | 'calibration' | 'sheets'>,
): PlannerDraft {
  const newest = view.sheets[0]
  const out: PlannerDraft = { ...d, sheet: null }
  if (view.dimensions) {
    out.form = newest
      ? formFrom(view.dimensions, newest.inputs.targets)
      : { ...formFrom(view.dimensions, DEFAULT_TARGETS), ...targetsOf(d.form) }
    out.presetId = null
  }
  if (newest) {
    out.gainSource = 'own'
    const g = newest.inputs.gains
    out.ownGains = { kp: g.kp, kd: g.kd, ki: g.ki }
  }
  if (view.calibration?.pairs.length) {
    out.calibration = view.calibration.pairs.map(p => ({
      reading: p.reading,
      positionMm: Number((p.position * 1000).toPrecision(6)),
    }))
  }
  return out
}

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
  /** The rig being planned for; null for the ordinary draft. Never kept in storage. */
  const rig = ref<PlannerRig | null>(null)
  /** The ordinary draft, put aside while planning for a rig. */
  let putAside: PlannerDraft | null = null
  /**
   * Why the saved draft was not restored: its values the planner refuses (a loop rate out of
   * range, say), each in the check's words; null when it was restored or there was none.
   */
  const refusedDraft = ref<string[] | null>(null)

  const draft = (): PlannerDraft =>
    structuredClone({
      form: toRaw(form.value),
      presetId: presetId.value,
      gainSource: gainSource.value,
      ownGains: toRaw(ownGains.value),
      calibration: toRaw(calibration.value).map(r => ({ ...toRaw(r) })),
      sheet: sheet.value ? { ...toRaw(sheet.value) } : null,
    })

  function load(d: PlannerDraft) {
    form.value = d.form
    presetId.value = d.presetId
    gainSource.value = d.gainSource
    ownGains.value = d.ownGains
    calibration.value = d.calibration
    sheet.value = d.sheet
  }

  const storage = persistInStorage(
    KEY,
    [form, presetId, gainSource, ownGains, calibration, sheet],
    // While planning for a rig, storage keeps the draft that was put aside.
    () => (rig.value && putAside ? putAside : draft()),
    (saved) => {
      if (!isObject(saved)) return
      // A field the draft did not have when it was saved keeps its default. A draft the check
      // refuses is not restored at all (it could freeze the page), and the builder is told why.
      if (isObject(saved.form)) {
        const restored = { ...defaultForm(), ...saved.form } as PlannerForm
        const check = checkPlannerForm(restored)
        if (!check.ok) {
          refusedDraft.value = Object.values(check.errors)
          localStorage.removeItem(KEY)
          return
        }
        form.value = restored
      }
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
    rig.value = null
    putAside = null
  }

  /**
   * Plans for a rig: the draft is put aside (once, however many times this is called) and
   * `change` gets a copy of it to turn into the rig's values.
   */
  function planForRig(which: PlannerRig, change: (d: PlannerDraft) => PlannerDraft) {
    if (!rig.value) putAside = draft()
    const base = rig.value?.id === which.id ? draft() : structuredClone(putAside!)
    rig.value = which
    load(change(base))
  }

  /** Back to the ordinary draft, as it was before planning for a rig. */
  function leaveRig() {
    if (!rig.value) return
    const back = putAside
    rig.value = null
    putAside = null
    if (back) load(back)
  }

  /** Forgets the draft in memory and in storage: "Start again", and signing out of a shared
   *  classroom computer. */
  function reset() {
    storage.forget(defaults)
    refusedDraft.value = null
  }

  return {
    form,
    presetId,
    gainSource,
    ownGains,
    calibration,
    sheet,
    rig,
    // Read from storage in the browser: the server's empty copy must not overwrite it.
    refusedDraft: skipHydrate(refusedDraft),
    applyPreset,
    planForRig,
    leaveRig,
    reset,
  }
})
