// A measured run beside the prediction (docs/planner-model.md, "Measured runs"): the rig's
// logged run as CSV, overlaid on the predicted response for the same gains and setpoint change,
// and a least-squares fit of the two numbers hardest to measure, the plant gain K_b and the servo
// lag τ_s, on the planner's own model.
//
// With the logged servo command the fit replays it through the plant: the servo follows each
// command from the next tick with lag τ_s (and its slew limit), and the ball obeys
// x'' = s·η·g·sin α(θ) + a_0. For a given τ_s the position is linear in (x_0, v_0, s, a_0), so
// those four come from one small linear least-squares solve and only τ_s is searched (a scan
// then a golden-section search on log τ_s): cheap and well-conditioned. a_0 is the pull of a beam
// that is not quite level at 0 (the trim), reported as an offset. Without the command the fit
// runs the closed loop with the gains (simulate) and adjusts s and τ_s by Levenberg–Marquardt.
import { plantOf } from './plant'
import { goldenMinimum } from './search'
import type { Gains, Rig } from './schema'
import { linkageOf, servoAngleAt, simulate, type SimulateOptions } from './simulate'

const DEG = Math.PI / 180

/** A log longer than this is refused: 50 s at 100 Hz is more than a setpoint change needs. */
export const RUN_MAX_ROWS = 5000

/** The columns parseRunCsv reads; any order, other columns are ignored. */
export const RUN_COLUMNS = {
  time: 'time_s',
  position: ['position_counts', 'position_mm'],
  setpoint: ['setpoint_counts', 'setpoint_mm'],
  command: 'command_deg',
} as const

/**
 * Arduino-style lines for the end of the loop (after the servo command is computed) that print
 * exactly the columns parseRunCsv reads, one row per sample.
 */
export const RUN_LOG_SNIPPET = [
  '/* In setup(): Serial.begin(115200); Serial.println(',
  '     "time_s,position_counts,setpoint_counts,command_deg"); */',
  '/* At the end of every sample, after servo is computed: */',
  'Serial.print(millis() / 1000.0, 3); Serial.print(\',\');',
  'Serial.print(reading);             Serial.print(\',\');',
  'Serial.print(setpoint);            Serial.print(\',\');',
  'Serial.println(servo, 2);',
].join('\n')

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
  hasSetpoint: boolean
  hasCommand: boolean
}

const list = (names: readonly string[]) => names.join(' or ')

/** Columns: time_s, position (position_counts or position_mm), setpoint_…, command_deg. */
export function parseRunCsv(text: string, rig: Rig): ParsedRun {
  const ks = plantOf(rig).countsPerMeter
  const lines = text.split(/\r?\n/)
  const errors: RunRowError[] = []
  const samples: RunSample[] = []
  let first = 0
  while (first < lines.length && lines[first]!.trim() === '') first++
  const header = (lines[first] ?? '').split(',').map(h => h.trim().toLowerCase())
  const find = (names: readonly string[]) => {
    const found = names.filter(n => header.includes(n))
    return found.length === 1 ? found[0]! : found.length === 0 ? null : 'both'
  }
  const headerLine = first + 1
  const timeCol = header.indexOf(RUN_COLUMNS.time)
  const positionName = find(RUN_COLUMNS.position)
  const setpointName = find(RUN_COLUMNS.setpoint)
  const commandCol = header.indexOf(RUN_COLUMNS.command)
  if (timeCol < 0) {
    errors.push({ line: headerLine, message: `The first row needs a ${RUN_COLUMNS.time} column.` })
  }
  if (positionName === null) {
    errors.push({
      line: headerLine,
      message: `The first row needs a ${list(RUN_COLUMNS.position)} column.`,
    })
  }
  for (const [name, names] of [
    [positionName, RUN_COLUMNS.position],
    [setpointName, RUN_COLUMNS.setpoint],
  ] as const) {
    if (name === 'both')
      errors.push({ line: headerLine, message: `Give only one of ${list(names)}.` })
  }
  const unit = positionName === 'position_mm' ? 'mm' : 'counts'
  const empty = { samples, errors, unit, hasSetpoint: false, hasCommand: false } as ParsedRun
  if (errors.length > 0) return empty
  const positionCol = header.indexOf(positionName!)
  const setpointCol = setpointName ? header.indexOf(setpointName) : -1
  const toM = (v: number, mm: boolean) => (mm ? v / 1000 : v / ks)
  const setpointMm = setpointName === 'setpoint_mm'
  let rows = 0
  let lastT = -Infinity
  for (let i = first + 1; i < lines.length; i++) {
    const raw = lines[i]!
    if (raw.trim() === '') continue
    const line = i + 1
    rows++
    if (rows > RUN_MAX_ROWS) {
      errors.push({
        line,
        message: `The log has more than ${RUN_MAX_ROWS} rows: keep one setpoint change, `
          + 'about 10 s.',
      })
      break
    }
    const cells = raw.split(',').map(c => c.trim())
    if (cells.length < header.length) {
      errors.push({
        line,
        message: `This row has ${cells.length} values; the first row names ${header.length}.`,
      })
      continue
    }
    const read = (col: number, name: string): number | null => {
      if (col < 0) return null
      const cell = cells[col]!
      const v = cell === '' ? Number.NaN : Number(cell)
      if (!Number.isFinite(v)) {
        errors.push({ line, message: `${name} "${cell}" is not a number.` })
        return Number.NaN
      }
      return v
    }
    const t = read(timeCol, RUN_COLUMNS.time)!
    const x = read(positionCol, positionName!)!
    const r = read(setpointCol, setpointName ?? '')
    const u = read(commandCol, RUN_COLUMNS.command)
    if ([t, x, r, u].some(v => v !== null && Number.isNaN(v))) continue
    if (t <= lastT) {
      errors.push({ line, message: `time_s ${t} does not come after the row before (${lastT}).` })
      continue
    }
    lastT = t
    samples.push({
      t,
      position: toM(x, unit === 'mm'),
      setpoint: r === null ? null : toM(r, setpointMm),
      command: u === null ? null : u * DEG,
    })
  }
  const t0 = samples[0]?.t ?? 0
  for (const s of samples) s.t -= t0
  return { samples, errors, unit, hasSetpoint: setpointCol >= 0, hasCommand: commandCol >= 0 }
}

/** The predicted response for the run's own start, setpoint change and length. */
export function runScenario(run: readonly RunSample[]): SimulateOptions {
  const first = run[0]!
  const r0 = first.setpoint ?? first.position
  const change = run.find(s => s.setpoint !== null && Math.abs(s.setpoint - r0) > 1e-9)
  return {
    duration: run.at(-1)!.t,
    initialPosition: first.position,
    initialSetpoint: r0,
    setpoint: change?.setpoint ?? r0,
    setpointTime: change?.t ?? 0,
    nudge: null,
  }
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
  /** The prediction with the rig as entered, same times: s and mm. */
  predicted: { t: number[], xMm: number[] }
  /** 'replay': the logged command through the plant; 'closed-loop': the gains' loop. */
  method: 'replay' | 'closed-loop'
  /** Beam tilt at a servo command of 0 the fit found (trim), servo degrees; replay only. */
  levelOffsetDeg: number | null
  /** Why the fit could not be made, in plain words; null when it was. */
  problem: string | null
}

/** Solves the normal equations A x = b (n ≤ 4) by Gaussian elimination with pivoting. */
function solveSmall(a: number[][], b: number[]): number[] | null {
  const n = b.length
  const m = a.map((row, i) => [...row, b[i]!])
  for (let c = 0; c < n; c++) {
    let p = c
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r]![c]!) > Math.abs(m[p]![c]!)) p = r
    if (Math.abs(m[p]![c]!) < 1e-300) return null
    ;[m[c], m[p]] = [m[p]!, m[c]!]
    for (let r = 0; r < n; r++) {
      if (r === c) continue
      const f = m[r]![c]! / m[c]![c]!
      for (let k = c; k <= n; k++) m[r]![k]! -= f * m[c]![k]!
    }
  }
  return m.map((row, i) => row[n]! / row[i]!)
}

/** Least squares of y ≈ Σ c_j·basis_j: coefficients and the residual sum of squares. */
function linearFit(basis: Float64Array[], y: ArrayLike<number>) {
  const n = basis.length
  const a = basis.map(() => new Array<number>(n).fill(0))
  const b = new Array<number>(n).fill(0)
  for (let i = 0; i < y.length; i++) {
    for (let j = 0; j < n; j++) {
      b[j]! += basis[j]![i]! * y[i]!
      for (let k = j; k < n; k++) a[j]![k]! += basis[j]![i]! * basis[k]![i]!
    }
  }
  for (let j = 0; j < n; j++) for (let k = 0; k < j; k++) a[j]![k] = a[k]![j]!
  const coef = solveSmall(a, b)
  if (!coef) return null
  let sse = 0
  for (let i = 0; i < y.length; i++) {
    let f = 0
    for (let j = 0; j < n; j++) f += coef[j]! * basis[j]![i]!
    sse += (y[i]! - f) ** 2
  }
  return { coef, sse }
}

/**
 * F(t_i) = ∫∫ η·g·sin α(θ) dt dt from the log's start, with the servo following the logged
 * commands (each from the next row on) at lag tau: the ball's response per unit of plant-gain
 * scale, integrated exactly in θ (servoAngleAt) and by Simpson's rule in the ball.
 */
function replayResponse(
  rig: Rig,
  run: readonly RunSample[],
  tau: number,
  slew: number,
): Float64Array {
  const plant = plantOf(rig)
  const ag = plant.eta * plant.gravity
  const alpha = linkageOf(rig).alpha
  const f = new Float64Array(run.length)
  let th = run[0]!.command!
  let held = th
  let pos = 0
  let vel = 0
  const sub = 2
  for (let i = 1; i < run.length; i++) {
    const dt = run[i]!.t - run[i - 1]!.t
    const h = dt / sub
    const th0 = th
    const acc = (tt: number) => ag * Math.sin(alpha(servoAngleAt(th0, held, tt, tau, slew)))
    let a1 = acc(0)
    for (let j = 0; j < sub; j++) {
      const a2 = acc((j + 0.5) * h)
      const a4 = acc((j + 1) * h)
      pos += h * vel + (h * h * (a1 + 2 * a2)) / 6
      vel += (h * (a1 + 4 * a2 + a4)) / 6
      a1 = a4
    }
    th = servoAngleAt(th0, held, dt, tau, slew)
    held = run[i - 1]!.command! // computed at row i − 1, written on the next tick
    f[i] = pos
  }
  return f
}

function rmsMm(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0
  for (let i = 0; i < a.length; i++) s += (a[i]! - b[i]!) ** 2
  return Math.sqrt(s / a.length) * 1000
}

/** Rig inputs that give plant gain kb and servo lag tau (t60 = 3·τ_s). */
function correctedInputs(rig: Rig, kbScale: number, tau: number): Partial<Rig> {
  const out: Partial<Rig> = { servoSecondsPer60: 3 * tau }
  if (rig.drive === 'lever') out.leverArm = rig.leverArm * kbScale
  else out.gearRatio = (rig.gearRatio ?? 1) / kbScale
  return out
}

function fitByReplay(rig: Rig, gains: Gains, run: readonly RunSample[]): RunFit {
  const plant = plantOf(rig)
  const n = run.length
  const y = Float64Array.from(run, s => s.position)
  const span = run.at(-1)!.t || 1
  const ones = new Float64Array(n).fill(1)
  const lin = Float64Array.from(run, s => s.t / span)
  const quad = Float64Array.from(run, s => (s.t / span) ** 2)
  // servo lag τ and slew limit move together: ω_max = (π/3)/t60 = π/(9·τ)
  const responseAt = (tau: number) => replayResponse(rig, run, tau, Math.PI / (9 * tau))
  const cost = (logTau: number) => {
    const f = linearFit([ones, lin, quad, responseAt(Math.exp(logTau))], y)
    return f ? f.sse : Infinity
  }
  // scan log τ over 1/8 … 8 times the model's, then golden-section around the best
  const center = Math.log(plant.servoLag)
  const lo = center - Math.log(8)
  const hi = center + Math.log(8)
  const steps = 16
  let best = 0
  let bestCost = Infinity
  for (let k = 0; k <= steps; k++) {
    const c = cost(lo + ((hi - lo) * k) / steps)
    if (c < bestCost) {
      bestCost = c
      best = k
    }
  }
  const a = lo + ((hi - lo) * Math.max(0, best - 1)) / steps
  const b = lo + ((hi - lo) * Math.min(steps, best + 1)) / steps
  const tau = Math.exp(goldenMinimum(cost, a, b, 2e-3))
  const response = responseAt(tau)
  const fit = linearFit([ones, lin, quad, response], y)!
  const [x0, v0, q, scale] = fit.coef as [number, number, number, number]
  const fittedX = Array.from(response, (f, i) => x0 + v0 * lin[i]! + q * quad[i]! + scale * f)
  // before: the rig as entered (scale 1, its own lag), start and offset fitted all the same
  const nominal = responseAt(plant.servoLag)
  const y1 = Float64Array.from(y, (v, i) => v - nominal[i]!)
  const before = linearFit([ones, lin, quad], y1)
  const predictedX = Array.from(nominal, (f, i) => {
    const [p0, p1, p2] = before?.coef ?? [y[0]!, 0, 0]
    return p0! + p1! * lin[i]! + p2! * quad[i]! + f
  })
  // a_0 = 2q/span² is the pull of a beam tilted at a command of 0
  const a0 = (2 * q) / (span * span)
  const kb = plant.kb * scale
  const t = run.map(s => s.t)
  return {
    kb,
    servoLag: tau,
    modelKb: plant.kb,
    modelServoLag: plant.servoLag,
    rmsBeforeMm: rmsMm(y, predictedX),
    rmsAfterMm: rmsMm(y, fittedX),
    corrected: correctedInputs(rig, scale, tau),
    fitted: { t, xMm: fittedX.map(v => v * 1000) },
    predicted: closedLoopPrediction(rig, gains, run, {}).predicted,
    method: 'replay',
    levelOffsetDeg: kb > 0 ? -(a0 / kb) / DEG : null,
    problem: scale > 0 ? null : notPositive,
  }
}

const notPositive = 'The log does not fit a ball that rolls toward the low end: check that the '
  + 'position and the command in the log have the signs the firmware uses.'

/** The closed loop with the gains, sampled at the run's own times. */
function closedLoopPrediction(
  rig: Rig,
  gains: Gains,
  run: readonly RunSample[],
  scales: { kbScale?: number, servoLagScale?: number },
  smooth = false,
) {
  // the fit runs the model without ADC steps, so that its cost changes smoothly with the values
  const sim = simulate(rig, gains, {
    ...runScenario(run),
    ...scales,
    quantize: !smooth,
    subSteps: 4,
    outputEvery: 1,
  })
  const x = new Float64Array(run.length)
  let j = 0
  for (let i = 0; i < run.length; i++) {
    const t = run[i]!.t
    while (j + 1 < sim.t.length && sim.t[j + 1]! <= t) j++
    const k = Math.min(j + 1, sim.t.length - 1)
    const w = sim.t[k]! > sim.t[j]! ? (t - sim.t[j]!) / (sim.t[k]! - sim.t[j]!) : 0
    x[i] = sim.x[j]! + Math.min(1, Math.max(0, w)) * (sim.x[k]! - sim.x[j]!)
  }
  const t = run.map(s => s.t)
  return { x, predicted: { t, xMm: Array.from(x, v => v * 1000) } }
}

function fitClosedLoop(rig: Rig, gains: Gains, run: readonly RunSample[]): RunFit {
  const plant = plantOf(rig)
  const y = Float64Array.from(run, s => s.position)
  const model = (p: [number, number]) =>
    closedLoopPrediction(rig, gains, run, {
      kbScale: Math.exp(p[0]),
      servoLagScale: Math.exp(p[1]),
    }, true).x
  const residual = (x: Float64Array) => Float64Array.from(x, (v, i) => v - y[i]!)
  const sse = (r: Float64Array) => r.reduce((s, v) => s + v * v, 0)
  // Levenberg–Marquardt on (log s, log lag scale), Jacobian by forward differences
  const startCost = sse(residual(closedLoopPrediction(rig, gains, run, {}).x))
  // start from the best of a coarse grid: the lag's valley is long and shallow
  let p: [number, number] = [0, 0]
  let r = residual(model(p))
  let cost = sse(r)
  for (const a of [-0.4, 0, 0.4]) {
    for (const b of [-0.7, 0, 0.7]) {
      if (a === 0 && b === 0) continue
      const rq = residual(model([a, b]))
      const cq = sse(rq)
      if (cq < cost) {
        p = [a, b]
        r = rq
        cost = cq
      }
    }
  }
  let lambda = 1e-2
  let done = false
  for (let iter = 0; iter < 12 && !done; iter++) {
    const h = 1e-2
    const cols = [0, 1].map((k) => {
      const q: [number, number] = [...p]
      q[k] = q[k]! + h
      const rq = residual(model(q))
      return Float64Array.from(rq, (v, i) => (v - r[i]!) / h)
    })
    const dot = (u: Float64Array, v: Float64Array) => u.reduce((s, x, i) => s + x * v[i]!, 0)
    const jtj = [0, 1].map(a => [0, 1].map(b => dot(cols[a]!, cols[b]!)))
    const jtr = [0, 1].map(a => dot(cols[a]!, r))
    done = true
    for (let tries = 0; tries < 6; tries++) {
      const a = jtj.map((row, i) => row.map((v, j) => v + (i === j ? lambda * (v || 1) : 0)))
      const step = solveSmall(a, jtr.map(v => -v))
      if (!step) break
      const q: [number, number] = [
        Math.max(-2, Math.min(2, p[0] + step[0]!)),
        Math.max(-2, Math.min(2, p[1] + step[1]!)),
      ]
      const rq = residual(model(q))
      const cq = sse(rq)
      if (cq < cost) {
        p = q
        r = rq
        cost = cq
        lambda /= 3
        // keep going while the step still moves the values by more than 0.01 %
        done = Math.abs(step[0]!) + Math.abs(step[1]!) < 1e-4
        break
      }
      lambda *= 4
    }
  }
  const fitted = Float64Array.from(r, (v, i) => v + y[i]!)
  const scale = Math.exp(p[0])
  const tau = plant.servoLag * Math.exp(p[1])
  const t = run.map(s => s.t)
  const prediction = closedLoopPrediction(rig, gains, run, {})
  return {
    kb: plant.kb * scale,
    servoLag: tau,
    modelKb: plant.kb,
    modelServoLag: plant.servoLag,
    rmsBeforeMm: Math.sqrt(startCost / y.length) * 1000,
    rmsAfterMm: Math.sqrt(cost / y.length) * 1000,
    corrected: correctedInputs(rig, scale, tau),
    fitted: { t, xMm: Array.from(fitted, v => v * 1000) },
    predicted: prediction.predicted,
    method: 'closed-loop',
    levelOffsetDeg: null,
    problem: null,
  }
}

export function fitRun(rig: Rig, gains: Gains, run: readonly RunSample[]): RunFit {
  const plant = plantOf(rig)
  const t = run.map(s => s.t)
  const asIs = run.map(s => s.position * 1000)
  const none = (problem: string): RunFit => ({
    kb: plant.kb,
    servoLag: plant.servoLag,
    modelKb: plant.kb,
    modelServoLag: plant.servoLag,
    rmsBeforeMm: 0,
    rmsAfterMm: 0,
    corrected: {},
    fitted: { t, xMm: asIs },
    predicted: { t, xMm: asIs },
    method: 'replay',
    levelOffsetDeg: null,
    problem,
  })
  if (run.length < 10) return none('The log needs at least 10 rows to compare.')
  if (run.every(s => s.command !== null)) return fitByReplay(rig, gains, run)
  if (run.every(s => s.setpoint !== null)) return fitClosedLoop(rig, gains, run)
  return none(
    'The fit needs the servo command (command_deg) or the setpoint (setpoint_counts or '
    + 'setpoint_mm) on every row.',
  )
}
