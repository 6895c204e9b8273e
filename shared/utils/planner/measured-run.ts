// A measured run beside the prediction: the rig's logged run as CSV (docs/planner-model.md,
// "Measured runs"), overlaid on the predicted response for the same gains and setpoint change,
// and a least-squares fit of the plant gain K_b and the servo lag τ_s on the planner's model.
// CONTRACT STUB: parsing of the plain columns only, and no fit.
import { plantOf } from './plant'
import type { Gains, Rig } from './schema'

/** One logged sample, in the model's units. */
export interface RunSample {
  /** s from the start of the log. */
  t: number
  /** Ball position, m from the sensor's zero. */
  position: number
  /** m; null when the log has no setpoint column. */
  setpoint: number | null
  /** Servo command, rad from level; null when the log has no command column. */
  command: number | null
}

export interface RunRowError {
  /** 1-based line of the CSV. */
  line: number
  message: string
}

export interface ParsedRun {
  samples: RunSample[]
  /** Every row that could not be read, with why; a run with errors is not used. */
  errors: RunRowError[]
  /** How positions were given. */
  unit: 'counts' | 'mm'
}

/** Columns: time_s, position (position_counts or position_mm), setpoint_…, command_deg. */
export function parseRunCsv(text: string, rig: Rig): ParsedRun {
  const ks = plantOf(rig).countsPerMeter
  const lines = text.split(/\r?\n/)
  const header = (lines[0] ?? '').split(',').map(h => h.trim().toLowerCase())
  const unit = header.some(h => h.endsWith('_mm')) ? 'mm' : 'counts'
  const toM = (v: number) => (unit === 'mm' ? v / 1000 : v / ks)
  const samples: RunSample[] = []
  const errors: RunRowError[] = []
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i]!.split(',').map(c => c.trim())
    if (cells.every(c => c === '')) continue
    const [t, x, r, u] = cells.map(Number)
    if (!Number.isFinite(t) || !Number.isFinite(x)) {
      errors.push({ line: i + 1, message: 'time and position must be numbers' })
      continue
    }
    samples.push({
      t: t!,
      position: toM(x!),
      setpoint: Number.isFinite(r) ? toM(r!) : null,
      command: Number.isFinite(u) ? (u! * Math.PI) / 180 : null,
    })
  }
  return { samples, errors, unit }
}

export interface RunFit {
  /** Fitted plant gain, m/s² per rad of servo. */
  kb: number
  /** Fitted servo lag, s. */
  servoLag: number
  /** The model's values before the fit. */
  modelKb: number
  modelServoLag: number
  /** RMS of (measured − predicted) position, mm, before and after the fit. */
  rmsBeforeMm: number
  rmsAfterMm: number
  /** The rig's inputs that reproduce the fit (servo speed, and the lever arm for K_b). */
  corrected: Partial<Rig>
  /** The prediction with the fitted values, on the run's own times: s and mm. */
  fitted: { t: number[], xMm: number[] }
}

export function fitRun(rig: Rig, _gains: Gains, run: readonly RunSample[]): RunFit {
  const plant = plantOf(rig)
  return {
    kb: plant.kb,
    servoLag: plant.servoLag,
    modelKb: plant.kb,
    modelServoLag: plant.servoLag,
    rmsBeforeMm: 0,
    rmsAfterMm: 0,
    corrected: {},
    fitted: { t: run.map(s => s.t), xMm: run.map(s => s.position * 1000) },
  }
}
