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
import { goldenMinimum } from './search'

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
  /** Whole samples of delay beyond the firmware's one (the what-if envelope); default 0. */
  extraDelaySamples?: number
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
  let delay: Polynomial = [1, 0]
  for (let m = 0; m < (loop.extraDelaySamples ?? 0); m++) delay = polyMul(delay, [1, 0])
  return polyAdd(polyMul(delay, polyMul(den, cDen)), polyMul(num, cNum))
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
  const { pNum, pDen, kp, b, al, kiT, extraDelaySamples } = sampledResponseOf(loop, plantW)
  let cNum: Polynomial
  let cDen: Polynomial
  if (kiT > 0) {
    cDen = [1, al, 0]
    cNum = [kp + b + kiT, kp * al + kiT * (1 + al), kiT * al]
  } else {
    cDen = [1, al]
    cNum = [kp + b, kp * al]
  }
  let delay: Polynomial = [1, 1]
  for (let m = 0; m < extraDelaySamples; m++) delay = polyMul(delay, [1, 1])
  return polyAdd(polyMul(delay, polyMul(pDen, cDen)), polyMul(pNum, cNum))
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
  /** Samples stepped (the cost of the metrics). */
  samples: number
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
  /**
   * Stop as soon as the metrics are proven final (default true); false steps every sample to the
   * horizon, as a brute-force reference.
   */
  prove?: boolean
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
  sPrev = 0
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
  readonly onMeasurement: boolean
  /** Commands waiting out the extra samples of delay, oldest first. */
  readonly queue: number[]

  constructor(loop: SampledLoop, plant?: ReturnType<typeof discretizePlant>) {
    this.queue = new Array<number>(loop.extraDelaySamples ?? 0).fill(0)
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
    if (this.queue.length > 0) {
      this.queue.push(u)
      u = this.queue.shift()!
    }
    this.uHeld = u
  }

  /** Size of the state: x, v, θ, held command, D, I, s_prev and the delayed commands. */
  get size(): number {
    return 7 + this.queue.length
  }

  /**
   * The state's deviation from rest at the setpoint (x = 1, all else 0), with s_prev taken
   * relative to the s the present x gives (so it is the last step's change, not a second copy of
   * the position).
   */
  read(out: Float64Array) {
    out[0] = this.x - 1
    out[1] = this.v
    out[2] = this.th
    out[3] = this.uHeld
    out[4] = this.D
    out[5] = this.I
    // s_prev relative to the s this sample would give: the last step's change, ≈ −v·T
    out[6] = this.sPrev - (this.onMeasurement ? -1 : 0) + out[0]!
    for (let i = 0; i < this.queue.length; i++) out[7 + i] = this.queue[i]!
  }

  write(e: Float64Array) {
    this.x = 1 + e[0]!
    this.v = e[1]!
    this.th = e[2]!
    this.uHeld = e[3]!
    this.D = e[4]!
    this.I = e[5]!
    this.sPrev = e[6]! - e[0]! + (this.onMeasurement ? -1 : 0)
    for (let i = 0; i < this.queue.length; i++) this.queue[i] = e[7 + i]!
  }
}

/**
 * A proof that the loop stays settled. With A the closed-loop map from one sample's state
 * (deviation from rest, scaled by S) to the next, P = Σ_j (Aᵀ)^j A^j solves the discrete
 * Lyapunov equation AᵀPA − P = −I (summed by doubling, Smith's method), so V(e) = eᵀPe never
 * grows along the loop's trajectory, and every later state obeys |c·e_j| ≤ √(V(e_k)·c P⁻¹ cᵀ)
 * for any row c (Cauchy–Schwarz in the P norm). null when A is not provably contracting.
 */
export interface SettleBound {
  /** S as a vector. */
  scale: Float64Array
  /** P, row-major. */
  p: Float64Array
  /** (P⁻¹)_ii for position, speed, servo angle and held command; and for command − angle. */
  gx: number
  gv: number
  gth: number
  gu: number
  gRate: number
}

function matMul(a: Float64Array, b: Float64Array, n: number, transposeA = false): Float64Array {
  const r = new Float64Array(n * n)
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const aik = transposeA ? a[k * n + i]! : a[i * n + k]!
      if (aik === 0) continue
      for (let j = 0; j < n; j++) r[i * n + j]! += aik * b[k * n + j]!
    }
  }
  return r
}

function invert(m: Float64Array, n: number): Float64Array | null {
  const a = m.slice()
  const inv = new Float64Array(n * n)
  for (let i = 0; i < n; i++) inv[i * n + i] = 1
  for (let c = 0; c < n; c++) {
    let piv = c
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * n + c]!) > Math.abs(a[piv * n + c]!)) piv = r
    const d = a[piv * n + c]!
    if (!(Math.abs(d) > 0)) return null
    for (let j = 0; j < n; j++) {
      const t = a[c * n + j]!
      const u = inv[c * n + j]!
      a[c * n + j] = a[piv * n + j]! / d
      inv[c * n + j] = inv[piv * n + j]! / d
      if (piv !== c) {
        a[piv * n + j] = t
        inv[piv * n + j] = u
      }
    }
    for (let r = 0; r < n; r++) {
      if (r === c) continue
      const f = a[r * n + c]!
      if (f === 0) continue
      for (let j = 0; j < n; j++) {
        a[r * n + j]! -= f * a[c * n + j]!
        inv[r * n + j]! -= f * inv[c * n + j]!
      }
    }
  }
  return inv
}

export function settleBound(loop: SampledLoop, scale: Float64Array): SettleBound | null {
  const probe = new LoopStepper(loop)
  const n = probe.size
  // A column by column: one step from each scaled unit deviation.
  let a: Float64Array = new Float64Array(n * n)
  const e = new Float64Array(n)
  const out = new Float64Array(n)
  for (let j = 0; j < n; j++) {
    e.fill(0)
    e[j] = 1 / scale[j]!
    const st = new LoopStepper(loop, probe.plant)
    st.write(e)
    st.advance(st.control())
    st.read(out)
    for (let i = 0; i < n; i++) a[i * n + j] = out[i]! * scale[i]!
  }
  if (loop.ki === 0) {
    // Without Ki the integral state stays 0 from rest: its eigenvalue 1 is never excited.
    for (let i = 0; i < n; i++) {
      a[i * n + 5] = 0
      a[5 * n + i] = 0
    }
  }
  // Smith's doubling: P_{2m} = P_m + (A^m)ᵀ P_m A^m, A^{2m} = (A^m)².
  let p: Float64Array = new Float64Array(n * n)
  for (let i = 0; i < n; i++) p[i * n + i] = 1
  for (let it = 0; it < 64; it++) {
    let norm = 0
    for (let i = 0; i < n * n; i++) norm = Math.max(norm, Math.abs(a[i]!))
    if (!Number.isFinite(norm)) return null
    if (norm < 1e-9) {
      const inv = invert(p, n)
      if (inv === null) return null
      const g = (i: number, j: number) => inv[i * n + j]!
      return {
        scale,
        p,
        gx: g(0, 0),
        gv: g(1, 1),
        gth: g(2, 2),
        gu: g(3, 3),
        gRate: Math.max(0, g(3, 3) + g(2, 2) - 2 * g(2, 3)),
      }
    }
    const pa = matMul(p, a, n)
    const atpa = matMul(a, pa, n, true)
    const next = new Float64Array(n * n)
    for (let i = 0; i < n * n; i++) next[i] = p[i]! + atpa[i]!
    p = next
    a = matMul(a, a, n)
  }
  return null
}

/**
 * Step response metrics of the sampled loop for a unit setpoint step at t = 0.
 * Stops as soon as settleBound proves that nothing later can change them: no later excursion
 * leaves the 2 % band (between samples too), rises above the peak found, or exceeds the peak
 * command and servo speed found; a response with no overshoot so far is proven to stay below
 * 1e−7 percentage points of overshoot. The metrics are then those of stepping on for ever.
 * Otherwise it stops at the horizon, where a response counts as settled only if it has stayed
 * inside three times as long as it took to get there.
 */
export function sampledStepMetrics(loop: SampledLoop, opts: StepOptions = {}): StepMetrics {
  const { kb, period: T, kp } = loop
  const loopState = new LoopStepper(loop)
  const { a, plant } = loopState
  const wc = opts.scaleFrequency ?? Math.sqrt(kb * Math.max(kp, 1e-12))
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
  // The settledness proof (settleBound), built the first time it is needed.
  let bound: SettleBound | null | undefined
  const dev = new Float64Array(loopState.size)
  // Between samples |x − 1| exceeds its value at the sample by at most |v|T + K_b·T²·max|θ|/2.
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
    // The proof is checked every 16th sample: it holds from any sample on once it holds.
    if ((k & 15) === 0 && lastOut < k && k >= 20 && bound !== null && opts.prove !== false) {
      if (bound === undefined) {
        const sc = new Float64Array(loopState.size).fill(kb / (wc * wc))
        sc[0] = 1
        sc[1] = 1 / wc
        sc[6] = 1 / (wc * T)
        bound = settleBound(loop, sc)
        if (bound === null) continue
      }
      loopState.read(dev)
      const n = dev.length
      for (let i = 0; i < n; i++) dev[i] = dev[i]! * bound.scale[i]!
      let v2 = 0
      for (let i = 0; i < n; i++) {
        let row = 0
        for (let j = 0; j < n; j++) row += bound.p[i * n + j]! * dev[j]!
        v2 += dev[i]! * row
      }
      const r = Math.sqrt(Math.max(0, v2) * (1 + 1e-9))
      const wT = wc * T
      const xReach = r * (Math.sqrt(bound.gx) + wT * Math.sqrt(bound.gv)
        + 0.5 * wT * wT * Math.max(Math.sqrt(bound.gth), Math.sqrt(bound.gu)))
      const uReach = ((r * wc * wc) / kb) * Math.sqrt(bound.gu)
      const rateReach = ((r * wc * wc) / kb) * Math.sqrt(bound.gRate)
      if (
        xReach < BAND
        && (xMax >= 1 + xReach || 100 * xReach < 1e-7)
        && uReach <= peakCommand
        && (a === Infinity || rateReach * a <= peakServoRate)
      ) {
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
      samples: k,
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
    samples: k,
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

// ---------------------------------------------------------------------------------------------
// The sampled loop's frequency response (docs/planner-model.md §4): L(z) = C(z)·z^(−1−m)·P(z)
// on z = e^(jωT), 0 < ω ≤ π/T, with P the exact zero-order-hold plant and C the exported
// discretisation, both written in w = z − 1 so they keep their precision near z = 1. This is the
// loop the firmware runs (LoopStepper's timing), so its margins are the ones shown and warned on.

/** What the sampled loop's frequency response needs, precomputed once per plant and gains. */
export interface SampledResponse {
  period: number
  /** Plant in w, highest power first. */
  pNum: Polynomial
  pDen: Polynomial
  kp: number
  /** Derivative: b·w/(w + al). */
  b: number
  al: number
  kiT: number
  /** Whole samples of delay beyond the one the firmware always has. */
  extraDelaySamples: number
}

export function sampledResponseOf(
  loop: SampledLoop,
  plantW?: { num: Polynomial, den: Polynomial },
  extraDelaySamples = loop.extraDelaySamples ?? 0,
): SampledResponse {
  const p = plantW ?? discretizePlantW(loop.kb, loop.servoLag, loop.period)
  const { b, oneMinusA: al } = derivativeCoefficients(
    loop.kd,
    loop.tf,
    loop.period,
    loop.discretization,
  )
  return {
    period: loop.period,
    pNum: p.num,
    pDen: p.den,
    kp: loop.kp,
    b,
    al,
    kiT: loop.ki * loop.period,
    extraDelaySamples,
  }
}

function polyAt(p: Polynomial, re: number, im: number): [number, number] {
  let r = 0
  let i = 0
  for (const c of p) {
    const nr = r * re - i * im + c
    i = r * im + i * re
    r = nr
  }
  return [r, i]
}

/**
 * The parts of L(e^(jωT)) that do not depend on the gains, at one frequency: w = e^(jωT) − 1
 * and the plant with the loop's delay, P(w)·z^(−1−m).
 */
function plantPart(s: SampledResponse, w: number, out: Float64Array, at = 0) {
  const th = w * s.period
  const sh = Math.sin(th / 2)
  // w = e^(jθ) − 1 = −2 sin²(θ/2) + j sin θ, without cancellation near θ = 0.
  const wr = -2 * sh * sh
  const wi = Math.sin(th)
  const [nr, ni] = polyAt(s.pNum, wr, wi)
  const [dr, di] = polyAt(s.pDen, wr, wi)
  const dd = dr * dr + di * di
  const pr = (nr * dr + ni * di) / dd
  const pi = (ni * dr - nr * di) / dd
  const dth = (1 + s.extraDelaySamples) * th
  const c = Math.cos(dth)
  const sn = Math.sin(dth)
  out[at] = wr
  out[at + 1] = wi
  out[at + 2] = pr * c + pi * sn
  out[at + 3] = pi * c - pr * sn
}

/** L from a plant part: C = Kp + b·w/(w + al) + Ki·T·(w + 1)/w times the plant part. */
function loopFrom(
  s: SampledResponse,
  wr: number,
  wi: number,
  pr: number,
  pi: number,
): [number, number] {
  let cr = s.kp
  let ci = 0
  if (s.b !== 0) {
    const er = wr + s.al
    const e2 = er * er + wi * wi
    cr += (s.b * (wr * er + wi * wi)) / e2
    ci += (s.b * (wi * er - wr * wi)) / e2
  }
  if (s.kiT !== 0) {
    // (w + 1)/w = 1 + conj(w)/|w|²
    const w2 = wr * wr + wi * wi
    cr += s.kiT * (1 + wr / w2)
    ci -= (s.kiT * wi) / w2
  }
  return [cr * pr - ci * pi, cr * pi + ci * pr]
}

const scratch = new Float64Array(4)

/** L(e^(jωT)) as [re, im]. */
export function sampledLoopAt(s: SampledResponse, w: number): [number, number] {
  plantPart(s, w, scratch)
  return loopFrom(s, scratch[0]!, scratch[1]!, scratch[2]!, scratch[3]!)
}

/**
 * The gain-free part of L on the grid, reusable across many gains (the stability map): per
 * point w's real and imaginary parts and the plant with its delay.
 */
export interface SampledPlantTable {
  period: number
  extraDelaySamples: number
  grid: Float64Array
  /** 4 numbers a grid point: Re w, Im w, Re P·z^(−1−m), Im P·z^(−1−m). */
  parts: Float64Array
}

export function sampledPlantTable(s: SampledResponse, grid = sampledGrid(s.period)) {
  const parts = new Float64Array(4 * grid.length)
  for (let k = 0; k < grid.length; k++) plantPart(s, grid[k]!, parts, 4 * k)
  return { period: s.period, extraDelaySamples: s.extraDelaySamples, grid, parts }
}

export interface SampledMargins {
  /**
   * dB a common rise of Kp, Kd and Ki tolerates before the sampled loop oscillates; null = no
   * crossing of the negative real axis inside −1 (unbounded).
   */
  gainMarginDb: number | null
  /** dB (< 0) a common fall tolerates, where a crossing outside −1 exists (PID); else null. */
  gainReductionMarginDb: number | null
  /** Degrees: the least rotation to −1 over the gain crossovers (negative when lacking). */
  phaseMarginDeg: number | null
  gainCrossover: number | null
  phaseCrossover: number | null
  /** Extra delay, s, that rotates a gain crossover onto −1; null = no gain crossover. */
  delayMargin: number | null
  gainCrossovers: number[]
  phaseCrossovers: { frequency: number, magnitude: number }[]
  /** max 1/|1 + L| over 0 < ω ≤ π/T. */
  sensitivityPeak: number
  sensitivityPeakFrequency: number
}

/** Points a decade on the sampled loop's frequency grid. */
const SAMPLED_GRID_PER_DECADE = 32
/** The grid starts at this frequency, rad/s (well below any integral zero the planner gives). */
const SAMPLED_GRID_LOW = 1e-6

/** The grid: log-spaced from SAMPLED_GRID_LOW to π/T, ending exactly at π/T. */
export function sampledGrid(period: number): Float64Array {
  const top = Math.PI / period
  const n = Math.max(2, Math.ceil(Math.log10(top / SAMPLED_GRID_LOW) * SAMPLED_GRID_PER_DECADE) + 1)
  const g = new Float64Array(n)
  for (let k = 0; k < n; k++) g[k] = top * (SAMPLED_GRID_LOW / top) ** ((n - 1 - k) / (n - 1))
  g[n - 1] = top
  return g
}

/**
 * Margins of the sampled loop: gain crossovers (|L| = 1) and phase crossovers (L on the negative
 * real axis, including ω = π/T where L is real) bracketed on the grid and refined by Brent's
 * method; the sensitivity peak refined by golden section. Scaling Kp, Kd and Ki together scales
 * L, so the gain margin is exactly the factor at which the closed loop's roots reach the unit
 * circle.
 */
export function sampledMargins(
  s: SampledResponse,
  table: SampledPlantTable = sampledPlantTable(s),
): SampledMargins {
  const { grid, parts } = table
  const n = grid.length
  const at = (k: number) =>
    loopFrom(s, parts[4 * k]!, parts[4 * k + 1]!, parts[4 * k + 2]!, parts[4 * k + 3]!)
  // Start where |L| > 10 and the low-frequency asymptote rules, one decade below: nothing
  // crosses below that.
  let k0 = n - 1 - 3 * SAMPLED_GRID_PER_DECADE
  for (; k0 > 0; k0 -= SAMPLED_GRID_PER_DECADE) {
    if (k0 >= n) continue
    const [r, i] = at(k0)
    if (r * r + i * i > 100 && (s.kiT === 0 || i > 0)) break
  }
  k0 = Math.max(0, k0 - SAMPLED_GRID_PER_DECADE)
  const gainCrossovers: number[] = []
  const phaseCrossovers: { frequency: number, magnitude: number }[] = []
  const imAt = (u: number) => sampledLoopAt(s, Math.exp(u))[1]
  const logMagAt = (u: number) => {
    const [r, i] = sampledLoopAt(s, Math.exp(u))
    return Math.log(r * r + i * i)
  }
  const sensAt = (w: number) => {
    const [r, i] = sampledLoopAt(s, w)
    return 1 / Math.hypot(1 + r, i)
  }
  let prevI = 0
  let prevM = 0
  let ms = 0
  let msK = 0
  for (let k = k0; k < n; k++) {
    const w = grid[k]!
    const l = at(k)
    const r = l[0]
    const i = k === n - 1 ? 0 : l[1] // z = −1: L is real
    const m = Math.log(r * r + i * i)
    const sens = 1 / Math.hypot(1 + r, i)
    if (sens > ms) {
      ms = sens
      msK = k
    }
    if (k > k0) {
      const lo = Math.log(grid[k - 1]!)
      const hi = Math.log(w)
      if (prevM * m < 0 || (m === 0 && prevM !== 0)) {
        gainCrossovers.push(Math.exp(brent(logMagAt, lo, hi, prevM, m)))
      }
      if (k < n - 1 && prevI * i < 0) {
        const u = brent(imAt, lo, hi, prevI, i)
        const [cr, ci] = sampledLoopAt(s, Math.exp(u))
        if (cr < 0) phaseCrossovers.push({ frequency: Math.exp(u), magnitude: Math.hypot(cr, ci) })
      }
    }
    if (k === n - 1 && r < 0) phaseCrossovers.push({ frequency: w, magnitude: -r })
    prevI = i
    prevM = m
  }
  let msW = grid[msK]!
  if (n > 2) {
    const a = grid[Math.max(0, msK - 1)]!
    const b = grid[Math.min(n - 1, msK + 1)]!
    // Ms is a maximum: minimise its negative, down to 0.618⁴⁰ of the bracket
    const x = goldenMinimum(w => -sensAt(w), a, b, (b - a) * 4e-9)
    const v = sensAt(x)
    if (v > ms) {
      ms = v
      msW = x
    }
  }

  let phaseMarginDeg: number | null = null
  let gainCrossover: number | null = null
  let delayMargin: number | null = null
  for (const wg of gainCrossovers) {
    const [r, i] = sampledLoopAt(s, wg)
    let pm = Math.atan2(i, r) + Math.PI // (0, 2π]
    const lag = pm >= 2 * Math.PI ? 0 : pm // the extra lag that rotates L onto −1
    if (pm > Math.PI) pm -= 2 * Math.PI
    const pmDeg = (pm * 180) / Math.PI
    if (phaseMarginDeg === null || pmDeg < phaseMarginDeg) {
      phaseMarginDeg = pmDeg
      gainCrossover = wg
    }
    const dm = lag / wg
    if (delayMargin === null || dm < delayMargin) delayMargin = dm
  }
  let bestBelow = -1
  let phaseCrossover: number | null = null
  let worstAbove = Infinity
  for (const c of phaseCrossovers) {
    if (c.magnitude < 1) {
      if (c.magnitude > bestBelow) {
        bestBelow = c.magnitude
        phaseCrossover = c.frequency
      }
    } else if (c.magnitude < worstAbove) worstAbove = c.magnitude
  }
  return {
    gainMarginDb: bestBelow > 0 ? -20 * Math.log10(bestBelow) : null,
    gainReductionMarginDb: worstAbove < Infinity ? -20 * Math.log10(worstAbove) : null,
    phaseMarginDeg,
    gainCrossover,
    phaseCrossover,
    delayMargin,
    gainCrossovers,
    phaseCrossovers,
    sensitivityPeak: ms,
    sensitivityPeakFrequency: msW,
  }
}
