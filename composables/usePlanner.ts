// Live planner results, computed in the browser from the draft on every change: the
// suggestion, the check of the gains on the rig, the drawn response (the scenario: a setpoint
// step, optionally a nudge, a P-only run and a saved sheet to compare) and the stability map.
// usePlannerRig() plans for a rig of a build space (?rig=ID).

import { analyzeLoop } from '~~/shared/utils/planner/analyze'
import { firmwareConstants } from '~~/shared/utils/planner/firmware'
import { planGains } from '~~/shared/utils/planner/plan'
import type { Gains } from '~~/shared/utils/planner/schema'
import { compareProportionalAndPd } from '~~/shared/utils/planner/compare'
import { stabilityMap } from '~~/shared/utils/planner/map'
import { simulate } from '~~/shared/utils/planner/simulate'
import type { SheetInputs } from '~~/shared/schemas/planner'
import type { ResponseSeries } from '~/components/planner/PlannerResponsePlot.vue'
import { checkPlannerForm } from '~~/shared/utils/planner-form'
import type { RigView } from '~~/shared/types/build'
import { draftForRig, type PlannerRig } from '~/stores/planner'

export interface OverlaySheet {
  id: number
  title: string
  inputs: SheetInputs
}

export function usePlanner() {
  const store = usePlannerStore()
  const check = computed(() => checkPlannerForm(store.form))
  const inputs = computed(() =>
    check.value.ok ? { rig: check.value.rig, targets: check.value.targets } : null,
  )
  const plan = computed(() =>
    inputs.value ? planGains(inputs.value.rig, inputs.value.targets) : null,
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

  const analysis = computed(() => {
    if (!inputs.value || !gains.value) return null
    if (store.gainSource === 'suggested') return plan.value?.analysis ?? null
    return analyzeLoop(inputs.value.rig, gains.value, {
      discretization: inputs.value.targets.discretization,
    })
  })

  const firmware = computed(() => {
    if (!inputs.value || !gains.value) return null
    if (store.gainSource === 'suggested') return plan.value?.firmware ?? null
    return firmwareConstants(inputs.value.rig, gains.value, {
      discretization: inputs.value.targets.discretization,
    })
  })

  function useSuggestion() {
    const g = plan.value?.gains
    if (g) store.ownGains = { kp: g.kp, kd: g.kd, ki: g.ki }
  }

  const showPOnly = ref(false)
  const showNudge = ref(true)
  /** A saved sheet whose predicted response is drawn beside the current one. */
  const overlay = ref<OverlaySheet | null>(null)

  const response = computed(() => {
    if (!inputs.value || !gains.value) return null
    const { rig, targets } = inputs.value
    const mid = (rig.sensorLength ?? rig.beamLength) / 2
    const step = targets.stepSize ?? (rig.sensorLength ?? rig.beamLength) / 4
    const duration = Math.min(
      30,
      Math.max(6, 2.5 * targets.settlingTime + (showNudge.value ? targets.settlingTime + 1 : 0)),
    )
    const opts = {
      duration,
      initialPosition: mid,
      initialSetpoint: mid,
      setpoint: mid + step,
      setpointTime: 0.5,
      nudge: showNudge.value ? { time: 1 + targets.settlingTime * 1.5, speed: 0.15 } : null,
      discretization: targets.discretization,
    }
    const toSeries = (
      label: string,
      r: ReturnType<typeof simulate>,
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
    const main = simulate(rig, gains.value, opts)
    const series: ResponseSeries[] = [
      toSeries(store.gainSource === 'own' ? 'your gains' : 'suggested', main, 'main'),
    ]
    if (showPOnly.value)
      series.push(
        toSeries(
          'P only, same Kp',
          simulate(rig, { ...gains.value, kd: 0, ki: 0 }, opts),
          'compare',
          true,
        ),
      )
    const o = overlay.value
    if (o) {
      // The saved rig from the same start, setpoint change and nudge as the current plot.
      const oMid = (o.inputs.rig.sensorLength ?? o.inputs.rig.beamLength) / 2
      series.push(
        toSeries(
          `sheet: ${o.title}`,
          simulate(o.inputs.rig, o.inputs.gains, {
            ...opts,
            initialPosition: oMid,
            initialSetpoint: oMid,
            setpoint: oMid + step,
          }),
          'ghost',
          true,
        ),
      )
    }
    return {
      series,
      setpoint: { t: main.t, x: main.setpoint.map(v => v * 1000) },
      events: main.events,
    }
  })

  const pOnly = computed(() =>
    inputs.value ? compareProportionalAndPd(inputs.value.rig, inputs.value.targets).pOnly : null,
  )

  const map = computed(() => {
    if (!inputs.value || !plan.value) return null
    const ref = plan.value.gains ?? plan.value.rejectedGains ?? gains.value
    if (!ref) return null
    const t = inputs.value.targets
    return stabilityMap(
      inputs.value.rig,
      {
        kpRange: [ref.kp * 0.02, ref.kp * 3],
        kdRange: [0, Math.max(ref.kd, 0.05) * 3],
        n: t.derivativeFilterN,
        derivativeOn: t.derivativeOn,
        ki: t.form === 'PID' ? ref.ki : 0,
        discretization: t.discretization,
      },
      48,
    )
  })

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
    useSuggestion,
    showPOnly,
    showNudge,
    overlay,
    response,
    pOnly,
    map,
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
