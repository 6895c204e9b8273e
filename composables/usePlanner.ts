// Live planner results for the draft: the suggestion, the check of the gains on the rig, the
// drawn response (the scenario: a setpoint step, optionally a nudge, a P-only run and a saved
// sheet to compare), the stability map, the loop view, the what-if envelope and the servo
// jitter. Every heavy computation is a planner job run off the page's thread (usePlannerJob), so
// typing never blocks; only the form's check and the shaping of answers run here.
// usePlannerRig() plans for a rig of a build space (?rig=ID).

import { bringUpSteps } from '~~/shared/utils/planner/commissioning'
import { proportionalOscillation } from '~~/shared/utils/planner/compare'
import { plantOf } from '~~/shared/utils/planner/plant'
import type { Gains } from '~~/shared/utils/planner/schema'
import type { SimulateOptions, SimulationResult } from '~~/shared/utils/planner/simulate'
import type { SheetInputs } from '~~/shared/schemas/planner'
import type { ResponseSeries } from '~/components/planner/PlannerResponsePlot.vue'
import { checkPlannerForm } from '~~/shared/utils/planner-form'
import {
  mapRequest,
  PAGE_LOOP_VIEW_POINTS,
  responseScenario,
} from '~~/shared/utils/planner-page'
import type { RigView } from '~~/shared/types/build'
import { draftForRig, type PlannerRig } from '~/stores/planner'

export interface OverlaySheet {
  id: number
  title: string
  inputs: SheetInputs
}

const toSeries = (
  label: string,
  r: SimulationResult,
  tone: ResponseSeries['tone'],
  dashed = false,
): ResponseSeries => ({
  label,
  tone,
  dashed,
  t: r.t,
  x: r.x.map(v => v * 1000),
  angle: r.beamAngle.map(v => (v * 180) / Math.PI),
})

export function usePlanner() {
  const store = usePlannerStore()
  const check = computed(() => checkPlannerForm(store.form))
  const inputs = computed(() =>
    check.value.ok ? { rig: check.value.rig, targets: check.value.targets } : null,
  )
  const planJob = usePlannerJob('plan', () => inputs.value)
  const plan = planJob.result
  /** What the firmware runs (Tustin falls back to backward Euler where it is refused). */
  const discretization = computed(
    () => plan.value?.discretization ?? inputs.value?.targets.discretization ?? 'backward-euler',
  )

  const gains = computed<Gains | null>(() => {
    if (!inputs.value) return null
    const t = inputs.value.targets
    if (store.gainSource === 'own') {
      const g = store.ownGains
      if (!(g.kp > 0) || !(g.kd >= 0) || !(g.ki >= 0)) return null
      return {
        kp: g.kp,
        kd: g.kd,
        ki: t.form === 'PID' ? g.ki : 0,
        n: t.derivativeFilterN,
        derivativeOn: t.derivativeOn,
      }
    }
    return plan.value?.gains ?? null
  })

  /** The rig and gains the builder's own gains are checked on; null for the suggestion. */
  const ownArgs = () =>
    inputs.value && gains.value && store.gainSource === 'own'
      ? { rig: inputs.value.rig, gains: gains.value }
      : null
  const analyzeJob = usePlannerJob('analyze', () => {
    const a = ownArgs()
    return a && plan.value ? { ...a, options: { discretization: discretization.value } } : null
  })
  const firmwareJob = usePlannerJob('firmware', () => {
    const a = ownArgs()
    return a && plan.value ? { ...a, options: { discretization: discretization.value } } : null
  })
  const analysis = computed(() =>
    store.gainSource === 'suggested' ? (plan.value?.analysis ?? null) : analyzeJob.result.value,
  )
  const firmware = computed(() =>
    store.gainSource === 'suggested' ? (plan.value?.firmware ?? null) : firmwareJob.result.value,
  )

  /** The suggestion as the builder's own gains (for P only: the P gain the plan draws). */
  function useSuggestion() {
    const g = plan.value?.gains ?? plan.value?.proportional
    if (g) store.ownGains = { kp: g.kp, kd: g.kd, ki: g.ki }
  }

  const showPOnly = ref(false)
  const showNudge = ref(true)
  const showEnvelope = ref(false)
  /** A saved sheet whose predicted response is drawn beside the current one. */
  const overlay = ref<OverlaySheet | null>(null)

  /** P only: the gains the method gives, drawn with the verdict (there is no suggestion). */
  const proportional = computed(() =>
    inputs.value?.targets.form === 'P' ? (plan.value?.proportional ?? null) : null,
  )
  /** The gains the response is drawn for: the ones on the rig, or P only's. */
  const drawnGains = computed(() => gains.value ?? proportional.value)

  /** The scenario every drawn run shares (the current rig's start and setpoint change). */
  const scenario = computed<SimulateOptions | null>(() =>
    inputs.value && plan.value
      ? responseScenario(
          inputs.value.rig,
          inputs.value.targets,
          discretization.value,
          showNudge.value,
        )
      : null,
  )

  const mainRun = usePlannerJob('simulate', () =>
    inputs.value && drawnGains.value && scenario.value
      ? { rig: inputs.value.rig, gains: drawnGains.value, options: scenario.value }
      : null,
  )
  const pOnlyRun = usePlannerJob('simulate', () =>
    showPOnly.value && !proportional.value && inputs.value && gains.value && scenario.value
      ? {
          rig: inputs.value.rig,
          gains: { ...gains.value, kd: 0, ki: 0 },
          options: scenario.value,
        }
      : null,
  )
  const overlayRun = usePlannerJob('simulate', () => {
    const o = overlay.value
    const s = scenario.value
    if (!o || !s || !inputs.value) return null
    // The saved rig from the same start, setpoint change and nudge as the current plot.
    const oMid = (o.inputs.rig.sensorLength ?? o.inputs.rig.beamLength) / 2
    const step = s.setpoint! - s.initialPosition!
    return {
      rig: o.inputs.rig,
      gains: o.inputs.gains,
      options: {
        ...s,
        initialPosition: oMid,
        initialSetpoint: oMid,
        setpoint: oMid + step,
        discretization: o.inputs.targets.discretization,
      },
    }
  })
  const envelopeJob = usePlannerJob('envelope', () =>
    showEnvelope.value && inputs.value && gains.value && scenario.value
      ? { rig: inputs.value.rig, gains: gains.value, options: scenario.value }
      : null,
  )
  const envelope = envelopeJob.result

  const response = computed(() => {
    const main = mainRun.result.value
    if (!main || !drawnGains.value) return null
    const label = proportional.value
      ? 'P only'
      : store.gainSource === 'own'
        ? 'your gains'
        : 'suggested'
    const series: ResponseSeries[] = [toSeries(label, main, 'main')]
    if (pOnlyRun.result.value)
      series.push(toSeries('P only, same Kp', pOnlyRun.result.value, 'compare', true))
    if (overlayRun.result.value && overlay.value)
      series.push(toSeries(`sheet: ${overlay.value.title}`, overlayRun.result.value, 'ghost', true))
    const env = envelope.value
    return {
      series,
      setpoint: { t: main.t, x: main.setpoint.map(v => v * 1000) },
      events: main.events,
      band: env ? { t: env.t, lowerMm: env.lowerMm, upperMm: env.upperMm } : null,
    }
  })

  /** The swing P only predicts: its ideal period and how fast it grows (cheap: one pole). */
  const pOnly = computed(() => {
    if (!inputs.value) return null
    const kp = proportional.value?.kp ?? gains.value?.kp
    if (!kp) return null
    const plant = plantOf(inputs.value.rig)
    return { oscillation: proportionalOscillation(plant.kb, kp, plant.servoLag, plant.period) }
  })

  const mapJob = usePlannerJob('map', () => {
    if (!inputs.value || !plan.value) return null
    const ref = plan.value.gains ?? plan.value.rejectedGains ?? gains.value ?? proportional.value
    if (!ref) return null
    return mapRequest(inputs.value.rig, inputs.value.targets, ref, discretization.value)
  })
  const map = mapJob.result

  const loopViewJob = usePlannerJob('loopView', () =>
    inputs.value && gains.value && plan.value
      ? {
          rig: inputs.value.rig,
          gains: gains.value,
          options: { discretization: discretization.value, points: PAGE_LOOP_VIEW_POINTS },
        }
      : null,
  )
  const jitterJob = usePlannerJob('jitter', () =>
    inputs.value && gains.value && plan.value && inputs.value.rig.adcNoiseCounts
      ? { rig: inputs.value.rig, gains: gains.value, discretization: discretization.value }
      : null,
  )

  /** The ordered first power-up with these constants (cheap: words from numbers). */
  const bringUp = computed(() =>
    inputs.value && gains.value && firmware.value
      ? bringUpSteps(inputs.value.rig, gains.value, firmware.value)
      : [],
  )

  /** Any job still computing: the page shows a quiet "updating…" and keeps the last results. */
  const jobs = [planJob, analyzeJob, firmwareJob, mainRun, pOnlyRun, overlayRun, envelopeJob,
    mapJob, loopViewJob, jitterJob]
  const busy = computed(() => jobs.some(j => j.busy.value))

  /** A job that failed (a bug, not bad input: the form's check catches that), in words. */
  const failure = computed(() => jobs.map(j => j.error.value).find(e => e) ?? null)

  /** Picking a point on the stability map puts its Kp and Kd on the rig as the builder's own. */
  function pick(p: { kp: number, kd: number }) {
    if (store.gainSource !== 'own') useSuggestion()
    store.gainSource = 'own'
    store.ownGains = { ...store.ownGains, kp: p.kp, kd: p.kd }
  }

  return {
    store,
    check,
    inputs,
    plan,
    gains,
    analysis,
    firmware,
    discretization,
    useSuggestion,
    showPOnly,
    showNudge,
    showEnvelope,
    overlay,
    proportional,
    response,
    envelope,
    pOnly,
    map,
    loopView: loopViewJob.result,
    jitter: jitterJob.result,
    bringUp,
    busy,
    failure,
    pick,
  }
}

/** How planning for a rig stands: no rig asked for, loading, ready, or why not. */
export type PlannerRigStatus = 'none' | 'loading' | 'ready' | 'signed-out' | 'missing' | 'failed'

const rigRef = (v: RigView): PlannerRig => ({
  id: v.id,
  name: v.name,
  serial: v.serial,
  groupLabel: v.groupLabel,
})

/**
 * Planning for a rig of a build space (/planner?rig=ID): reads the rig, puts the draft aside and
 * fills the form from the rig. Without the id (or on leaving the page) the draft comes back; a rig
 * that cannot be read leaves the ordinary planner working.
 */
export function usePlannerRig(rigId: Ref<number | null>) {
  const store = usePlannerStore()
  const { user } = useCurrentUser()
  const view = ref<RigView | null>(null)
  const status = ref<PlannerRigStatus>('none')

  async function load(id: number | null) {
    if (!id || !user.value) {
      view.value = null
      status.value = id ? 'signed-out' : 'none'
      store.leaveRig()
      return
    }
    status.value = 'loading'
    try {
      const v = await $fetch<RigView>(`/api/rigs/${id}`)
      if (rigId.value !== id) return
      view.value = v
      status.value = 'ready'
      // A new rig fills the form; the same one again (a refresh) leaves the builder's edits.
      if (store.rig?.id === id) store.rig = rigRef(v)
      else store.planForRig(rigRef(v), d => draftForRig(d, v))
    } catch (e) {
      if (rigId.value !== id) return
      view.value = null
      store.leaveRig()
      status.value = toApiFailure(e).status === 404 ? 'missing' : 'failed'
    }
  }

  onMounted(() => {
    watch([rigId, () => user.value?.id], () => load(rigId.value), { immediate: true })
  })
  onBeforeUnmount(() => store.leaveRig())

  /** The server's answer to a change of the rig (dimensions, calibration): the band follows. */
  function follow(v: RigView) {
    view.value = v
    store.rig = rigRef(v)
  }

  return { view, status, follow, reload: () => load(rigId.value) }
}
