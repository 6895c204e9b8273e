// The browser side of bench/keystroke.ts: one field of the planner form, and on every input
// what the page does for a keystroke (composables/usePlanner.ts): check the form, run the plan
// in its worker, then the jobs that follow it, each in its own worker, in parallel. The time
// from the input event to the last answer is recorded in window.keystrokeSamples.
import { checkPlannerForm, formFrom } from '../shared/utils/planner-form'
import { jobsAfterPlan } from '../shared/utils/planner-page'
import type { GainPlan } from '../shared/utils/planner/plan'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../shared/utils/planner/presets'

const workerUrl = '/worker.js'
const workers = new Map<string, Worker>()
let nextId = 1
function run(name: string, args: unknown): Promise<unknown> {
  let w = workers.get(name)
  if (!w) {
    w = new Worker(workerUrl, { type: 'module' })
    workers.set(name, w)
  }
  const id = nextId++
  const worker = w
  return new Promise((resolve, reject) => {
    const on = (e: MessageEvent<{ id: number, result?: unknown, error?: string }>) => {
      if (e.data.id !== id) return
      worker.removeEventListener('message', on)
      if (e.data.error) reject(new Error(e.data.error))
      else resolve(e.data.result)
    }
    worker.addEventListener('message', on)
    // As the page sends them: plain JSON.
    worker.postMessage({ id, name, args: JSON.parse(JSON.stringify(args)) })
  })
}

const form = formFrom(KIT_PRESETS[0]!.rig, DEFAULT_TARGETS)
const samples: number[] = []
const w = window as unknown as { keystrokeSamples: number[], keystrokeErrors: string[] }
w.keystrokeSamples = samples
w.keystrokeErrors = []
const input = document.getElementById('field') as HTMLInputElement
input.value = String(form.beamLengthMm)
input.addEventListener('input', async (e) => {
  const start = e.timeStamp
  try {
    const check = checkPlannerForm({ ...form, beamLengthMm: Number(input.value) })
    if (!check.ok) throw new Error(Object.values(check.errors).join('; '))
    const plan = (await run('plan', { rig: check.rig, targets: check.targets })) as GainPlan
    await Promise.all(
      jobsAfterPlan(check.rig, check.targets, plan).map(j => run(j.name, j.args)),
    )
    samples.push(performance.now() - start)
  } catch (err) {
    w.keystrokeErrors.push(String(err))
    samples.push(Number.NaN)
  }
})
