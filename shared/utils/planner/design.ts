// Suggesting gains from targets (docs/planner-model.md §3). Second-order relations are from Nise,
// Control Systems Engineering, ch. 4; the lag-aware placement matches the characteristic
// polynomial of C(s)·K_b/(s²(τ_eff s + 1)) term by term.
import type { Plant } from './plant'
import type { Targets } from './schema'

/** ζ = −ln(OS)/√(π² + ln²OS); 0 % overshoot is the critically damped limit ζ = 1. */
export function zetaFromOvershoot(overshootPct: number): number {
  if (!(overshootPct > 0)) return 1
  const l = Math.log(overshootPct) - Math.log(100)
  return -l / Math.sqrt(Math.PI * Math.PI + l * l)
}

/** %OS = 100·exp(−ζπ/√(1 − ζ²)) for ζ < 1, else 0. */
export function overshootFromZeta(zeta: number): number {
  if (zeta >= 1) return 0
  return 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta))
}

/** ω_n = 4/(ζ·T_s): the 2 % settling-time estimate solved for ω_n. */
export function naturalFrequency(zeta: number, settlingTime: number): number {
  return 4 / (zeta * settlingTime)
}

export interface SecondOrderMetrics {
  zeta: number
  wn: number
  overshootPct: number
  /** T_p = π/(ω_n√(1 − ζ²)); null when ζ ≥ 1 (no peak). */
  peakTime: number | null
  /** 4/(ζ ω_n). */
  settlingTime: number
}

/** Metrics of ω_n²/(s² + a1 s + a0) with a0 = ω_n², a1 = 2ζω_n. */
export function secondOrderFromPolynomial(a1: number, a0: number): SecondOrderMetrics {
  const wn = Math.sqrt(a0)
  return secondOrderMetrics(a1 / (2 * wn), wn)
}

export function secondOrderMetrics(zeta: number, wn: number): SecondOrderMetrics {
  return {
    zeta,
    wn,
    overshootPct: overshootFromZeta(zeta),
    peakTime: zeta < 1 ? Math.PI / (wn * Math.sqrt(1 - zeta * zeta)) : null,
    settlingTime: 4 / (zeta * wn),
  }
}

export interface GainDesign {
  /** The targets can be met by the chosen method (lag-aware: p3 > 0). */
  feasible: boolean
  kp: number | null
  kd: number | null
  ki: number | null
  zeta: number
  wn: number
  /** Lag-aware third (real) pole, rad/s; null for the ideal method and for P. */
  p3: number | null
  /** Integral pole p_i, rad/s; null unless PID. */
  integralPole: number | null
  /** Lag-aware bound: targets with T_s at or below this are infeasible (p3 ≤ 0), s. */
  fastestSettlingTime: number | null
  /** The T_s at which p3 = 5ζω_n (28·τ_eff for PD), s. */
  recommendedSettlingTime: number | null
}

/**
 * Settling-time bounds of the lag-aware placement. With ζω_n = 4/T_s, p3 = 1/τ − 8/T_s − p_i.
 * p_i = 0.25ω_n = 1/(ζ T_s) scales with T_s; an explicit p_i does not.
 */
export function settlingTimeBounds(
  effectiveLag: number,
  zeta: number,
  form: Targets['form'],
  integralPole?: number,
): { fastest: number | null, recommended: number | null } {
  const tau = effectiveLag
  if (form !== 'PID') return { fastest: 8 * tau, recommended: 28 * tau }
  if (integralPole === undefined)
    return { fastest: tau * (8 + 1 / zeta), recommended: tau * (28 + 1 / zeta) }
  const room = 1 / tau - integralPole
  if (room <= 0) return { fastest: null, recommended: null }
  return { fastest: 8 / room, recommended: 28 / room }
}

/** docs/planner-model.md §3: ideal (method A) or lag-aware (method B) placement, PD or PID. */
export function designGains(plant: Plant, targets: Targets): GainDesign {
  const zeta = zetaFromOvershoot(targets.overshootPct)
  return placeGains(plant, targets, zeta, naturalFrequency(zeta, targets.settlingTime))
}

/**
 * The §3 placement for a given ζ and ω_n (designGains takes them from the targets; the PID
 * refinement of plan.ts moves them until the sampled loop meets the targets). The settling-time
 * bounds are those of the targets' ζ.
 */
export function placeGains(plant: Plant, targets: Targets, zeta: number, wn: number): GainDesign {
  const kb = plant.kb
  const tau = plant.effectiveLag
  const bounds = settlingTimeBounds(
    tau,
    zetaFromOvershoot(targets.overshootPct),
    targets.form,
    targets.integralPole,
  )
  const base = {
    zeta,
    wn,
    fastestSettlingTime: bounds.fastest,
    recommendedSettlingTime: bounds.recommended,
  }
  if (targets.form === 'P') {
    return { ...base, feasible: false, kp: null, kd: null, ki: null, p3: null, integralPole: null }
  }
  const sw = 2 * zeta * wn
  const w2 = wn * wn
  const pi = targets.form === 'PID' ? (targets.integralPole ?? 0.25 * wn) : 0
  if (targets.method === 'ideal') {
    if (targets.form === 'PD') {
      return {
        ...base,
        feasible: true,
        kp: w2 / kb,
        kd: sw / kb,
        ki: 0,
        p3: null,
        integralPole: null,
      }
    }
    return {
      ...base,
      feasible: true,
      kp: (w2 + sw * pi) / kb,
      kd: (sw + pi) / kb,
      ki: (w2 * pi) / kb,
      p3: null,
      integralPole: pi,
    }
  }
  // (s² + 2ζω_n s + ω_n²)(s + p3)(s + p_i) = s⁴ + s³/τ + (K_b Kd/τ)s² + (K_b Kp/τ)s + K_b Ki/τ
  const p3 = 1 / tau - sw - pi
  const integralPole = targets.form === 'PID' ? pi : null
  if (!(p3 > 0)) {
    return { ...base, feasible: false, kp: null, kd: null, ki: null, p3, integralPole }
  }
  const kd = (tau * (p3 * pi + sw * (p3 + pi) + w2)) / kb
  const kp = (tau * (sw * p3 * pi + w2 * (p3 + pi))) / kb
  const ki = (tau * w2 * p3 * pi) / kb
  return { ...base, feasible: true, kp, kd, ki, p3, integralPole }
}

/** T_f = Kd/(N·Kp); 0 (no filter) when Kp is 0 or N is unbounded. */
export function filterTimeConstant(kp: number, kd: number, n: number): number {
  if (!(kp > 0) || !(n > 0) || !Number.isFinite(n) || kd <= 0) return 0
  return kd / (n * kp)
}
