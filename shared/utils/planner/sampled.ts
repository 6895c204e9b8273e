// The sampled loop as the firmware runs it (docs/planner-model.md §4–5), linear, no limits:
//   the ball is sampled at kT; e_k = r − x_k; s_k = −x_k (derivative on measurement) or e_k;
//   D_k = a·D_{k−1} + b·(s_k − s_{k−1}); I_k = I_{k−1} + Ki·T·e_k; u_k = Kp·e_k + I_k + D_k;
//   u_k is held from (k+1)T to (k+2)T (0 on [0, T)), D_{−1} = s_{−1} = 0.
// Between samples the servo lag and the double integrator are integrated exactly (closed-form
// matrix exponential), so peaks and band crossings between samples are located by root finding
// on the exact trajectory rather than on sub-step points.
import { brent } from './frequency'
import { discretizePlant, discretizePlantW, phi1, phi2, type Polynomial } from './plant'
import type { DerivativeSignal, Discretization } from './schema'

export interface SampledLoop {
  kb: number
  servoLag: number
  period: number
  kp: number
  ki: number
  kd: number
  tf: number
  derivativeOn: DerivativeSignal
  discretization: Discretization
}

export interface DerivativeCoefficients {
  a: number
  b: number
  /** 1 − a, computed without cancellation. */
  oneMinusA: number
  /** False for Tustin with T_f < T/2, where its pole a leaves [0, 1) and rings. */
  ok: boolean
}

/**
 * Backward Euler a = T_f/(T_f+T), b = Kd/(T_f+T); Tustin a = (2T_f−T)/(2T_f+T), b = 2Kd/(2T_f+T).
 */
export function derivativeCoefficients(
  kd: number,
  tf: number,
  period: number,
  method: Discretization,
): DerivativeCoefficients {
  if (method === 'tustin') {
    const d = 2 * tf + period
    return {
      a: (2 * tf - period) / d,
      b: (2 * kd) / d,
      oneMinusA: (2 * period) / d,
      ok: tf >= period / 2,
    }
  }
  return {
    a: tf / (tf + period),
    b: kd / (tf + period),
    oneMinusA: period / (tf + period),
    ok: true,
  }
}

function polyMul(p: Polynomial, q: Polynomial): Polynomial {
  const r = new Array<number>(p.length + q.length - 1).fill(0)
  for (let i = 0; i < p.length; i++) for (let j = 0; j < q.length; j++) r[i + j]! += p[i]! * q[j]!
  return r
}

function polyAdd(p: Polynomial, q: Polynomial): Polynomial {
  const n = Math.max(p.length, q.length)
  const r = new Array<number>(n).fill(0)
  for (let i = 0; i < p.length; i++) r[n - p.length + i]! += p[i]!
  for (let i = 0; i < q.length; i++) r[n - q.length + i]! += q[i]!
  return r
}

/**
 * Closed-loop characteristic polynomial of the sampled loop in z, highest power first. Readable,
 * but its coefficients lose the poles' precision when they crowd z = 1 (fast loop, slow
 * response); stability is judged on sampledCharacteristicW instead.
 */
export function sampledCharacteristic(
  loop: SampledLoop,
  plantNum?: Polynomial,
  plantDen?: Polynomial,
): Polynomial {
  let num = plantNum
  let den = plantDen
  if (num === undefined || den === undefined) {
    const d = discretizePlant(loop.kb, loop.servoLag, loop.period)
    num = d.num
    den = d.den
  }
  const { a, b } = derivativeCoefficients(loop.kd, loop.tf, loop.period, loop.discretization)
  const kiT = loop.ki * loop.period
  // C(z) = Kp + b(z − 1)/(z − a) + Ki·T·z/(z − 1); the loop adds one sample z^(−1).
  let cNum: Polynomial
  let cDen: Polynomial
  if (kiT > 0) {
    cDen = [1, -(a + 1), a]
    cNum = polyAdd(
      polyAdd(polyMul([loop.kp], cDen), polyMul([b], [1, -2, 1])),
      polyMul([kiT], [1, -a, 0]),
    )
  } else {
    cDen = [1, -a]
    cNum = [loop.kp + b, -(loop.kp * a + b)]
  }
  return polyAdd(polyMul([1, 0], polyMul(den, cDen)), polyMul(num, cNum))
}

/**
 * Schur–Cohn–Jury on a polynomial in z: every root strictly inside the unit circle (see the caveat
 * above).
 */
export function schurStable(poly: Polynomial): boolean {
  let p = poly.slice()
  while (p.length > 1 && p[0] === 0) p = p.slice(1)
  let n = p.length - 1
  while (n > 0) {
    const k = p[n]! / p[0]!
    if (!(Math.abs(k) < 1)) return false
    const q = new Array<number>(n)
    for (let i = 0; i < n; i++) q[i] = p[i]! - k * p[n - i]!
    p = q
    n--
  }
  return true
}

/**
 * The closed-loop characteristic polynomial in w = z − 1, highest power first:
 * (w + 1)·D_p(w)·D_c(w) + N_p(w)·N_c(w), with the controller
 * C = Kp + b·w/(w + 1 − a) + Ki·T·(w + 1)/w.
 */
export function sampledCharacteristicW(
  loop: SampledLoop,
  plantW?: { num: Polynomial, den: Polynomial },
): Polynomial {
  const p = plantW ?? discretizePlantW(loop.kb, loop.servoLag, loop.period)
  const { b, oneMinusA: al } = derivativeCoefficients(
    loop.kd,
    loop.tf,
    loop.period,
    loop.discretization,
  )
  const kiT = loop.ki * loop.period
  const kp = loop.kp
  let cNum: Polynomial
  let cDen: Polynomial
  if (kiT > 0) {
    cDen = [1, al, 0]
    cNum = [kp + b + kiT, kp * al + kiT * (1 + al), kiT * al]
  } else {
    cDen = [1, al]
    cNum = [kp + b, kp * al]
  }
  return polyAdd(polyMul([1, 1], polyMul(p.den, cDen)), polyMul(p.num, cNum))
}

/**
 * True when every root w of the polynomial (highest power first) has |w + 1| < 1, i.e. every
 * z = w + 1 lies inside the unit circle. The disk is mapped onto the left half-plane by
 * w = 2q/(1 − q) and the Routh–Hurwitz test is applied to the polynomial in q.
 */
export function diskStable(polyW: Polynomial): boolean {
  let first = 0
  while (first < polyW.length - 1 && polyW[first] === 0) first++
  const n = polyW.length - 1 - first
  if (n === 0) return true
  // Q(q) = Σ_i c_i (2q)^i (1 − q)^(n−i), c_i the coefficient of w^i; q holds Q highest power first.
  const q = new Float64Array(n + 1)
  let pow2 = 1
  for (let i = 0; i <= n; i++) {
    const ci = polyW[first + n - i]!
    if (ci !== 0) {
      const f = ci * pow2
      let binom = 1
      const m = n - i
      for (let j = 0; j <= m; j++) {
        q[n - (i + j)]! += j % 2 === 0 ? f * binom : -f * binom
        binom = (binom * (m - j)) / (j + 1)
      }
    }
    pow2 *= 2
  }
  return hurwitzStable(q)
}

/**
 * Routh–Hurwitz: every root of the polynomial (highest power first) in the open left half-plane.
 */
export function hurwitzStable(poly: ArrayLike<number>): boolean {
  let first = 0
  while (first < poly.length - 1 && poly[first] === 0) first++
  const n = poly.length - 1 - first
  const sign = poly[first]! < 0 ? -1 : 1
  for (let i = first; i < poly.length; i++) if (!(sign * poly[i]! > 0)) return false
  if (n <= 2) return true
  // Two Routh rows, updated in place: row k+1 from rows k−1 and k.
  const width = (n >> 1) + 1
  let prev = new Float64Array(width)
  let cur = new Float64Array(width)
  for (let i = 0; i <= n; i++) {
    const v = sign * poly[first + i]!
    if (i % 2 === 0) prev[i >> 1] = v
    else cur[i >> 1] = v
  }
  for (let row = 2; row <= n; row++) {
    const next = prev // reuse: prev is not needed after this row
    const c0 = cur[0]!
    const p0 = prev[0]!
    for (let j = 0; j < width - 1; j++) next[j] = (c0 * prev[j + 1]! - p0 * cur[j + 1]!) / c0
    next[width - 1] = 0
    if (!(next[0]! > 0)) return false
    prev = cur
    cur = next
  }
  return true
}

/** The sampled loop is stable: every closed-loop root inside the unit circle. */
export function sampledStable(loop: SampledLoop): boolean {
  return diskStable(sampledCharacteristicW(loop))
}

export interface StepMetrics {
  /** 100·(max x − 1), floored at 0; null if the loop diverged. */
  overshootPct: number | null
  /** Time of the maximum, s. */
  peakTime: number | null
  /** Last time |x − 1| > 0.02, s; null if it never settles within the horizon. */
  settlingTime: number | null
  /** Largest |u_k| per metre of step, rad/m. */
  peakCommand: number
  /** Largest servo speed |u − θ|/τ_s per metre of step, rad/(s·m). */
  peakServoRate: number
  diverged: boolean
  /** How far the simulation ran, s. */
  simulatedTime: number
}

export interface StepOptions {
  /**
   * Horizon, s: at least max(60 s, 400/ω_c, this). A response still unproven at the horizon runs
   * on (up to 10× the horizon) until it has stayed inside the band three times as long as it
   * took to get there.
   */
  horizon?: number
  /** Characteristic frequency for the settledness test, rad/s (default √(K_b·Kp)). */
  scaleFrequency?: number
}

const BAND = 0.02

/** x(t) within a hold interval: x0, v0, θ0 at its start, u held, a = 1/τ_s. */
function xAt(
  x0: number,
  v0: number,
  th0: number,
  u: number,
  kb: number,
  a: number,
  t: number,
): number {
  return x0 + v0 * t + kb * t * t * (u * 0.5 + (th0 - u) * phi2(a * t))
}

function vAt(v0: number, th0: number, u: number, kb: number, a: number, t: number): number {
  return v0 + kb * t * (u + (th0 - u) * phi1(a * t))
}

/**
 * Boundaries of the pieces of [0, T] on which x is monotone: 0, the zeros of v, T, written to
 * `out`; returns their count. v' = K_b·θ and θ moves monotonically from θ0 towards u, so v has
 * at most one turning point (where θ = 0) and at most two zeros.
 */
function monotonePieces(
  v0: number,
  th0: number,
  u: number,
  kb: number,
  a: number,
  T: number,
  out: Float64Array,
): number {
  let n = 0
  out[n++] = 0
  let ts = -1
  if (a !== Infinity && th0 * u < 0) ts = Math.log((u - th0) / u) / a
  const vT = vAt(v0, th0, u, kb, a, T)
  const vf = (t: number) => vAt(v0, th0, u, kb, a, t)
  if (ts > 0 && ts < T) {
    const vs = vAt(v0, th0, u, kb, a, ts)
    if (v0 * vs < 0) out[n++] = brent(vf, 0, ts, v0, vs, 1e-15 * T)
    if (vs * vT < 0) out[n++] = brent(vf, ts, T, vs, vT, 1e-15 * T)
  } else if (v0 * vT < 0) {
    out[n++] = brent(vf, 0, T, v0, vT, 1e-15 * T)
  }
  out[n++] = T
  return n
}

/**
 * The sampled loop of §4 from rest, for a unit setpoint step: at each sample the controller
 * computes a command from the ball's position, then the exactly discretised plant runs one
 * period under the command held from the sample before. The step metrics, their refinement and
 * the plotted response all step through this one class, so they cannot disagree.
 */
class LoopStepper {
  x = 0
  v = 0
  th = 0
  uHeld = 0
  D = 0
  I = 0
  private sPrev = 0
  readonly a: number
  readonly plant: ReturnType<typeof discretizePlant>
  private readonly cxTh: number
  private readonly cvTh: number
  private readonly E: number
  private readonly cxU: number
  private readonly cvU: number
  private readonly cthU: number
  private readonly da: number
  private readonly db: number
  private readonly kiT: number
  private readonly kp: number
  private readonly T: number
  private readonly onMeasurement: boolean

  constructor(loop: SampledLoop, plant?: ReturnType<typeof discretizePlant>) {
    this.T = loop.period
    this.kp = loop.kp
    this.a = loop.servoLag > 0 ? 1 / loop.servoLag : Infinity
    this.plant = plant ?? discretizePlant(loop.kb, loop.servoLag, loop.period)
    const [[, , cxTh], [, , cvTh], [, , E]] = this.plant.phi
    const [cxU, cvU, cthU] = this.plant.gamma
    this.cxTh = cxTh!
    this.cvTh = cvTh!
    this.E = E!
    this.cxU = cxU!
    this.cvU = cvU!
    this.cthU = cthU!
    const { a: da, b: db } = derivativeCoefficients(
      loop.kd,
      loop.tf,
      loop.period,
      loop.discretization,
    )
    this.da = da
    this.db = db
    this.kiT = loop.ki * loop.period
    this.onMeasurement = loop.derivativeOn === 'measurement'
  }

  /** The command computed from this sample (it goes out on the next tick). */
  control(): number {
    const e = 1 - this.x
    const s = this.onMeasurement ? -this.x : e
    this.D = this.da * this.D + this.db * (s - this.sPrev)
    this.sPrev = s
    this.I += this.kiT * e
    return this.kp * e + this.I + this.D
  }

  /** Run the plant one period under the held command, then hold `u` for the next period. */
  advance(u: number) {
    const { x, v, th, uHeld, T } = this
    this.x = x + T * v + this.cxTh * th + this.cxU * uHeld
    this.v = v + this.cvTh * th + this.cvU * uHeld
    this.th = this.a === Infinity ? uHeld : this.E * th + this.cthU * uHeld
    this.uHeld = u
  }
}

/**
 * Step response metrics of the sampled loop for a unit setpoint step at t = 0.
 * Stops once the response is inside the 2 % band, has stayed there at least as long as it took
 * to get there, and the whole state (position, speed/ω_c, servo, command, filter and integral
 * states scaled by K_b/ω_c²) is within 1e−4 of rest — 200 times smaller than the band, so no
 * later excursion can reach it; or at the horizon, where a response counts as settled only if it
 * has stayed inside three times as long as it took to get there.
 */
export function sampledStepMetrics(loop: SampledLoop, opts: StepOptions = {}): StepMetrics {
  const { kb, period: T, kp } = loop
  const loopState = new LoopStepper(loop)
  const { a, plant } = loopState
  const wc = opts.scaleFrequency ?? Math.sqrt(kb * Math.max(kp, 1e-12))
  const rest = kb / (wc * wc)
  const horizon = Math.max(60, 400 / wc, opts.horizon ?? 0)
  const horizonSteps = Math.min(1_000_000, Math.ceil(horizon / T))
  const maxSteps = 10 * horizonSteps

  let xMax = 0
  let tMax = 0
  let peakCommand = 0
  let peakServoRate = 0
  let lastOut = -1 // index of the last interval with a point outside the band
  const pieces = new Float64Array(4)
  let k = 0
  let diverged = false
  let quiet = false
  for (; k < maxSteps; k++) {
    // sample k
    const { x, v, th, uHeld } = loopState
    const u = loopState.control()
    if (Math.abs(u) > peakCommand) peakCommand = Math.abs(u)
    if (a !== Infinity) {
      const rate = Math.abs(uHeld - th) * a
      if (rate > peakServoRate) peakServoRate = rate
    }
    // interval [kT, (k+1)T] under uHeld
    loopState.advance(u)
    const { x: x1, v: v1 } = loopState
    // Endpoints first; the exact interior extremes only when v may change sign inside
    // (otherwise x is monotone over the interval) and a cheap envelope says they could matter.
    if (x1 > xMax) {
      xMax = x1
      tMax = (k + 1) * T
    }
    const endsOut = Math.abs(x - 1) > BAND || Math.abs(x1 - 1) > BAND
    if (endsOut) lastOut = k
    if (v * v1 <= 0 || th * uHeld < 0) {
      const thHi = th > uHeld ? th : uHeld
      const thLo = th < uHeld ? th : uHeld
      const hiBound = x + (v > 0 ? v * T : 0) + (thHi > 0 ? 0.5 * kb * thHi * T * T : 0)
      const loBound = x + (v < 0 ? v * T : 0) + (thLo < 0 ? 0.5 * kb * thLo * T * T : 0)
      if (hiBound > xMax || (!endsOut && (hiBound > 1 + BAND || loBound < 1 - BAND))) {
        const n = monotonePieces(v, th, uHeld, kb, a, T, pieces)
        for (let i = 1; i < n - 1; i++) {
          const xi = xAt(x, v, th, uHeld, kb, a, pieces[i]!)
          if (xi > xMax) {
            xMax = xi
            tMax = k * T + pieces[i]!
          }
          if (Math.abs(xi - 1) > BAND) lastOut = k
        }
      }
    }
    if (!(Math.abs(x1 - 1) < 1e6)) {
      diverged = true
      k++
      break
    }
    // settled for good?
    if (k + 1 >= horizonSteps && lastOut < k && k + 1 >= 4 * (lastOut + 1)) {
      k++
      break
    }
    if (lastOut < k && k + 1 >= 2 * (lastOut + 1) && k >= 20) {
      const q
        = Math.abs(x1 - 1)
          + Math.abs(v1) / wc
          + rest
          * (Math.abs(loopState.th) + Math.abs(u) + Math.abs(loopState.D) + Math.abs(loopState.I))
      if (q < 1e-4) {
        quiet = true
        k++
        break
      }
    }
  }
  const simulatedTime = k * T
  if (diverged) {
    return {
      overshootPct: null,
      peakTime: null,
      settlingTime: null,
      peakCommand,
      peakServoRate,
      diverged,
      simulatedTime,
    }
  }
  // Proven settled by the quiet test, or at the horizon after staying inside 3× as long as it took.
  const settled = quiet || (lastOut < k - 1 && k >= 4 * (lastOut + 1))
  let settlingTime: number | null = null
  if (settled && lastOut >= 0) settlingTime = lastOut * T + lastExit(loop, lastOut, plant)
  return {
    overshootPct: Math.max(0, 100 * (xMax - 1)),
    peakTime: tMax,
    settlingTime,
    peakCommand,
    peakServoRate,
    diverged,
    simulatedTime,
  }
}

/** Re-run to interval `index` and find, inside it, the last moment x re-enters the band. */
function lastExit(
  loop: SampledLoop,
  index: number,
  plant: ReturnType<typeof discretizePlant>,
): number {
  const { kb, period: T } = loop
  const loopState = new LoopStepper(loop, plant)
  for (let k = 0; k < index; k++) loopState.advance(loopState.control())
  const { x, v, th, uHeld, a } = loopState
  const pieces = new Float64Array(4)
  const n = monotonePieces(v, th, uHeld, kb, a, T, pieces)
  const outside = (y: number) => Math.abs(y - 1) > BAND
  for (let i = n - 1; i >= 1; i--) {
    const t0 = pieces[i - 1]!
    const t1 = pieces[i]!
    const x0 = xAt(x, v, th, uHeld, kb, a, t0)
    const x1 = xAt(x, v, th, uHeld, kb, a, t1)
    if (outside(x1)) return t1
    if (outside(x0)) {
      const edge = x0 > 1 ? 1 + BAND : 1 - BAND
      const f = (t: number) => xAt(x, v, th, uHeld, kb, a, t) - edge
      return brent(f, t0, t1, x0 - edge, x1 - edge, 1e-15 * T)
    }
  }
  return 0
}

export interface StepResponse {
  t: number[]
  x: number[]
  /** Held servo command, rad per metre of step. */
  command: number[]
  /** Servo angle, rad per metre of step. */
  servoAngle: number[]
}

/**
 * The sampled loop's linear unit-step response on a fine time grid, for plotting and comparison.
 */
export function sampledStepResponse(
  loop: SampledLoop,
  duration: number,
  pointsPerSample = 4,
): StepResponse {
  const { kb, period: T } = loop
  const loopState = new LoopStepper(loop)
  const { a } = loopState
  const out: StepResponse = { t: [], x: [], command: [], servoAngle: [] }
  const steps = Math.ceil(duration / T)
  for (let k = 0; k < steps; k++) {
    const { x, v, th, uHeld } = loopState
    const u = loopState.control()
    for (let j = 0; j < pointsPerSample; j++) {
      const tt = (j / pointsPerSample) * T
      out.t.push(k * T + tt)
      out.x.push(xAt(x, v, th, uHeld, kb, a, tt))
      out.command.push(uHeld)
      out.servoAngle.push(a === Infinity ? uHeld : uHeld + (th - uHeld) * Math.exp(-a * tt))
    }
    loopState.advance(u)
    if (!(Math.abs(loopState.x) < 1e9)) break
  }
  out.t.push((out.t.length / pointsPerSample) * T)
  out.x.push(loopState.x)
  out.command.push(loopState.uHeld)
  out.servoAngle.push(loopState.th)
  return out
}
