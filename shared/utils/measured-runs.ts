// A measured run as a tuning sheet stores it (shared/schemas/build.ts, measuredRunSchema): the
// parsed log in mm and degrees, and the planner's fit, rounded to what the rig can show.
import type { MeasuredRun, RunLog } from '../schemas/build'
import type { ParsedRun, RunFit, RunSample } from './planner/measured-run'

const round = (v: number, step: number) => Math.round(v / step) * step
const mm = (m: number) => round(m * 1000, 0.01)
const deg = (rad: number) => round((rad * 180) / Math.PI, 0.01)

/** The payload saved with a sheet: the log, and the fit when there is one. */
export function storedRun(parsed: ParsedRun, fit: RunFit | null): MeasuredRun {
  const s = parsed.samples
  const log: RunLog = {
    unit: parsed.unit,
    t: s.map(r => round(r.t, 1e-4)),
    positionMm: s.map(r => mm(r.position)),
    setpointMm: parsed.hasSetpoint ? s.map(r => mm(r.setpoint ?? 0)) : null,
    commandDeg: parsed.hasCommand ? s.map(r => deg(r.command ?? 0)) : null,
  }
  if (!fit || fit.problem) return { log }
  return {
    log,
    fit: {
      method: fit.method,
      kb: fit.kb,
      servoLag: fit.servoLag,
      modelKb: fit.modelKb,
      modelServoLag: fit.modelServoLag,
      rmsBeforeMm: fit.rmsBeforeMm,
      rmsAfterMm: fit.rmsAfterMm,
      levelOffsetDeg: fit.levelOffsetDeg,
      corrected: {
        servoSecondsPer60: fit.corrected.servoSecondsPer60,
        leverArm: fit.corrected.leverArm,
        gearRatio: fit.corrected.gearRatio,
      },
      fittedMm: fit.fitted.xMm.map(v => round(v, 0.01)),
      predictedMm: fit.predicted.xMm.map(v => round(v, 0.01)),
    },
  }
}

/** The stored log back as the planner's samples (metres and radians). */
export function runSamplesOf(log: RunLog): RunSample[] {
  return log.t.map((t, i) => ({
    t,
    position: log.positionMm[i]! / 1000,
    setpoint: log.setpointMm ? log.setpointMm[i]! / 1000 : null,
    command: log.commandDeg ? (log.commandDeg[i]! * Math.PI) / 180 : null,
  }))
}
