// Live planner results, computed in the browser from the draft on every change: the
// suggestion, the check of the gains on the rig, the drawn response and the stability map.
import { analyzeLoop } from '~~/shared/utils/planner/analyze'
import { firmwareConstants } from '~~/shared/utils/planner/firmware'
import { planGains } from '~~/shared/utils/planner/plan'
import type { Gains } from '~~/shared/utils/planner/schema'
import { checkPlannerForm } from '~~/shared/utils/planner-form'

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

  return { store, check, inputs, plan, gains, analysis, firmware, useSuggestion }
}
