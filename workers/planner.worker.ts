// The planner's heavy work, off the page's thread: each message names a job of
// shared/utils/planner/jobs.ts with its plain arguments and is answered with the same id.
import { runPlannerJob, type PlannerJobName } from '../shared/utils/planner/jobs'

interface Request {
  id: number
  name: PlannerJobName
  args: never
}

self.onmessage = (e: MessageEvent<Request>) => {
  const { id, name, args } = e.data
  try {
    self.postMessage({ id, result: runPlannerJob(name, args) })
  } catch (err) {
    self.postMessage({ id, error: err instanceof Error ? err.message : String(err) })
  }
}
