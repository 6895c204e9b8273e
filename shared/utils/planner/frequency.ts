// Stability margins of L(s) = C(s)·1/(τ_s s + 1)·K_b/s²·e^(−δ s), evaluated exactly on s = jω
// (no Padé), with C(s) = Kp + Ki/s + Kd s/(1 + T_f s) — the whole controller, whichever signal
// the derivative acts on (docs/planner-model.md §4).
//
// Method: one fixed log-spaced frequency grid (16 points a decade) brackets every gain
// crossover (|L| = 1) and every phase crossover (unwrapped phase = −180° − k·360°); Brent's
// method then refines each bracket on the exact expressions. The unwrapped phase is explicit,
// atan2(Im C, Re C) − atan(τ_s ω) − π − δω, continuous because Re C ≥ Kp > 0.
//
// Stability is the Nyquist criterion applied to that same curve: L has no right-half-plane
// poles, its double (or, with Ki, triple) pole at s = 0 is passed on a small right-hand
// indentation, and each crossing of the negative real axis left of −1 adds one closed-loop
// right-half-plane pole (downward phase) or removes one (upward phase). The indentation is
// where the ω → 0 limit of the double integrator lives; it is counted, not reported as a
// phase crossover.
//
// "None" is null in every result here: a gain margin of null means no phase crossover
// (unbounded), a crossover of null means there is none.

export interface LoopParams {
  /** K_b, m/s² per rad. */
  kb: number
  /** τ_s, s (0 = no servo lag). */
  servoLag: number
  /** Pure delay, s (1.5·T for the sampled loop). */
  delay: number
  kp: number
  ki: number
  kd: number
  /** Derivative filter time constant T_f, s (0 = unfiltered). */
  tf: number
}

export interface FrequencyAnalysis {
  /** The loop with its delay passes the Nyquist test. */
  nyquistStable: boolean
  /** Closed-loop poles in the right half plane, by the Nyquist count. */
  unstablePoles: number
  /**
   * Gain margin, dB. For a stable loop: how much the gain may rise, from the phase crossover
   * with the largest |L| below 1. For an unstable loop: the minimum over all phase crossovers
   * (negative when a crossover has |L| > 1). null = no phase crossover (unbounded).
   */
  gainMarginDb: number | null
  /**
   * Stable loops only: how far the gain may fall before a low-frequency crossover bites (≤ 0 dB).
   */
  gainReductionMarginDb: number | null
  /** Frequency of the gain-margin crossover, rad/s. */
  phaseCrossover: number | null
  /**
   * Minimum over gain crossovers of 180° + unwrapped phase, degrees (below 90°; negative when
   * lacking).
   */
  phaseMarginDeg: number | null
  /** Frequency of the phase-margin crossover, rad/s. */
  gainCrossover: number | null
  /**
   * Extra pure delay the loop tolerates, s: 0 for an unstable loop, null without a gain crossover.
   */
  delayMargin: number | null
  gainCrossovers: number[]
  phaseCrossovers: { frequency: number, magnitude: number }[]
}

export const GRID_PER_DECADE = 16
const GRID_MIN_EXP = -6
const GRID_MAX_EXP = 8
const GRID_SIZE = (GRID_MAX_EXP - GRID_MIN_EXP) * GRID_PER_DECADE + 1
/** The shared frequency grid, rad/s, 1e−6 … 1e8. */
export const FREQUENCY_GRID: Float64Array = (() => {
  const g = new Float64Array(GRID_SIZE)
  for (let k = 0; k < GRID_SIZE; k++) g[k] = 10 ** (GRID_MIN_EXP + k / GRID_PER_DECADE)
  return g
})()

const TWO_PI = 2 * Math.PI

/** Plant part of L on the shared grid, reusable across many controllers (e.g. a stability map). */
export interface PlantTable {
  kb: number
  servoLag: number
  delay: number
  /** −atan(τ_s ω) − π − δω. */
  phase: Float64Array
  /** K_b²/(ω⁴(1 + τ_s²ω²)). */
  mag2: Float64Array
}

export function plantTable(kb: number, servoLag: number, delay: number): PlantTable {
  const phase = new Float64Array(GRID_SIZE)
  const mag2 = new Float64Array(GRID_SIZE)
  for (let k = 0; k < GRID_SIZE; k++) {
    const w = FREQUENCY_GRID[k]!
    phase[k] = -Math.atan(servoLag * w) - Math.PI - delay * w
    const w2 = w * w
    mag2[k] = (kb * kb) / (w2 * w2 * (1 + servoLag * servoLag * w2))
  }
  return { kb, servoLag, delay, phase, mag2 }
}

/** Unwrapped phase of L(jω), rad. */
export function loopPhase(p: LoopParams, w: number): number {
  const den = 1 + p.tf * p.tf * w * w
  const re = p.kp + (p.kd * p.tf * w * w) / den
  const im = (p.kd * w) / den - p.ki / w
  return Math.atan2(im, re) - Math.atan(p.servoLag * w) - Math.PI - p.delay * w
}

/** |L(jω)|². */
export function loopMagnitude2(p: LoopParams, w: number): number {
  const den = 1 + p.tf * p.tf * w * w
  const re = p.kp + (p.kd * p.tf * w * w) / den
  const im = (p.kd * w) / den - p.ki / w
  const w2 = w * w
  return ((re * re + im * im) * p.kb * p.kb) / (w2 * w2 * (1 + p.servoLag * p.servoLag * w2))
}

/** A decreasing upper bound of |L(jω)|², so a scan can stop once nothing above can matter. */
function magnitudeBound2(p: LoopParams, w: number): number {
  const c = p.kp + p.ki / w + (p.kd * w) / Math.sqrt(1 + p.tf * p.tf * w * w)
  const w2 = w * w
  return (c * c * p.kb * p.kb) / (w2 * w2 * (1 + p.servoLag * p.servoLag * w2))
}

/** Brent's root finder on [a, b] with f(a), f(b) of opposite signs. */
export function brent(
  f: (x: number) => number,
  a: number,
  b: number,
  fa: number,
  fb: number,
  tol = 1e-13,
): number {
  if (fa === 0) return a
  if (fb === 0) return b
  let c = a
  let fc = fa
  let d = b - a
  let e = d
  for (let iter = 0; iter < 100; iter++) {
    if (fb * fc > 0) {
      c = a
      fc = fa
      d = b - a
      e = d
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b
      b = c
      c = a
      fa = fb
      fb = fc
      fc = fa
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tol
    const xm = 0.5 * (c - b)
    if (Math.abs(xm) <= tol1 || fb === 0) return b
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa
      let p: number
      let q: number
      if (a === c) {
        p = 2 * xm * s
        q = 1 - s
      } else {
        const qq = fa / fc
        const r = fb / fc
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1))
        q = (qq - 1) * (r - 1) * (s - 1)
      }
      if (p > 0) q = -q
      else p = -p
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d
        d = p / q
      } else {
        d = xm
        e = d
      }
    } else {
      d = xm
      e = d
    }
    a = b
    fa = fb
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1
    fb = f(b)
  }
  return b
}

function characteristicRange(p: LoopParams): { lo: number, hi: number } | null {
  let lo = Infinity
  let hi = 0
  const consider = (f: number) => {
    if (f > 0 && Number.isFinite(f)) {
      if (f < lo) lo = f
      if (f > hi) hi = f
    }
  }
  consider(Math.sqrt(p.kb * p.kp))
  consider(p.kb * p.kd)
  if (p.ki > 0) {
    consider(Math.cbrt(p.kb * p.ki))
    if (p.kp > 0) consider(p.ki / p.kp)
  }
  if (p.kp > 0 && p.kd > 0) consider(p.kp / p.kd)
  if (p.tf > 0) consider(1 / p.tf)
  if (p.servoLag > 0) consider(1 / p.servoLag)
  if (p.delay > 0) consider(1 / p.delay)
  if (lo === Infinity) return null
  return { lo, hi }
}

function gridIndex(w: number): number {
  return (Math.log10(w) - GRID_MIN_EXP) * GRID_PER_DECADE
}

const NONE: FrequencyAnalysis = {
  nyquistStable: false,
  unstablePoles: 2,
  gainMarginDb: null,
  gainReductionMarginDb: null,
  phaseCrossover: null,
  phaseMarginDeg: null,
  gainCrossover: null,
  delayMargin: null,
  gainCrossovers: [],
  phaseCrossovers: [],
}

/**
 * Margins and Nyquist stability of the loop. `table` (from plantTable with the same plant)
 * only saves work; the numbers are the same.
 */
export function analyzeFrequency(p: LoopParams, table?: PlantTable): FrequencyAnalysis {
  const range = characteristicRange(p)
  if (range === null || !(p.kb > 0)) return { ...NONE, gainCrossovers: [], phaseCrossovers: [] }
  const { kb, servoLag: tau, delay, kp, ki, kd, tf } = p
  const tf2 = tf * tf

  // The scan may start anywhere below the first gain crossover: the net Nyquist count of the
  // indentation and of (0, ω_k0] follows from the phase at ω_k0 alone, since |L| > 1 there.
  let k0 = Math.max(0, Math.floor(gridIndex(range.lo * 0.1)))
  const kEnd = Math.min(GRID_SIZE - 1, Math.ceil(gridIndex(range.hi * 1e3)))
  while (k0 > 0 && loopMagnitude2(p, FREQUENCY_GRID[k0]!) <= 1)
    k0 = Math.max(0, k0 - GRID_PER_DECADE)

  const logMag = (u: number) => Math.log(loopMagnitude2(p, Math.exp(u)))
  const gainCrossovers: number[] = []
  const phaseCrossovers: { frequency: number, magnitude: number }[] = []
  let net = 0 // signed crossings of the negative real axis left of −1, ω > 0
  let bestBelow = -1 // largest |L|² < 1 at a phase crossover
  let bestBelowW = 0
  let worstAbove = Infinity // smallest |L|² > 1 at a phase crossover

  let prevPh = 0
  let prevM2 = 0
  let prevFl = 0
  let arc = 0
  for (let k = k0; k <= kEnd; k++) {
    const w = FREQUENCY_GRID[k]!
    const w2 = w * w
    const den = 1 + tf2 * w2
    const re = kp + (kd * tf * w2) / den
    const im = (kd * w) / den - ki / w
    let ph: number
    let m2: number
    if (table !== undefined) {
      ph = Math.atan2(im, re) + table.phase[k]!
      m2 = (re * re + im * im) * table.mag2[k]!
    } else {
      ph = Math.atan2(im, re) - Math.atan(tau * w) - Math.PI - delay * w
      m2 = ((re * re + im * im) * kb * kb) / (w2 * w2 * (1 + tau * tau * w2))
    }
    const fl = Math.floor((ph + Math.PI) / TWO_PI)
    if (k === k0) {
      // The indentation and (0, ω_k0] are all at |L| > 1: their net count is fixed by the ends.
      arc = -fl
    } else {
      if ((prevM2 - 1) * (m2 - 1) < 0 || (m2 === 1 && prevM2 !== 1)) {
        const u = brent(
          logMag,
          Math.log(FREQUENCY_GRID[k - 1]!),
          Math.log(w),
          Math.log(prevM2),
          Math.log(m2),
        )
        gainCrossovers.push(Math.exp(u))
      }
      if (fl !== prevFl) {
        const down = fl < prevFl
        const from = down ? prevFl : fl
        const to = down ? fl : prevFl
        for (let j = from; j > to; j--) {
          // crossing of ξ = j, i.e. phase = 2πj − π
          const target = TWO_PI * j - Math.PI
          const f = (u: number) => loopPhase(p, Math.exp(u)) - target
          const u = brent(
            f,
            Math.log(FREQUENCY_GRID[k - 1]!),
            Math.log(w),
            prevPh - target,
            ph - target,
          )
          const wc = Math.exp(u)
          const mc = loopMagnitude2(p, wc)
          phaseCrossovers.push({ frequency: wc, magnitude: Math.sqrt(mc) })
          if (mc > 1) {
            net += down ? 1 : -1
            if (mc < worstAbove) {
              worstAbove = mc
            }
          } else if (mc > bestBelow) {
            bestBelow = mc
            bestBelowW = wc
          }
        }
      }
      // Past the last gain crossover, stop once no later phase crossover can beat the best found.
      if (m2 < 1 && bestBelow > 0) {
        const bound = magnitudeBound2(p, w)
        if (bound < 1 && bound < bestBelow) break
      }
    }
    prevPh = ph
    prevM2 = m2
    prevFl = fl
  }

  const unstablePoles = Math.max(0, 2 * (arc + net))
  const nyquistStable = arc + net === 0 && kp > 0

  let phaseMarginDeg: number | null = null
  let gainCrossover: number | null = null
  let allPositive = gainCrossovers.length > 0
  let delayMargin: number | null = null
  for (const wg of gainCrossovers) {
    // Not wrapped: the phase branch is fixed by the integrators (≤ −90°), so 180° + phase is the
    // lead the loop has (or lacks, when negative) at this crossover.
    const pm = 180 + (loopPhase(p, wg) * 180) / Math.PI
    if (phaseMarginDeg === null || pm < phaseMarginDeg) {
      phaseMarginDeg = pm
      gainCrossover = wg
    }
    if (pm <= 0) allPositive = false
    const dm = (pm * Math.PI) / 180 / wg
    if (delayMargin === null || dm < delayMargin) delayMargin = dm
  }
  if (delayMargin !== null && !(nyquistStable && allPositive)) delayMargin = 0

  let gainMarginDb: number | null = null
  let phaseCrossover: number | null = null
  let gainReductionMarginDb: number | null = null
  if (nyquistStable) {
    if (bestBelow > 0) {
      gainMarginDb = -10 * Math.log10(bestBelow)
      phaseCrossover = bestBelowW
    }
    if (worstAbove < Infinity) gainReductionMarginDb = -10 * Math.log10(worstAbove)
  } else {
    // Minimum over every phase crossover: the one with the largest |L|.
    let maxM = -1
    for (const c of phaseCrossovers) {
      if (c.magnitude > maxM) {
        maxM = c.magnitude
        phaseCrossover = c.frequency
      }
    }
    if (maxM > 0) gainMarginDb = -20 * Math.log10(maxM)
  }

  return {
    nyquistStable,
    unstablePoles,
    gainMarginDb,
    gainReductionMarginDb,
    phaseCrossover,
    phaseMarginDeg,
    gainCrossover,
    delayMargin,
    gainCrossovers,
    phaseCrossovers,
  }
}

/**
 * Closed-loop −3 dB bandwidth of T = L/(1 + L), rad/s: the lowest frequency where
 * |T| falls below 1/√2. null if it never does on the grid.
 */
export function closedLoopBandwidth(p: LoopParams, firstGainCrossover?: number): number | null {
  const range = characteristicRange(p)
  if (range === null) return null
  const h = (w: number) => {
    const m2 = loopMagnitude2(p, w)
    return m2 - 2 * Math.sqrt(m2) * Math.cos(loopPhase(p, w)) - 1
  }
  // Below the first gain crossover |L| > 1 and the phase lies in [−3π/2, −π/2], so
  // |1 + L|² ≤ 1 + |L|² < 2|L|²: |T| cannot be under 1/√2 there.
  const start = firstGainCrossover ?? range.lo * 0.1
  const k0 = Math.max(0, Math.floor(gridIndex(start)))
  const kEnd = Math.min(GRID_SIZE - 1, Math.ceil(gridIndex(range.hi * 1e3)))
  let prev = h(FREQUENCY_GRID[k0]!)
  for (let k = k0 + 1; k <= kEnd; k++) {
    const w = FREQUENCY_GRID[k]!
    const cur = h(w)
    if (prev > 0 && cur <= 0) {
      const f = (u: number) => h(Math.exp(u))
      return Math.exp(brent(f, Math.log(FREQUENCY_GRID[k - 1]!), Math.log(w), prev, cur))
    }
    prev = cur
  }
  return null
}
