// The time simulations checked against an independent general-purpose ODE solver: odex, the npm
// port of Hairer & Wanner's ODEX (Gragg–Bulirsch–Stoer extrapolation, adaptive step size),
// integrating the same equations between samples.
import { Solver } from 'odex'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import { describe, expect, it } from 'vitest'
import {
  actuatorOf,
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
  firmwareConstants,
} from '../../../shared/utils/planner'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../../shared/utils/planner/presets'
import { definesOf, recipeOf } from './recipe'

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
        softStart: false,
        actuator: false,
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
    // The clamped command is then written as a whole-µs pulse, so it may pass by half a µs.
    const halfStep = actuatorOf(rig).stepRad / 2
    expect(Math.max(...sim.command)).toBeLessThanOrEqual(usable + halfStep + 1e-12)
    expect(Math.max(...sim.command)).toBeGreaterThan(usable - halfStep)
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

describe('the drawn response runs the exported recipe', () => {
  const kit = KIT_PRESETS[0]!.rig
  const kitGains = planGains(kit, DEFAULT_TARGETS).gains!
  const p = plantOf(kit)
  const DEG = 180 / Math.PI
  const start = { initialPosition: 0.32, setpoint: 0.18, setpointTime: 0, duration: 1.2 }

  it('eases the command in and matches the recipe\'s arithmetic sample by sample', () => {
    const sim = simulate(kit, kitGains, { ...start, actuator: false })
    const recipe = recipeOf(definesOf(firmwareConstants(kit, kitGains)), kitGains.derivativeOn)
    const perSample = 4 // subSteps 20, output every 5
    const soft = firmwareConstants(kit, kitGains).softStartSamples
    expect(soft).toBe(25)
    for (let k = 0; k < 40; k++) {
      const count = Math.floor(sim.x[perSample * k]! * p.countsPerMeter)
      const servo = recipe.step(count, 0.18 * p.countsPerMeter - 0.5)
      // the command of sample k is held over the next sample
      expect(sim.command[perSample * (k + 1)]! * DEG).toBeCloseTo(servo, 4)
    }
    // Without the soft start the first command is the full proportional one: 25 times larger.
    const hard = simulate(kit, kitGains, { ...start, actuator: false, softStart: false })
    expect(hard.command[perSample]! / sim.command[perSample]!).toBeCloseTo(soft, 9)
  })

  it('writes the same whole-µs pulses as the recipe', () => {
    const sim = simulate(kit, kitGains, start)
    const recipe = recipeOf(definesOf(firmwareConstants(kit, kitGains)), kitGains.derivativeOn)
    const usPerRad = actuatorOf(kit).usPerRad
    for (let k = 0; k < 40; k++) {
      const count = Math.floor(sim.x[4 * k]! * p.countsPerMeter)
      const pulse = recipe.pulse(recipe.step(count, 0.18 * p.countsPerMeter - 0.5))
      expect(1500 + sim.command[4 * (k + 1)]! * usPerRad).toBeCloseTo(pulse, 6)
    }
  })
})

describe('the actuator: output steps, frames and deadband', () => {
  const kit = KIT_PRESETS[2]!.rig
  const kitGains = planGains(kit, DEFAULT_TARGETS).gains!
  const DEG = Math.PI / 180

  it('a deadband makes the ball hunt around the setpoint; none does not', () => {
    const still = simulate({ ...kit, servoDeadbandUs: 0 }, kitGains)
    const sticky = simulate({ ...kit, servoDeadbandUs: 15 }, kitGains)
    expect(still.events.hunting).toBe(false)
    expect(sticky.events.hunting).toBe(true)
    const swing = (r: typeof still) => {
      const i = r.t.findIndex(t => t >= 6)
      const e = r.x.slice(i).map((x, j) => x - r.setpoint[i + j]!)
      return Math.max(...e) - Math.min(...e)
    }
    expect(swing(sticky)).toBeGreaterThan(3 * swing(still))
    // without the actuator model the same rig shows no hunting at all
    expect(simulate({ ...kit, servoDeadbandUs: 15 }, kitGains, { actuator: false }).events.hunting)
      .toBe(false)
  })

  it('calls a P-only swing a swing, not hunting', () => {
    // The swing P alone predicts spans much of the track; hunting is the small wander of steps.
    const pOnly = planGains(kit, { ...DEFAULT_TARGETS, form: 'P' }).proportional!
    const run = simulate({ ...kit, servoResolution: 'degree' }, pOnly, { duration: 20 })
    const late = run.x.filter((_, i) => run.t[i]! > 10)
    expect(Math.max(...late) - Math.min(...late)).toBeGreaterThan(0.05)
    expect(run.events.hunting).toBe(false)
  })

  it('writes whole degrees or whole microseconds', () => {
    const us = simulate({ ...kit, servoResolution: 'microsecond' }, kitGains, { duration: 3 })
    const deg = simulate({ ...kit, servoResolution: 'degree' }, kitGains, { duration: 3 })
    const usStep = DEG / (1000 / 90)
    const offGrid = (c: number, step: number) => Math.abs(c / step - Math.round(c / step))
    for (const c of us.command) expect(offGrid(c, usStep)).toBeLessThan(1e-6)
    for (const c of deg.command) expect(offGrid(c, DEG)).toBeLessThan(1e-9)
    // degree steps are coarser: fewer distinct commands
    expect(new Set(deg.command).size).toBeLessThan(new Set(us.command).size)
  })

  it('the servo takes a new pulse only at its frames', () => {
    // a 100 Hz loop driving a 50 Hz servo: every other command is never seen
    const fast = { ...kit, loopRate: 100, servoFrameHz: 50 }
    const g = planGains(fast, DEFAULT_TARGETS).gains!
    const sim = simulate(fast, g, { duration: 2, subSteps: 10, outputEvery: 1 })
    const tau = plantOf(fast).servoLag
    // within a 20 ms frame the servo heads for one target: θ' ·τ + θ is constant
    const frameOf = (t: number) => Math.floor(t * 50 + 1e-9)
    const aim = (i: number) => {
      const th = sim.servoAngle
      return th[i]! + (tau * (th[i + 1]! - th[i - 1]!)) / (sim.t[i + 1]! - sim.t[i - 1]!)
    }
    let worst = 0
    let checked = 0
    let moved = 0
    for (let i = 2; i + 2 < sim.t.length; i++) {
      if (sim.t[i]! < 0.1 || frameOf(sim.t[i - 1]!) !== frameOf(sim.t[i + 2]!)) continue
      worst = Math.max(worst, Math.abs(aim(i) - aim(i + 1)))
      moved = Math.max(moved, Math.abs(sim.servoAngle[i + 1]! - sim.servoAngle[i]!))
      checked++
    }
    expect(checked).toBeGreaterThan(100)
    expect(moved).toBeGreaterThan(1e-4)
    expect(worst).toBeLessThan(moved / 20)
  })

  it('scales the plant gain and the servo lag, and adds whole samples of delay', () => {
    const base = simulate(kit, kitGains, { duration: 2, actuator: false })
    const late = simulate(kit, kitGains, { duration: 2, actuator: false, extraDelaySamples: 1 })
    // the held command arrives one sample (4 output points) later: the first commands, before
    // the ball has moved by an ADC count, are the same ones shifted
    for (let i = 0; i < 8; i++) expect(late.command[i]).toBe(0)
    for (let i = 4; i < 12; i++) expect(late.command[i + 4]).toBe(base.command[i])
    expect(base.command[8]).not.toBe(0)
    const hot = simulate(kit, kitGains, { duration: 2, actuator: false, kbScale: 1.3 })
    const slow = simulate(kit, kitGains, { duration: 2, actuator: false, servoLagScale: 1.3 })
    expect(hot.x).not.toEqual(base.x)
    expect(slow.servoAngle[20]).not.toBeCloseTo(base.servoAngle[20]!, 9)
  })
})
