// docs/planner-model.md §7: every published check value, with its source in the test title.
import { describe, expect, it } from 'vitest'
import {
  accelerationFactor,
  analyzeFrequency,
  countsPerMeter,
  designGains,
  discretizePlant,
  firmwareConstants,
  leverBeamAngle,
  leverPlantGain,
  plantOf,
  proportionalOscillation,
  secondOrderFromPolynomial,
  servoLag,
  servoSlewLimit,
  shapeFactor,
  shapeFactorFromInertia,
  smallAngleBeamAngle,
  zetaFromOvershoot,
  type Plant,
  type Rig,
} from '../../../shared/utils/planner'

const CTMS
  = 'Control Tutorials for MATLAB and Simulink (Univ. of Michigan / Carnegie Mellon), Ball & Beam'

/**
 * The tutorial's rig: m = 0.111 kg, R = 0.015 m, d = 0.03 m, L = 1.0 m, J = 9.99e-6 kg·m², g = 9.8,
 * flat track.
 */
const tutorialRig: Rig = {
  beamLength: 1,
  pivotToLink: 1,
  leverArm: 0.03,
  drive: 'lever',
  ballDiameter: 0.03,
  ballShell: 'solid',
  railGap: 0,
  servoSecondsPer60: 0.1,
  servoTravel: Math.PI,
  loopRate: 50,
  adcBits: 10,
  gravity: 9.8,
}

describe('plant', () => {
  it(`K_b = 0.21 m/s² per rad — ${CTMS}: System Modeling`, () => {
    const kJ = shapeFactorFromInertia(0.111, 9.99e-6, 0.015)
    expect(kJ).toBeCloseTo(0.4, 12)
    const eta = accelerationFactor(kJ, 0.015, 0)
    expect(leverPlantGain(eta, 9.8, 0.03, 1.0)).toBeCloseTo(0.21, 12)
    expect(plantOf(tutorialRig).kb).toBeCloseTo(0.21, 12)
  })

  it(
    'rolling solid sphere at α = 0.1 rad: ẍ = 0.699547 m/s² — 5/7·g·sin α, any '
    + 'mechanics text (e.g. Halliday & Resnick)', () => {
      const eta = accelerationFactor(shapeFactor('solid'), 0.01, 0)
      expect(eta).toBeCloseTo(5 / 7, 14)
      expect(eta * 9.81 * Math.sin(0.1)).toBeCloseTo(0.699547, 6)
    })

  it('thin spherical shell: η = 0.6 — same (Halliday & Resnick)', () => {
    expect(accelerationFactor(shapeFactor('thin-shell'), 0.01, 0)).toBeCloseTo(0.6, 14)
  })

  it(
    'solid ball on rails with w/R = 1.05: speed 0.9497 of the flat-track value — Young '
    + '& Freedman, University Physics, ch. 10', () => {
      const R = 0.01
      const onRails = accelerationFactor(shapeFactor('solid'), R, 1.05 * R)
      const flat = accelerationFactor(shapeFactor('solid'), R, 0)
      // Same drop, energy shared the same way at every height: v ∝ √η.
      expect(Math.sqrt(onRails / flat)).toBeCloseTo(0.9497, 4)
    })

  it(
    'sensor: 10 bit over 0.4 m with V_span = V_ref gives 2560 counts/m — docs/planner-model.md §1',
    () => {
      expect(countsPerMeter(10, 0.4)).toBe(2560)
      const rig = { ...tutorialRig, beamLength: 0.4, pivotToLink: 0.4 }
      expect(plantOf(rig).countsPerMeter).toBe(2560)
    })

  it(
    'servo: t60 = 0.1 s gives ω_max = 10.4720 rad/s and τ_s = 0.03333 s — docs/planner-model.md §1 '
    + '(τ_s rule is this product’s assumption)', () => {
      expect(servoSlewLimit(0.1)).toBeCloseTo(10.472, 4)
      expect(servoLag(0.1)).toBeCloseTo(0.033333, 6)
    })
})

describe('second-order relations', () => {
  it.each([
    [5, 0.690107],
    [10, 0.591155],
    [20, 0.45595],
  ])('%s %% overshoot → ζ = %s — Nise, Control Systems Engineering, ch. 4', (os, zeta) => {
    expect(zetaFromOvershoot(os)).toBeCloseTo(zeta, 6)
  })

  it(
    '100/(s² + 15s + 100): ζ = 0.75, ω_n = 10, %OS = 2.8375, T_p = 0.47496 s, T_s = '
    + '0.5333 s — Nise, ch. 4 (attribution from memory; numbers computed)', () => {
      const m = secondOrderFromPolynomial(15, 100)
      expect(m.zeta).toBeCloseTo(0.75, 12)
      expect(m.wn).toBeCloseTo(10, 12)
      expect(m.overshootPct).toBeCloseTo(2.8375, 4)
      expect(m.peakTime).toBeCloseTo(0.47496, 5)
      expect(m.settlingTime).toBeCloseTo(0.53333, 5)
    })

  it(
    `PD 10/10 on the ideal tutorial plant: ζ = 0.72457, ω_n = 1.44914 — ${CTMS}: PID `
    + `(numbers computed)`, () => {
    // closed loop s² + K_b·Kd·s + K_b·Kp
      const m = secondOrderFromPolynomial(0.21 * 10, 0.21 * 10)
      expect(m.zeta).toBeCloseTo(0.72457, 5)
      expect(m.wn).toBeCloseTo(1.44914, 5)
    })
})

describe('P only', () => {
  it(
    `Kp = 1 on the tutorial plant is undamped at ω = 0.458258 rad/s, period 13.711 s `
    + `— ${CTMS}: PID ("marginally stable")`, () => {
      const o = proportionalOscillation(0.21, 1, 0, 0)
      expect(o.idealFrequency).toBeCloseTo(0.458258, 6)
      expect(o.idealPeriod).toBeCloseTo(13.711, 3)
      expect(o.growthRate).toBeCloseTo(0, 12)
      // Marginal: phase stays at −180°, so the phase margin is exactly 0 and the loop is not
      // stable.
      const f = analyzeFrequency({ kb: 0.21, servoLag: 0, delay: 0, kp: 1, ki: 0, kd: 0, tf: 0 })
      expect(f.gainCrossover).toBeCloseTo(0.458258, 6)
      expect(f.phaseMarginDeg).toBeCloseTo(0, 9)
    })
})

describe('discretisation', () => {
  it(
    `zero-order hold of 0.21/s² at T = 0.02 s: 4.2e-5·(z + 1)/(z² − 2z + 1) — `
    + `${CTMS}: Digital PID`, () => {
      const d = discretizePlant(0.21, 0, 0.02)
      expect(d.num).toHaveLength(2)
      expect(d.num[0]).toBeCloseTo(4.2e-5, 12)
      expect(d.num[1]).toBeCloseTo(4.2e-5, 12)
      expect(d.den).toEqual([1, -2, 1])
    })
})

describe('margins', () => {
  it(
    'K_b = 0.21, PD 10/10, pure delay 0.1 s: ω_gc = 2.29129, PM = 53.2937°, GM = '
    + '17.0839 dB at 15.0442 rad/s — closed form', () => {
      const f = analyzeFrequency({
        kb: 0.21, servoLag: 0, delay: 0.1, kp: 10, ki: 0, kd: 10, tf: 0,
      })
      expect(f.nyquistStable).toBe(true)
      expect(f.gainCrossover).toBeCloseTo(2.29129, 5)
      expect(f.phaseMarginDeg).toBeCloseTo(53.2937, 4)
      expect(f.gainMarginDb).toBeCloseTo(17.0839, 4)
      expect(f.phaseCrossover).toBeCloseTo(15.0442, 4)
      // delay margin = PM/ω_gc
      expect(f.delayMargin).toBeCloseTo((53.2937 * Math.PI) / 180 / 2.29129, 5)
    })

  it(
    'the same loop without delay: PM = 66.4218° and no phase crossover (GM unbounded, '
    + 'null) — closed form', () => {
      const f = analyzeFrequency({ kb: 0.21, servoLag: 0, delay: 0, kp: 10, ki: 0, kd: 10, tf: 0 })
      expect(f.phaseMarginDeg).toBeCloseTo(66.4218, 4)
      expect(f.gainMarginDb).toBeNull()
      expect(f.phaseCrossover).toBeNull()
    })
})

describe('gain placement', () => {
  it(
    'PID on K_b = 0.21 with ζ = 0.690107, ω_n = 1.93207, p_i = 0.25ω_n: Kp = 23.9092, '
    + 'Ki = 8.58595, Kd = 14.9985 — docs/planner-model.md §3 formulas', () => {
      const plant = { ...plantOf(tutorialRig), kb: 0.21 } satisfies Plant
      // ζ = 0.690107 is 5 % overshoot; ω_n = 4/(ζ·T_s) = 1.93207 for T_s = 3 s.
      const d = designGains(plant, {
        overshootPct: 5,
        settlingTime: 3,
        form: 'PID',
        derivativeFilterN: 10,
        method: 'ideal',
        derivativeOn: 'measurement',
      })
      expect(d.zeta).toBeCloseTo(0.690107, 6)
      expect(d.wn).toBeCloseTo(1.93207, 5)
      expect(d.kp).toBeCloseTo(23.9092, 3)
      expect(d.ki).toBeCloseTo(8.58595, 4)
      expect(d.kd).toBeCloseTo(14.9985, 3)
    })
})

describe('lever geometry', () => {
  it(
    'd = 0.03, L_a = 1, ℓ = 0.1, θ = 90°: α = 0.0254983 rad exact, 0.0471239 '
    + 'small-angle — the exact constraint of docs/planner-model.md §1', () => {
      const g = { leverArm: 0.03, pivotToLink: 1, pushrodLength: 0.1 }
      expect(leverBeamAngle(Math.PI / 2, g)).toBeCloseTo(0.0254983, 7)
      expect(smallAngleBeamAngle(Math.PI / 2, g)).toBeCloseTo(0.0471239, 7)
    })
})

describe('firmware', () => {
  it(
    'Kp = 15, Kd = 40, N = 10, 50 Hz, 1024 counts/m: T_f = 0.266667, a = 0.930233, b = '
    + '139.535, 0.83929 °/count — docs/planner-model.md §5 formulas', () => {
      // 2^10 counts over 1 m
      const rig: Rig = { ...tutorialRig, beamLength: 1, adcBits: 10, loopRate: 50 }
      const gains = { kp: 15, kd: 40, ki: 0, n: 10, derivativeOn: 'measurement' as const }
      const fw = firmwareConstants(rig, gains)
      expect(fw.countsPerMeter).toBe(1024)
      expect(fw.tf).toBeCloseTo(0.266667, 6)
      expect(fw.a).toBeCloseTo(0.930233, 6)
      expect(fw.b).toBeCloseTo(139.535, 3)
      expect(fw.kpDegPerCount).toBeCloseTo(0.83929, 5)
    })
})
