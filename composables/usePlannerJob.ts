// One planner job kept up to date with its arguments: `result` follows `args()`, and is null
// while the arguments are null. CONTRACT STUB: runs on the main thread; the worker version
// keeps the same shape (a stale answer never replaces a newer one).
import {
  runPlannerJob,
  type PlannerJobArgs,
  type PlannerJobName,
  type PlannerJobResult,
} from '~~/shared/utils/planner/jobs'

export function usePlannerJob<K extends PlannerJobName>(
  name: K,
  args: () => PlannerJobArgs<K> | null,
) {
  const result = shallowRef<PlannerJobResult<K> | null>(null)
  const busy = ref(false)
  watch(
    args,
    (a) => {
      result.value = a ? runPlannerJob(name, toRaw(a)) : null
    },
    { immediate: true, deep: true },
  )
  return { result, busy }
}
