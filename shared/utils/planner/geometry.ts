// Exact lever linkage (docs/planner-model.md §1): the pushrod joint on the beam is B = L_a(cos α,
// sin α),
// the horn tip is P = (L_a − d + d cos θ, −ℓ + d sin θ), and the pushrod keeps |B − P| = ℓ.
// At θ = 0 the horn lies along the beam and the rod stands vertical, so the beam is level.
// Both directions reduce to  a cos φ + b sin φ = c, solved in closed form on the branch that
// passes through (θ, α) = (0, 0).
import type { Rig } from './schema'
import { DEFAULT_PUSHROD_LENGTH } from './plant'

export interface LeverGeometry {
  /** d, servo horn radius, m. */
  leverArm: number
  /** L_a, beam pivot to pushrod joint, m. */
  pivotToLink: number
  /** ℓ, pushrod length, m. */
  pushrodLength: number
}

export function leverGeometryOf(rig: Rig): LeverGeometry {
  return {
    leverArm: rig.leverArm,
    pivotToLink: rig.pivotToLink,
    pushrodLength: rig.pushrodLength ?? DEFAULT_PUSHROD_LENGTH,
  }
}

/** Small-angle linkage: α ≈ (d/L_a)·θ. */
export function smallAngleBeamAngle(servoAngle: number, g: LeverGeometry): number {
  return (g.leverArm / g.pivotToLink) * servoAngle
}

/**
 * Beam angle α (rad) for servo angle θ (rad), exact. null when the pushrod cannot reach
 * (the linkage would have to stretch or the horn passes a dead point).
 */
export function leverBeamAngle(servoAngle: number, g: LeverGeometry): number | null {
  const { leverArm: d, pivotToLink: La, pushrodLength: l } = g
  const px = La - d + d * Math.cos(servoAngle)
  const py = -l + d * Math.sin(servoAngle)
  // |B|² + |P|² − 2 B·P = ℓ²  →  px cos α + py sin α = (La² + |P|² − ℓ²)/(2 La)
  const rho = Math.hypot(px, py)
  const c = (La * La + rho * rho - l * l) / (2 * La)
  const ratio = c / rho
  if (!(Math.abs(ratio) <= 1)) return null
  return Math.atan2(py, px) + Math.acos(ratio)
}

/** Servo angle θ (rad) that holds the beam at α (rad), exact; null when out of reach. */
export function leverServoAngle(beamAngle: number, g: LeverGeometry): number | null {
  const { leverArm: d, pivotToLink: La, pushrodLength: l } = g
  // With c = B − (La − d, −ℓ):  cx cos θ + cy sin θ = (|c|² + d² − ℓ²)/(2 d)
  const cx = La * Math.cos(beamAngle) - La + d
  const cy = La * Math.sin(beamAngle) + l
  const rho = Math.hypot(cx, cy)
  const rhs = (rho * rho + d * d - l * l) / (2 * d)
  const ratio = rhs / rho
  if (!(Math.abs(ratio) <= 1)) return null
  return Math.atan2(cy, cx) - Math.acos(ratio)
}

/** dα/dθ of the exact linkage at θ (central difference); null when out of reach. */
export function leverRatioAt(servoAngle: number, g: LeverGeometry): number | null {
  const h = 1e-6
  const a = leverBeamAngle(servoAngle + h, g)
  const b = leverBeamAngle(servoAngle - h, g)
  if (a === null || b === null) return null
  return (a - b) / (2 * h)
}

export interface BeamAngleRange {
  /** Largest beam angle the servo can give within its travel, rad (exact linkage for a lever). */
  max: number
  /** Most negative beam angle, rad. */
  min: number
  /**
   * Servo angles (rad) where those extremes are reached. Past them the exact linkage folds back:
   * more servo angle gives less beam angle, the loop's gain changes sign, and the ball runs away.
   * So ±these are the usable travel.
   */
  maxAtServoAngle: number
  minAtServoAngle: number
  /** Small-angle estimate of the limit, (d/L_a)·travel/2 (or travel/2/N_g), rad. */
  smallAngle: number
  /** False when the linkage cannot follow the servo over its whole travel. */
  reachable: boolean
}

/** The beam angles the servo can reach within ±travel/2. */
export function beamAngleRange(rig: Rig): BeamAngleRange {
  const half = rig.servoTravel / 2
  if (rig.drive === 'direct') {
    const a = half / (rig.gearRatio ?? 1)
    return {
      max: a,
      min: -a,
      maxAtServoAngle: half,
      minAtServoAngle: -half,
      smallAngle: a,
      reachable: true,
    }
  }
  const g = leverGeometryOf(rig)
  const c = lastRange
  if (
    c !== null
    && c.d === g.leverArm
    && c.la === g.pivotToLink
    && c.l === g.pushrodLength
    && c.half === half
  )
    return c.range
  const [lo, hi] = reachableServoRange(g, half)
  const top = extremeAngle(g, 0, hi, 1)
  const bottom = extremeAngle(g, 0, lo, -1)
  const range: BeamAngleRange = {
    max: top.alpha,
    min: bottom.alpha,
    maxAtServoAngle: top.theta,
    minAtServoAngle: bottom.theta,
    smallAngle: smallAngleBeamAngle(half, g),
    reachable: lo === -half && hi === half,
  }
  lastRange = { d: g.leverArm, la: g.pivotToLink, l: g.pushrodLength, half, range }
  return range
}

// One planner call asks for the same range several times (limits, firmware, simulation).
let lastRange: { d: number, la: number, l: number, half: number, range: BeamAngleRange } | null
  = null

/**
 * The extreme (sign·α largest) of the linkage between servo angles 0 and `end`: a scan, then
 * golden-section refinement.
 */
function extremeAngle(
  g: LeverGeometry,
  start: number,
  end: number,
  sign: 1 | -1,
): { theta: number, alpha: number } {
  const f = (t: number) => sign * (leverBeamAngle(t, g) ?? 0)
  const steps = 32
  let best = end
  let bestF = f(end)
  for (let i = 0; i < steps; i++) {
    const t = start + ((end - start) * i) / steps
    const v = f(t)
    if (v > bestF) {
      bestF = v
      best = t
    }
  }
  if (best !== end) {
    const h = Math.abs(end - start) / steps
    let a = Math.max(Math.min(start, end), best - h)
    let b = Math.min(Math.max(start, end), best + h)
    const r = (Math.sqrt(5) - 1) / 2
    for (let i = 0; i < 50; i++) {
      const c = b - r * (b - a)
      const d = a + r * (b - a)
      if (f(c) > f(d)) b = d
      else a = c
    }
    best = (a + b) / 2
  }
  return { theta: best, alpha: leverBeamAngle(best, g) ?? 0 }
}

/** The servo angles, within ±half, over which the linkage follows: [lo, hi] rad. */
export function reachableServoRange(g: LeverGeometry, half: number): [number, number] {
  const end = (theta: number) => {
    if (leverBeamAngle(theta, g) !== null) return theta
    let ok = 0
    let bad = theta
    for (let i = 0; i < 60; i++) {
      const mid = (ok + bad) / 2
      if (leverBeamAngle(mid, g) === null) bad = mid
      else ok = mid
    }
    return ok
  }
  return [end(-half), end(half)]
}
