// The rig as a plant: rolling ball, lever or geared drive, servo lag, sensor, loop timing.
// Formulas are docs/planner-model.md §1; the ball equation x'' = eta·g·sin(alpha) is the
// rolling-without-slipping result of any mechanics text (e.g. Halliday & Resnick), with the
// rail contact chord as the instantaneous axis (Young & Freedman, University Physics, ch. 10).
import type { BallShell, Rig } from './schema'

export const DEFAULT_GRAVITY = 9.81
export const DEFAULT_PUSHROD_LENGTH = 0.1
/** Loop delay in sample periods: one sample of computation plus T/2 for the hold. */
export const LOOP_DELAY_SAMPLES = 1.5

/** k_J = J/(m R²) for the two shells the planner offers. */
export function shapeFactor(shell: BallShell): number {
  return shell === 'solid' ? 2 / 5 : 2 / 3
}

/** k_J of a thick spherical shell of outer radius r and inner radius ri. */
export function thickShellShapeFactor(r: number, ri: number): number {
  if (ri <= 0) return 2 / 5
  if (ri >= r) return 2 / 3
  return (0.4 * (r ** 5 - ri ** 5)) / ((r ** 3 - ri ** 3) * r * r)
}

/** k_J from a measured mass and moment of inertia. */
export function shapeFactorFromInertia(mass: number, inertia: number, radius: number): number {
  return inertia / (mass * radius * radius)
}

/** r_c = sqrt(R² − (w/2)²): the ball rolls about the chord through its two rail contacts. */
export function rollingRadius(radius: number, railGap: number): number {
  const half = railGap / 2
  return Math.sqrt(Math.max(radius * radius - half * half, 0))
}

/** eta = 1/(1 + k_J·R²/r_c²): the share of g·sin(alpha) that accelerates the ball. */
export function accelerationFactor(kJ: number, radius: number, railGap = 0): number {
  const rc = rollingRadius(radius, railGap)
  return 1 / (1 + (kJ * radius * radius) / (rc * rc))
}

/** tau_s = t60/3: a first-order servo finishes 95 % of a 60° move in t60 (product assumption). */
export function servoLag(secondsPer60: number): number {
  return secondsPer60 / 3
}

/** omega_max = (pi/3)/t60, rad/s. */
export function servoSlewLimit(secondsPer60: number): number {
  return Math.PI / 3 / secondsPer60
}

/** k_s = 2^bits·(V_span/V_ref)/sensor length, counts per metre. */
export function countsPerMeter(adcBits: number, sensorLength: number, spanRatio = 1): number {
  return (2 ** adcBits * spanRatio) / sensorLength
}

/** K_b for a lever linkage (small angle): eta·g·d/L_a. */
export function leverPlantGain(
  eta: number,
  gravity: number,
  leverArm: number,
  pivotToLink: number,
): number {
  return (eta * gravity * leverArm) / pivotToLink
}

export interface Plant {
  /** Acceleration factor eta. */
  eta: number
  /** Shape factor k_J. */
  shapeFactor: number
  /** Rolling radius r_c, m. */
  rollingRadius: number
  /** Beam angle per servo angle at small angles: d/L_a (lever) or 1/N_g (direct). */
  driveRatio: number
  /** K_b, m/s² of ball acceleration per rad of servo angle. */
  kb: number
  /** tau_s, s. */
  servoLag: number
  /** tau_eff = tau_s + 1.5·T, s. */
  effectiveLag: number
  /** k_s, ADC counts per metre. */
  countsPerMeter: number
  /** T, s. */
  period: number
  /** 1.5·T, s. */
  delay: number
  /** omega_max, rad/s. */
  slewLimit: number
  /** Half the servo travel: the command limit either side of a level beam, rad. */
  halfTravel: number
  gravity: number
  sensorLength: number
  pushrodLength: number
}

/** Everything the model needs from a rig, with the documented defaults filled in. */
export function plantOf(rig: Rig): Plant {
  const gravity = rig.gravity ?? DEFAULT_GRAVITY
  const radius = rig.ballDiameter / 2
  const kJ = shapeFactor(rig.ballShell)
  const eta = accelerationFactor(kJ, radius, rig.railGap)
  const driveRatio
    = rig.drive === 'lever' ? rig.leverArm / rig.pivotToLink : 1 / (rig.gearRatio ?? 1)
  const tauS = servoLag(rig.servoSecondsPer60)
  const period = 1 / rig.loopRate
  const delay = LOOP_DELAY_SAMPLES * period
  const sensorLength = rig.sensorLength ?? rig.beamLength
  return {
    eta,
    shapeFactor: kJ,
    rollingRadius: rollingRadius(radius, rig.railGap),
    driveRatio,
    kb: eta * gravity * driveRatio,
    servoLag: tauS,
    effectiveLag: tauS + delay,
    countsPerMeter: countsPerMeter(rig.adcBits, sensorLength, rig.sensorSpanRatio ?? 1),
    period,
    delay,
    slewLimit: servoSlewLimit(rig.servoSecondsPer60),
    halfTravel: rig.servoTravel / 2,
    gravity,
    sensorLength,
    pushrodLength: rig.pushrodLength ?? DEFAULT_PUSHROD_LENGTH,
  }
}

/** A polynomial in z, highest power first. */
export type Polynomial = number[]

export interface DiscretePlant {
  /** x_{k+1} = phi·[x, v, theta]_k + gamma·u_k over one held period. */
  phi: [[number, number, number], [number, number, number], [number, number, number]]
  gamma: [number, number, number]
  /** X(z)/U(z) with the hold (zero-order hold), highest power first. */
  num: Polynomial
  den: Polynomial
}

/** (1 − e^(−z))/z, accurate for small z; 0 at z = ∞. */
export function phi1(z: number): number {
  if (z === Infinity) return 0
  if (z < 1e-8) return 1 - z / 2
  return -Math.expm1(-z) / z
}

/** (z − 1 + e^(−z))/z², accurate for small z; 0 at z = ∞. */
export function phi2(z: number): number {
  if (z === Infinity) return 0
  if (z < 1e-3) return 0.5 - z / 6 + (z * z) / 24 - (z * z * z) / 120
  return (z + Math.expm1(-z)) / (z * z)
}

/**
 * Exact zero-order-hold discretisation of servo lag + double integrator,
 * theta' = (u − theta)/tau_s, v' = K_b·theta, x' = v (the matrix exponential in closed form).
 * tau_s = 0 gives the bare double integrator K_b/s², whose ZOH equivalent is
 * K_b·T²/2·(z + 1)/(z − 1)² (Control Tutorials for MATLAB and Simulink, Ball & Beam: Digital PID).
 */
export function discretizePlant(kb: number, tauS: number, period: number): DiscretePlant {
  const T = period
  const z = tauS > 0 ? T / tauS : Infinity
  const E = tauS > 0 ? Math.exp(-z) : 0
  const p1 = phi1(z)
  const p2 = phi2(z)
  const phi: DiscretePlant['phi'] = [
    [1, T, kb * T * T * p2],
    [0, 1, kb * T * p1],
    [0, 0, E],
  ]
  const gamma: DiscretePlant['gamma'] = [kb * T * T * (0.5 - p2), kb * T * (1 - p1), 1 - E]
  // Markov parameters h_k = H·phi^(k−1)·gamma with H = [1, 0, 0].
  const g1 = gamma
  const g2 = mul3(phi, g1)
  const g3 = mul3(phi, g2)
  const d1 = -(2 + E)
  const d2 = 1 + 2 * E
  const d3 = -E
  const h1 = g1[0]
  const h2 = g2[0]
  const h3 = g3[0]
  let num = [h1, h2 + d1 * h1, h3 + d1 * h2 + d2 * h1]
  let den = [1, d1, d2, d3]
  if (tauS <= 0) {
    // The lag pole sits at z = 0 and cancels against the numerator's root there.
    num = [num[0]!, num[1]!]
    den = [1, -2, 1]
  }
  return { phi, gamma, num, den }
}

/** (z²/2 − z + 1 − e^(−z))/z², accurate for small z (series below 0.1); 1/2 at z = ∞. */
export function psi3(z: number): number {
  if (z === Infinity) return 0.5
  if (z < 0.1) {
    // Σ_{k≥1} (−1)^(k+1) z^k/(k+2)!
    let term = z / 6
    let sum = 0
    for (let k = 1; k <= 10; k++) {
      sum += term
      term *= -z / (k + 3)
    }
    return sum
  }
  return (0.5 * z * z - z - Math.expm1(-z)) / (z * z)
}

/**
 * The same ZOH plant in w = z − 1, highest power first: X/U = N(w)/(w²(w + ε)) with ε = 1 −
 * e^(−T/τ_s),
 * N(w) = K_b T²[ψ(T/τ_s) w² + ((T/τ_s)·φ₂(T/τ_s) + ε/2) w + ε]. Written in w the coefficients keep
 * their precision when the closed-loop poles crowd z = 1 (fast loop, slow response); expanding in z
 * loses it.
 */
export function discretizePlantW(
  kb: number,
  tauS: number,
  period: number,
): { num: Polynomial, den: Polynomial } {
  const T = period
  const z = tauS > 0 ? T / tauS : Infinity
  const eps = tauS > 0 ? -Math.expm1(-z) : 1
  const mid = z === Infinity ? 1.5 : z * phi2(z) + eps / 2
  const g = kb * T * T
  return { num: [g * psi3(z), g * mid, g * eps], den: [1, eps, 0, 0] }
}

function mul3(
  m: DiscretePlant['phi'],
  v: readonly [number, number, number],
): [number, number, number] {
  return [
    m[0][0] * v[0] + m[0][1] * v[1] + m[0][2] * v[2],
    m[1][0] * v[0] + m[1][1] * v[1] + m[1][2] * v[2],
    m[2][0] * v[0] + m[2][1] * v[1] + m[2][2] * v[2],
  ]
}
