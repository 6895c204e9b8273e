// Straightforward reference versions of the planner's fast numerics, for tests only:
// margins from a dense frequency sweep of the complex L(jω) with numerical phase unwrapping,
// and the sampled step response by RK4 on fine sub-steps with linear interpolation.
import type { LoopParams, SampledLoop } from '../../../shared/utils/planner'

type C = [number, number]
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]]
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1]
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d]
}

/** L(jω) as a complex number, built factor by factor. */
export function loopAt(p: LoopParams, w: number): C {
  const s: C = [0, w]
  const d = div(mul([p.kd, 0], s), [1, p.tf * w])
  const c: C = [p.kp + d[0], d[1] - p.ki / w]
  const plant = div([p.kb, 0], mul(mul(s, s), [1, p.servoLag * w]))
  const delay: C = [Math.cos(p.delay * w), -Math.sin(p.delay * w)]
  return mul(mul(c, plant), delay)
}

export interface ReferenceMargins {
  gainCrossover: number | null
  phaseMarginDeg: number | null
  /** Minimum over every phase crossover of −20 log10 |L| (docs/planner-model.md §4, literally). */
  gainMarginDb: number | null
  phaseCrossover: number | null
}

/** Dense sweep (2000 points a decade) with bisection on each bracket. */
export function referenceMargins(p: LoopParams, wLo = 1e-3, wHi = 1e4): ReferenceMargins {
  const perDecade = 2000
  const n = Math.ceil(Math.log10(wHi / wLo) * perDecade)
  let prevW = wLo
  let prevL = loopAt(p, wLo)
  let prevPh = Math.atan2(prevL[1], prevL[0])
  // The double integrator starts at −180°: pick the branch of the first point near −180°.
  while (prevPh > 0) prevPh -= 2 * Math.PI
  let best: ReferenceMargins = {
    gainCrossover: null,
    phaseMarginDeg: null,
    gainMarginDb: null,
    phaseCrossover: null,
  }
  const mag = (w: number) => Math.hypot(...loopAt(p, w))
  const unwrapped = (w: number, near: number) => {
    const l = loopAt(p, w)
    let ph = Math.atan2(l[1], l[0])
    while (ph - near > Math.PI) ph -= 2 * Math.PI
    while (ph - near < -Math.PI) ph += 2 * Math.PI
    return ph
  }
  for (let i = 1; i <= n; i++) {
    const w = wLo * 10 ** (i / perDecade)
    const l = loopAt(p, w)
    const ph = unwrapped(w, prevPh)
    const m = Math.hypot(l[0], l[1])
    const pm = Math.hypot(prevL[0], prevL[1])
    if ((pm - 1) * (m - 1) < 0) {
      let a = prevW
      let b = w
      for (let j = 0; j < 60; j++) {
        const c = Math.sqrt(a * b)
        if ((mag(a) - 1) * (mag(c) - 1) <= 0) b = c
        else a = c
      }
      const wc = Math.sqrt(a * b)
      const pmDeg = 180 + (unwrapped(wc, ph) * 180) / Math.PI
      if (best.phaseMarginDeg === null || pmDeg < best.phaseMarginDeg)
        best = { ...best, phaseMarginDeg: pmDeg, gainCrossover: wc }
    }
    // phase crossing −180° − k·360°
    const kPrev = Math.floor((prevPh + Math.PI) / (2 * Math.PI))
    const kNow = Math.floor((ph + Math.PI) / (2 * Math.PI))
    if (kPrev !== kNow) {
      const target = 2 * Math.PI * Math.max(kPrev, kNow) - Math.PI
      let a = prevW
      let b = w
      let pa = prevPh
      for (let j = 0; j < 60; j++) {
        const c = Math.sqrt(a * b)
        const pc = unwrapped(c, pa)
        if ((pa - target) * (pc - target) <= 0) b = c
        else {
          a = c
          pa = pc
        }
      }
      const wc = Math.sqrt(a * b)
      const gm = -20 * Math.log10(mag(wc))
      if (best.gainMarginDb === null || gm < best.gainMarginDb)
        best = { ...best, gainMarginDb: gm, phaseCrossover: wc }
    }
    prevW = w
    prevL = l
    prevPh = ph
  }
  return best
}

export interface ReferenceStep {
  overshootPct: number
  settlingTime: number | null
  /** Largest |x − 1| over the last tenth of the horizon. */
  tail: number
}

/**
 * The sampled loop of docs/planner-model.md §4 simulated the plain way: RK4 on θ' = (u − θ)/τ_s,
 * v' = K_b θ, x' = v with `sub` sub-steps per sample, overshoot over sub-step points, settling by
 * linear interpolation at the last sub-step outside the band.
 */
export function referenceStep(loop: SampledLoop, horizon: number, sub = 50): ReferenceStep {
  const T = loop.period
  const h = T / sub
  const a = loop.tf / (loop.tf + T)
  const b = loop.kd / (loop.tf + T)
  const f = (y: number[], u: number) => [y[1]!, loop.kb * y[2]!, (u - y[2]!) / loop.servoLag]
  let y = [0, 0, 0]
  let held = 0
  let D = 0
  let sPrev = 0
  let I = 0
  let xMax = 0
  let lastOut: number | null = null
  let prevT = 0
  let prevX = 0
  let tail = 0
  const steps = Math.ceil(horizon / T)
  for (let k = 0; k < steps; k++) {
    const e = 1 - y[0]!
    const s = loop.derivativeOn === 'measurement' ? -y[0]! : e
    D = a * D + b * (s - sPrev)
    sPrev = s
    I += loop.ki * T * e
    const u = loop.kp * e + I + D
    for (let j = 0; j < sub; j++) {
      const k1 = f(y, held)
      const k2 = f(
        y.map((v, i) => v + (h / 2) * k1[i]!),
        held,
      )
      const k3 = f(
        y.map((v, i) => v + (h / 2) * k2[i]!),
        held,
      )
      const k4 = f(
        y.map((v, i) => v + h * k3[i]!),
        held,
      )
      y = y.map((v, i) => v + (h / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!))
      const t = k * T + (j + 1) * h
      const x = y[0]!
      if (x > xMax) xMax = x
      const outNow = Math.abs(x - 1) > 0.02
      const outPrev = Math.abs(prevX - 1) > 0.02
      if (outPrev && !outNow) {
        const edge = prevX > 1 ? 1.02 : 0.98
        lastOut = prevT + ((edge - prevX) / (x - prevX)) * h
      } else if (outNow) lastOut = t
      if (t > 0.9 * horizon) tail = Math.max(tail, Math.abs(x - 1))
      prevT = t
      prevX = x
    }
    held = u
  }
  const settled = Math.abs(prevX - 1) <= 0.02
  return {
    overshootPct: Math.max(0, 100 * (xMax - 1)),
    settlingTime: settled ? lastOut : null,
    tail,
  }
}
