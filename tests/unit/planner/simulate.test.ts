// The time simulations checked against an independent general-purpose ODE solver: odex, the npm
// port of Hairer & Wanner's ODEX (Gragg–Bulirsch–Stoer extrapolation, adaptive step size),
// integrating the same equations between samples.
import { Solver } from 'odex'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import { describe, expect, it } from 'vitest'
import {
  analyzeLoop,
  beamAngleRange,
  filterTimeConstant,
  leverBeamAngle,
  leverGeometryOf,
  planGains,
  plantOf,
  sampledLoopOf,
  sampledStepResponse,
  servoAngleAt,
  simulate,
  type Gains,
  type Rig,
} from '../../../shared/utils/planner'

const rig: Rig = REFERENCE_RIG
const plan = planGains(rig, REFERENCE_TARGETS)
const gains: Gains = plan.gains!

function solver(n: number, tol = 1e-12): Solver {
  const s = new Solver(n)
  s.absoluteTolerance = tol
  s.relativeTolerance = tol
  s.maxSteps = 1e6
  return s
}

describe('servo model', () => {
  it('servoAngleAt matches odex on θ′ = clamp((c − θ)/τ_s, ±ω_max)', () => {
    const tau = 0.04
    const slew = 8.7
    const s = solver(1)
    for (const [th0, c] of [
      [0, 0.72],
      [0.5, -0.9],
      [0.1, 0.2],
      [-0.3, -0.29],
    ] as const) {
      const f = (_t: number, y: number[]) => [Math.max(-slew, Math.min(slew, (c - y[0]!) / tau))]
      for (const t of [0.005, 0.02, 0.06, 0.15]) {
        const y = s.solve(f, 0, [th0], t).y[0]!
        expect(servoAngleAt(th0, c, t, tau, slew)).toBeCloseTo(y, 8)
      }
    }
  })
})

describe('nonlinear simulation', () => {
  it(
    'matches the same loop integrated between samples by odex (sin α, exact linkage, '
    + 'slew limit, nudge)', () => {
      const p = plantOf(rig)
      const T = p.period
      const geo = leverGeometryOf(rig)
      const range = beamAngleRange(rig)
      const usable = Math.min(range.maxAtServoAngle, -range.minAtServoAngle)
      const ag = p.eta * p.gravity
      const tf = filterTimeConstant(gains.kp, gains.kd, gains.n)
      const a = tf / (tf + T)
      const b = gains.kd / (tf + T)
      const x0 = 0.2
      const r1 = 0.3
      const duration = 6
      const nudgeSample = 150 // 3 s
      const sim = simulate(rig, gains, {
        duration,
        initialPosition: x0,
        setpoint: r1,
        setpointTime: 0.5,
        nudge: { time: nudgeSample * T, speed: 0.08 },
        quantize: false,
        subSteps: 20,
        outputEvery: 5,
      })
      expect(sim.events.slewLimited).toBe(true)

      // The firmware loop written out again, with odex carrying the plant between samples.
      const s = solver(3, 1e-11)
      let y = [x0, 0, 0]
      let held = 0
      let D = 0
      let sPrev = -x0
      const samples = Math.round(duration / T)
      let worst = 0
      for (let k = 0; k < samples; k++) {
        const t0 = k * T
        const r = t0 < 0.5 ? x0 : r1
        const e = r - y[0]!
        D = a * D + b * (-y[0]! - sPrev)
        sPrev = -y[0]!
        const u = Math.max(-usable, Math.min(usable, gains.kp * e + D))
        if (k === nudgeSample) y = [y[0]!, y[1]! + 0.08, y[2]!]
        const c = held
        const f = (_t: number, z: number[]) => [
          z[1]!,
          ag * Math.sin(leverBeamAngle(z[2]!, geo)!),
          Math.max(-p.slewLimit, Math.min(p.slewLimit, (c - z[2]!) / p.servoLag)),
        ]
        y = s.solve(f, 0, y, T).y
        held = u
        const simX = sim.x[(k + 1) * 4]!
        expect(sim.t[(k + 1) * 4]).toBeCloseTo((k + 1) * T, 9)
        worst = Math.max(worst, Math.abs(simX - y[0]!))
      }
      expect(worst).toBeLessThan(1e-7)
      // and it is a real response: it reached the new setpoint
      expect(Math.abs(sim.x.at(-1)! - r1)).toBeLessThan(0.002)
    })

  it('settles within a few ADC counts with quantisation, and shows the nudge', () => {
    const sim = simulate(rig, gains, { duration: 10, nudge: { time: 6, speed: 0.1 } })
    const ks = plantOf(rig).countsPerMeter
    const i6 = sim.t.findIndex(t => t >= 6)
    const before = sim.x.slice(i6 - 50, i6)
    for (const x of before) expect(Math.abs(x - sim.setpoint[i6]!)).toBeLessThan(4 / ks)
    const afterNudge = Math.max(
      ...sim.x.slice(i6, i6 + 100).map(x => Math.abs(x - sim.setpoint[i6]!)),
    )
    expect(afterNudge).toBeGreaterThan(0.005)
    expect(Math.abs(sim.x.at(-1)! - sim.setpoint.at(-1)!)).toBeLessThan(4 / ks)
    expect(sim.t).toHaveLength(sim.x.length)
    expect(sim.beamAngle).toHaveLength(sim.x.length)
  })

  it('clamps the command at the usable travel and reports it', () => {
    const hot: Gains = { ...gains, kp: gains.kp * 6, kd: gains.kd * 3 }
    const sim = simulate(rig, hot, { initialPosition: 0.05, setpoint: 0.35, setpointTime: 0 })
    const usable = beamAngleRange(rig).maxAtServoAngle
    expect(sim.events.travelSaturated).toBe(true)
    expect(Math.max(...sim.command)).toBeLessThanOrEqual(usable + 1e-12)
  })

  it('P only runs away and hits the beam end', () => {
    const sim = simulate(rig, { ...gains, kd: 0 }, { duration: 30 })
    expect(sim.events.hitEnd).toBe(true)
  })

  it('the exact linkage and the small-angle one differ at large servo angles only', () => {
    const big = simulate(rig, gains, { linkage: 'small-angle', duration: 3 })
    const exact = simulate(rig, gains, { linkage: 'exact', duration: 3 })
    const maxDiff = Math.max(...big.x.map((x, i) => Math.abs(x - exact.x[i]!)))
    expect(maxDiff).toBeGreaterThan(1e-5)
    expect(maxDiff).toBeLessThan(0.02)
  })
})

describe('sampled step metrics', () => {
  it(
    'overshoot and 2 % settling match the linear loop integrated by odex with dense '
    + 'output', () => {
      for (const form of ['PD', 'PID'] as const) {
        const p = planGains(rig, { ...REFERENCE_TARGETS, form })
        const g = p.gains!
        const a = analyzeLoop(rig, g)
        const plant = plantOf(rig)
        const T = plant.period
        const tf = filterTimeConstant(g.kp, g.kd, g.n)
        const da = tf / (tf + T)
        const db = g.kd / (tf + T)
        const s = solver(3, 1e-12)
        s.denseOutput = true
        let y = [0, 0, 0]
        let held = 0
        let D = 0
        let sPrev = 0
        let I = 0
        let xMax = 0
        let lastOut = 0
        const dt = T / 200
        let prev = { t: 0, x: 0 }
        for (let k = 0; k < Math.round(30 / T); k++) {
          const e = 1 - y[0]!
          D = da * D + db * (-y[0]! - sPrev)
          sPrev = -y[0]!
          I += g.ki * T * e
          const u = g.kp * e + I + D
          const c = held
          const f = (_t: number, z: number[]) => [
            z[1]!,
            plant.kb * z[2]!,
            (c - z[2]!) / plant.servoLag,
          ]
          y = s.solve(
            f,
            0,
            y,
            T,
            s.grid(dt, (t, z) => {
              const x = z[0]!
              const tt = k * T + t
              if (x > xMax) xMax = x
              if (Math.abs(x - 1) > 0.02) lastOut = tt
              else if (Math.abs(prev.x - 1) > 0.02) {
                const edge = prev.x > 1 ? 1.02 : 0.98
                lastOut = prev.t + ((edge - prev.x) / (x - prev.x)) * (tt - prev.t)
              }
              prev = { t: tt, x }
            }),
          ).y
          held = u
        }
        expect(a.step.overshootPct!).toBeCloseTo(100 * (xMax - 1), 3)
        expect(a.step.settlingTime!).toBeCloseTo(lastOut, 3)
      }
    })

  it('the plotted response passes through the same samples', () => {
    const plant = plantOf(rig)
    const r = sampledStepResponse(sampledLoopOf(plant, gains), 2, 4)
    const s = solver(3)
    let y = [0, 0, 0]
    let held = 0
    let D = 0
    let sPrev = 0
    const T = plant.period
    const tf = filterTimeConstant(gains.kp, gains.kd, gains.n)
    for (let k = 0; k < 100; k++) {
      expect(r.x[4 * k]).toBeCloseTo(y[0]!, 10)
      const e = 1 - y[0]!
      D = (tf / (tf + T)) * D + (gains.kd / (tf + T)) * (-y[0]! - sPrev)
      sPrev = -y[0]!
      const u = gains.kp * e + D
      const c = held
      y = s.solve((_t, z) => [z[1]!, plant.kb * z[2]!, (c - z[2]!) / plant.servoLag], 0, y, T).y
      held = u
    }
  })
})
