// A stability map over the Kp–Kd plane (docs/planner-model.md §9): per cell the exact verdict
// on the sampled loop the firmware runs, plus its margins for the tones and contours.
//
// What does not depend on the gains is done once: the zero-order-hold plant in w = z − 1, and
// the plant's sampled frequency response (magnitude and unwrapped phase) on a θ = ωT grid.
// - Stability, every cell: the closed-loop polynomial in w is built in place from the
//   precomputed plant and the cell's controller, and tested with diskStable (every root inside
//   the unit circle): the same test as sampledStable, only without rebuilding the plant.
// - Margins, on a coarser grid of nodes (about 25 a side), interpolated bilinearly between them:
//   at each node the sampled loop's frequency response is scanned on the θ grid, and the gain and
//   phase crossovers are located by linear interpolation in log θ between grid points. The
//   margins only colour the stable cells and draw the 30°/45° contours, so a few tenths of a
//   degree between nodes do not change what the map says; the verdict itself is exact per cell.
import { filterTimeConstant } from './design'
import { discretizePlantW, plantOf } from './plant'
import { derivativeCoefficients, hurwitzStable } from './sampled'
import type { DerivativeSignal, Discretization, Rig } from './schema'

export interface StabilityMapOptions {
  /** [min, max] rad/m. */
  kpRange: [number, number]
  /** [min, max] rad·s/m. */
  kdRange: [number, number]
  /** Derivative filter N for every cell. */
  n: number
  derivativeOn: DerivativeSignal
  /** A fixed Ki for a PID map, rad/(m·s); default 0. */
  ki?: number
  /** Axis spacing; default 'linear'. 'log' needs positive ranges. */
  scale?: 'linear' | 'log'
  /**
   * How the firmware discretises the derivative (default backward Euler). A cell whose filter is
   * too short for Tustin (T_f < T/2) is judged with backward Euler, as the firmware falls back.
   */
  discretization?: Discretization
}

export interface StabilityMap {
  /** Column values, rad/m. */
  kp: number[]
  /** Row values, rad·s/m. */
  kd: number[]
  /** stable[row][column] = stable[kd index][kp index]: the sampled loop's exact root test. */
  stable: boolean[][]
  /**
   * Degrees, the sampled loop's phase margin (interpolated between margin nodes), null where
   * there is no gain crossover; same layout.
   */
  phaseMarginDeg: (number | null)[][]
  /**
   * dB, the sampled loop's gain margin (interpolated between margin nodes), null where there is
   * no phase crossover (unbounded); same layout.
   */
  gainMarginDb: (number | null)[][]
  /** Share of cells that are stable, 0…1. */
  stableFraction: number
}

function axis(range: [number, number], count: number, scale: 'linear' | 'log'): number[] {
  const [lo, hi] = range
  if (count === 1) return [lo]
  const out: number[] = []
  for (let i = 0; i < count; i++) {
    const f = i / (count - 1)
    out.push(scale === 'log' ? lo * (hi / lo) ** f : lo + (hi - lo) * f)
  }
  return out
}

/** The controller of one cell, as the sampled loop's polynomials need it. */
interface Cell {
  kp: number
  /** Derivative step b and 1 − a of the discretised filter. */
  b: number
  oneMinusA: number
  kiT: number
}

function cellOf(
  kp: number,
  kd: number,
  n: number,
  kiT: number,
  period: number,
  discretization: Discretization,
): Cell {
  const tf = filterTimeConstant(kp, kd, n)
  let coef = derivativeCoefficients(kd, tf, period, discretization)
  if (!coef.ok) coef = derivativeCoefficients(kd, tf, period, 'backward-euler')
  return { kp, b: coef.b, oneMinusA: coef.oneMinusA, kiT }
}

/**
 * The closed-loop polynomial in w, (w + 1)·D_p·D_c + N_p·N_c (as sampledCharacteristicW), with
 * D_p = w²(w + ε) and N_p = [n0, n1, n2], written into `out` (length 7, highest power first).
 */
function characteristicInto(out: number[], eps: number, np: number[], c: Cell): void {
  const { kp, b, oneMinusA: al, kiT } = c
  // (w + 1)·w²·(w + ε) = w⁴ + (1 + ε)w³ + εw², times D_c.
  const e1 = 1 + eps
  const n0 = np[0]!
  const n1 = np[1]!
  const n2 = np[2]!
  if (kiT > 0) {
    // D_c = w² + al·w; N_c = [kp + b + kiT, kp·al + kiT(1 + al), kiT·al].
    const c0 = kp + b + kiT
    const c1 = kp * al + kiT * (1 + al)
    const c2 = kiT * al
    out[0] = 1
    out[1] = e1 + al
    out[2] = eps + e1 * al + n0 * c0
    out[3] = eps * al + n0 * c1 + n1 * c0
    out[4] = n0 * c2 + n1 * c1 + n2 * c0
    out[5] = n1 * c2 + n2 * c1
    out[6] = n2 * c2
  } else {
    // D_c = w + al; N_c = [kp + b, kp·al]; degree 5, so the first coefficient is 0.
    const c0 = kp + b
    const c1 = kp * al
    out[0] = 0
    out[1] = 1
    out[2] = e1 + al
    out[3] = eps + e1 * al + n0 * c0
    out[4] = eps * al + n0 * c1 + n1 * c0
    out[5] = n1 * c1 + n2 * c0
    out[6] = n2 * c1
  }
}

/**
 * diskStable's map of the disk onto the left half-plane, w = 2q/(1 − q), as a matrix: for a
 * polynomial of degree n in w (coefficients c_i of w^i), Q(q) = Σ_i c_i (2q)^i (1 − q)^(n−i).
 * bilinear[n][row·(n+1) + i] is the coefficient of q^(n−row) contributed by c_i.
 */
function bilinearMatrix(n: number): Float64Array {
  const m = new Float64Array((n + 1) * (n + 1))
  let pow2 = 1
  for (let i = 0; i <= n; i++) {
    let binom = 1
    const rest = n - i
    for (let j = 0; j <= rest; j++) {
      m[(n - (i + j)) * (n + 1) + i]! += j % 2 === 0 ? pow2 * binom : -pow2 * binom
      binom = (binom * (rest - j)) / (j + 1)
    }
    pow2 *= 2
  }
  return m
}
const BILINEAR: Record<5 | 6, Float64Array> = { 5: bilinearMatrix(5), 6: bilinearMatrix(6) }

/**
 * diskStable (every root w with |w + 1| < 1) for the map's polynomials of degree 6, or 5 when the
 * first coefficient is 0: the same map and the same Routh–Hurwitz test, without allocating the
 * map per cell.
 */
function cellStable(poly: number[], q: Float64Array, q5: Float64Array): boolean {
  const n = poly[0] === 0 ? 5 : 6
  const m = BILINEAR[n]
  const out = n === 5 ? q5 : q
  for (let row = 0; row <= n; row++) {
    let v = 0
    for (let i = 0; i <= n; i++) v += m[row * (n + 1) + i]! * poly[6 - i]!
    out[row] = v
  }
  return hurwitzStable(out)
}

/** θ = ωT grid for the margins: log-spaced, 24 points a decade, from 1e−6 up to π. */
const THETA_PER_DECADE = 24
const THETA: Float64Array = (() => {
  const lo = -6
  const hi = Math.log10(Math.PI)
  const count = Math.ceil((hi - lo) * THETA_PER_DECADE) + 1
  const g = new Float64Array(count)
  for (let k = 0; k < count; k++) g[k] = 10 ** (lo + ((hi - lo) * k) / (count - 1))
  return g
})()

/**
 * The plant part of the sampled loop, z⁻¹·N_p/D_p at z = e^(jθ), with w = z − 1: |·|² and the
 * unwrapped phase (−π as θ → 0, the double integrator), and what the controller needs of w.
 */
interface SampledPlantTable {
  theta: Float64Array
  mag2: Float64Array
  phase: Float64Array
  wr: Float64Array
  wi: Float64Array
  /** −cot(θ/2)/2: the imaginary part of z/(z − 1) (its real part is 1/2). */
  integralIm: Float64Array
  /** The smallest |·|² from the grid's start up to each point (non-increasing). */
  lowMag2: Float64Array
}

function sampledPlantTable(np: number[], eps: number): SampledPlantTable {
  const m = THETA.length
  const t: SampledPlantTable = {
    theta: THETA,
    mag2: new Float64Array(m),
    phase: new Float64Array(m),
    wr: new Float64Array(m),
    wi: new Float64Array(m),
    integralIm: new Float64Array(m),
    lowMag2: new Float64Array(m),
  }
  let prev = -Math.PI
  for (let k = 0; k < m; k++) {
    const th = THETA[k]!
    // w = e^(jθ) − 1, computed without cancellation.
    const wr = -2 * Math.sin(th / 2) ** 2
    const wi = Math.sin(th)
    // N_p(w) = n0 w² + n1 w + n2
    const w2r = wr * wr - wi * wi
    const w2i = 2 * wr * wi
    const nr = np[0]! * w2r + np[1]! * wr + np[2]!
    const ni = np[0]! * w2i + np[1]! * wi
    // (w + 1)·w²·(w + ε) = z·w²·(w + ε)
    const qr = wr + eps
    const dr0 = w2r * qr - w2i * wi
    const di0 = w2r * wi + w2i * qr
    const zr = Math.cos(th)
    const zi = wi
    const dr = dr0 * zr - di0 * zi
    const di = dr0 * zi + di0 * zr
    const n2 = nr * nr + ni * ni
    const d2 = dr * dr + di * di
    t.mag2[k] = n2 / d2
    let ph = Math.atan2(ni, nr) - Math.atan2(di, dr)
    ph += 2 * Math.PI * Math.round((prev - ph) / (2 * Math.PI))
    t.phase[k] = ph
    prev = ph
    t.wr[k] = wr
    t.wi[k] = wi
    t.integralIm[k] = -0.5 / Math.tan(th / 2)
    t.lowMag2[k] = k === 0 ? t.mag2[k]! : Math.min(t.lowMag2[k - 1]!, t.mag2[k]!)
  }
  return t
}

/**
 * Margins of the sampled loop with the controller of `c`, from a scan of `table`. A gain margin
 * of null means no phase crossover; a phase margin of null no gain crossover. For a stable loop
 * the gain margin is the upper one (the phase crossover with the largest |L| below 1), for an
 * unstable one the minimum over every phase crossover, as for the continuous loop (§4).
 */
function sampledMarginsOf(
  table: SampledPlantTable,
  c: Cell,
  stable: boolean,
): { gainMarginDb: number | null, phaseMarginDeg: number | null } {
  const { mag2, phase, wr, wi, integralIm, lowMag2 } = table
  const { kp, b, oneMinusA: al, kiT } = c
  // |C| ≥ Re C ≥ Kp, so while Kp²·(smallest plant |·|² so far) > 1 there is no gain crossover,
  // and a phase crossover there has |L| > 1 (it does not bound the upper gain margin): the scan
  // starts just before the last such point. Only an unstable loop's margin (the minimum over every
  // crossover) could have used one, and the map shows no margin tone for an unstable cell.
  let lo = 0
  let hi = mag2.length - 1
  const floor2 = 1 / (kp * kp)
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1
    if (lowMag2[mid]! > floor2) lo = mid
    else hi = mid - 1
  }
  const start = Math.max(0, lo - 1)
  let pm: number | null = null
  let bestBelow = -1
  let worst = -1
  let prevLm = 0
  let prevPh = 0
  let prevFl = 0
  for (let k = start; k < mag2.length; k++) {
    // C = Kp + b·w/(w + al) + Ki·T·z/(z − 1); its real part is ≥ Kp > 0.
    const xr = wr[k]! + al
    const xi = wi[k]!
    const den = xr * xr + xi * xi
    let cr = kp + (b * (wr[k]! * xr + xi * xi)) / den
    let ci = (b * (xi * xr - wr[k]! * xi)) / den
    if (kiT > 0) {
      cr += 0.5 * kiT
      ci += kiT * integralIm[k]!
    }
    const lm = Math.log((cr * cr + ci * ci) * mag2[k]!)
    const ph = Math.atan2(ci, cr) + phase[k]!
    const fl = Math.floor((ph + Math.PI) / (2 * Math.PI))
    if (k > start) {
      if (prevLm * lm < 0 || (lm === 0 && prevLm !== 0)) {
        const f = prevLm / (prevLm - lm)
        const phc = prevPh + f * (ph - prevPh)
        const m = 180 + (phc * 180) / Math.PI
        if (pm === null || m < pm) pm = m
      }
      if (fl !== prevFl) {
        const lo = Math.min(fl, prevFl)
        const hi = Math.max(fl, prevFl)
        for (let j = hi; j > lo; j--) {
          const target = 2 * Math.PI * j - Math.PI
          const f = (target - prevPh) / (ph - prevPh)
          const m2 = Math.exp(prevLm + f * (lm - prevLm))
          if (m2 > worst) worst = m2
          if (m2 < 1 && m2 > bestBelow) bestBelow = m2
        }
      }
    }
    prevLm = lm
    prevPh = ph
    prevFl = fl
  }
  let gm: number | null = null
  if (stable) {
    if (bestBelow > 0) gm = -10 * Math.log10(bestBelow)
  } else if (worst > 0) {
    gm = -10 * Math.log10(worst)
  }
  return { gainMarginDb: gm, phaseMarginDeg: pm }
}

/** Node indices for the margins: every `step`-th index and the last. */
function nodesOf(count: number): number[] {
  const step = Math.max(1, Math.floor(count / 24))
  const out: number[] = []
  for (let i = 0; i < count; i += step) out.push(i)
  if (out[out.length - 1] !== count - 1) out.push(count - 1)
  return out
}

/** Bilinear interpolation of node values onto every index; a missing corner takes the nearest. */
function spread(
  nodeValues: (number | null)[][],
  rowNodes: number[],
  colNodes: number[],
  rows: number,
  cols: number,
): (number | null)[][] {
  const locate = (nodes: number[], i: number): [number, number] => {
    let j = 0
    while (j + 1 < nodes.length - 1 && nodes[j + 1]! <= i) j++
    if (nodes.length === 1) return [0, 0]
    const span = nodes[j + 1]! - nodes[j]!
    return [j, span > 0 ? (i - nodes[j]!) / span : 0]
  }
  const out: (number | null)[][] = []
  for (let r = 0; r < rows; r++) {
    const [jr, fr] = locate(rowNodes, r)
    const row: (number | null)[] = []
    for (let c = 0; c < cols; c++) {
      const [jc, fc] = locate(colNodes, c)
      const r1 = Math.min(jr + 1, rowNodes.length - 1)
      const c1 = Math.min(jc + 1, colNodes.length - 1)
      const v00 = nodeValues[jr]![jc]!
      const v01 = nodeValues[jr]![c1]!
      const v10 = nodeValues[r1]![jc]!
      const v11 = nodeValues[r1]![c1]!
      if (v00 !== null && v01 !== null && v10 !== null && v11 !== null) {
        const top = v00 + (v01 - v00) * fc
        const bottom = v10 + (v11 - v10) * fc
        row.push(top + (bottom - top) * fr)
      } else {
        row.push(nodeValues[fr < 0.5 ? jr : r1]![fc < 0.5 ? jc : c1]!)
      }
    }
    out.push(row)
  }
  return out
}

export function stabilityMap(
  rig: Rig,
  options: StabilityMapOptions,
  resolution: number | { kp: number, kd: number } = 60,
): StabilityMap {
  const plant = plantOf(rig)
  const nKp = Math.max(1, Math.round(typeof resolution === 'number' ? resolution : resolution.kp))
  const nKd = Math.max(1, Math.round(typeof resolution === 'number' ? resolution : resolution.kd))
  const scale = options.scale ?? 'linear'
  const kps = axis(options.kpRange, nKp, scale)
  const kds = axis(options.kdRange, nKd, scale)
  const kiT = (options.ki ?? 0) * plant.period
  const discretization = options.discretization ?? 'backward-euler'
  const zoh = discretizePlantW(plant.kb, plant.servoLag, plant.period)
  const eps = zoh.den[1]!
  const poly = new Array<number>(7).fill(0)
  const q = new Float64Array(7)
  const q5 = new Float64Array(6)
  const cellAt = (kp: number, kd: number) =>
    cellOf(kp, kd, options.n, kiT, plant.period, discretization)

  const stable: boolean[][] = []
  let count = 0
  for (const kd of kds) {
    const row: boolean[] = []
    for (const kp of kps) {
      characteristicInto(poly, eps, zoh.num, cellAt(kp, kd))
      const ok = kp > 0 && cellStable(poly, q, q5)
      row.push(ok)
      if (ok) count++
    }
    stable.push(row)
  }

  const table = sampledPlantTable(zoh.num, eps)
  const rowNodes = nodesOf(nKd)
  const colNodes = nodesOf(nKp)
  const pmNodes: (number | null)[][] = []
  const gmNodes: (number | null)[][] = []
  for (const r of rowNodes) {
    const pRow: (number | null)[] = []
    const gRow: (number | null)[] = []
    for (const c of colNodes) {
      if (!(kps[c]! > 0)) {
        pRow.push(null)
        gRow.push(null)
        continue
      }
      const m = sampledMarginsOf(table, cellAt(kps[c]!, kds[r]!), stable[r]![c]!)
      pRow.push(m.phaseMarginDeg)
      gRow.push(m.gainMarginDb)
    }
    pmNodes.push(pRow)
    gmNodes.push(gRow)
  }
  return {
    kp: kps,
    kd: kds,
    stable,
    phaseMarginDeg: spread(pmNodes, rowNodes, colNodes, nKd, nKp),
    gainMarginDb: spread(gmNodes, rowNodes, colNodes, nKd, nKp),
    stableFraction: count / (nKp * nKd),
  }
}
