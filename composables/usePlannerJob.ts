// One planner job kept up to date with its arguments: `result` follows `args()`, and is null
// while the arguments are null. In the browser the job runs in a module Web Worker (one per job
// name, shared by every use of that job), so typing never waits for the computation. While a
// job runs, the previous result stays (no blank flash) and `busy` is true; arguments that change
// meanwhile are kept and only the newest is sent next, so answers never pile up and a stale
// answer never replaces a newer one. On the server nothing runs: the page computes in the
// browser.
import {
  runPlannerJob,
  type PlannerJobArgs,
  type PlannerJobName,
  type PlannerJobResult,
} from '~~/shared/utils/planner/jobs'

type Answer = { id: number, result?: unknown, error?: string }
type Waiter = (a: Answer) => void

const workers = new Map<PlannerJobName, { worker: Worker | null, waiting: Map<number, Waiter> }>()
let nextId = 1

/** The job's worker, created on first use; null where workers are missing (the job then runs
 *  on the page's thread). */
function workerFor(name: PlannerJobName) {
  let w = workers.get(name)
  if (!w) {
    let worker: Worker | null = null
    try {
      // Literal, static options: Vite finds the worker by this exact shape and bundles it.
      worker = new Worker(new URL('../workers/planner.worker.ts', import.meta.url), {
        type: 'module',
      })
    } catch {
      worker = null
    }
    const waiting = new Map<number, Waiter>()
    worker?.addEventListener('message', (e: MessageEvent<Answer>) => {
      const done = waiting.get(e.data.id)
      waiting.delete(e.data.id)
      done?.(e.data)
    })
    w = { worker, waiting }
    workers.set(name, w)
  }
  return w
}

function runOffThread<K extends PlannerJobName>(name: K, args: PlannerJobArgs<K>) {
  const w = workerFor(name)
  if (!w.worker)
    return Promise.resolve<Answer>({ id: 0, result: runPlannerJob(name, args) })
  const id = nextId++
  return new Promise<Answer>((resolve) => {
    w.waiting.set(id, resolve)
    w.worker!.postMessage({ id, name, args })
  })
}

export function usePlannerJob<K extends PlannerJobName>(
  name: K,
  args: () => PlannerJobArgs<K> | null,
) {
  const result = shallowRef<PlannerJobResult<K> | null>(null)
  const busy = ref(false)
  const error = ref<string | null>(null)
  if (import.meta.server) return { result, busy, error }

  /** The arguments of the answer shown (or being computed), as JSON: equal ones are not sent. */
  let sentKey: string | null = null
  let pending: { key: string, args: PlannerJobArgs<K> } | null = null
  let running = false

  async function send(key: string, a: PlannerJobArgs<K>) {
    running = true
    busy.value = true
    sentKey = key
    const answer = await runOffThread(name, a)
    running = false
    if (pending) {
      // Newer arguments came while this ran: this answer is stale; compute theirs.
      const next = pending
      pending = null
      if (next.key !== key) return send(next.key, next.args)
    }
    busy.value = false
    if (sentKey !== key) return
    error.value = answer.error ?? null
    result.value = (answer.error ? null : answer.result) as PlannerJobResult<K> | null
  }

  watch(
    args,
    (a) => {
      if (!a) {
        pending = null
        sentKey = null
        result.value = null
        busy.value = running
        return
      }
      // Plain JSON: reactive proxies cannot cross to a worker; equal arguments are not re-sent.
      const key = JSON.stringify(a)
      if (key === sentKey && !pending) return
      const plain = JSON.parse(key) as PlannerJobArgs<K>
      if (running) pending = { key, args: plain }
      else void send(key, plain)
    },
    { immediate: true, deep: true },
  )
  return { result, busy, error }
}
