import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG } from './fixtures'
import {
  beamAngleRange,
  derivativeCoefficients,
  firmwareConstants,
  plantOf,
  type Gains,
} from '../../../shared/utils/planner'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../../shared/utils/planner/presets'
import { planGains } from '../../../shared/utils/planner/plan'
import { definesOf, recipeOf, type Defines } from './recipe'

const rig = REFERENCE_RIG // 50 Hz, 2560 counts/m
const DEG = 180 / Math.PI

describe('firmwareConstants', () => {
  const gains: Gains = { kp: 7.2, kd: 3.8, ki: 1.5, n: 10, derivativeOn: 'measurement' }

  it('uses backward Euler by default and converts every gain to servo degrees per count', () => {
    const fw = firmwareConstants(rig, gains)
    const tf = 3.8 / (10 * 7.2)
    expect(fw.discretization).toBe('backward-euler')
    expect(fw.tf).toBeCloseTo(tf, 14)
    expect(fw.a).toBeCloseTo(tf / (tf + 0.02), 14)
    expect(fw.b).toBeCloseTo(3.8 / (tf + 0.02), 12)
    expect(fw.kiT).toBeCloseTo(1.5 * 0.02, 14)
    expect(fw.kpDegPerMm).toBeCloseTo((7.2 * DEG) / 1000, 12)
    expect(fw.kpDegPerCount).toBeCloseTo((7.2 * DEG) / 2560, 12)
    expect(fw.bDegPerCount).toBeCloseTo((fw.b * DEG) / 2560, 12)
    expect(fw.kiTDegPerCount).toBeCloseTo((0.03 * DEG) / 2560, 12)
    // The lever folds back at about 79°, before the servo's 90°: the clamp sits at the fold.
    expect(fw.servoLimitDeg).toBeCloseTo(beamAngleRange(rig).maxAtServoAngle * DEG, 12)
    expect(fw.servoLimitDeg).toBeLessThan(90)
    expect(
      firmwareConstants({ ...rig, drive: 'direct', gearRatio: 20 }, gains).servoLimitDeg,
    ).toBeCloseTo(90, 12)
    expect(fw.warnings).toEqual([])
  })

  it('writes a C block and a JSON object that state the loop rate and units', () => {
    const fw = firmwareConstants(rig, gains)
    expect(fw.cSource).toContain('#define TW_LOOP_RATE_HZ     50.0f')
    expect(fw.cSource).toContain(
      `#define TW_KP               ${Number(fw.kpDegPerCount.toPrecision(7))}f`,
    )
    expect(fw.cSource).toContain(`#define TW_D_A              ${Number(fw.a.toPrecision(7))}f`)
    expect(fw.cSource).toMatch(/derivative on measurement, backward Euler/)
    expect(fw.cSource).toMatch(/s = -reading/)
    expect(fw.json.loopRateHz).toBe(50)
    expect(fw.json.kpDegPerCount).toBe(fw.kpDegPerCount)
    expect(fw.json.units.kpDegPerCount).toMatch(/degrees per ADC count/)
    expect(fw.json.units.loopRateHz).toBe('Hz')
    expect(JSON.parse(JSON.stringify(fw.json))).toEqual(fw.json)
  })

  it('gives Tustin constants when the filter is long enough (T_f ≥ T/2)', () => {
    const slow: Gains = { ...gains, n: 2 } // T_f = 0.264 s ≥ 0.01 s
    const fw = firmwareConstants(rig, slow, { discretization: 'tustin' })
    const tf = 3.8 / (2 * 7.2)
    expect(fw.discretization).toBe('tustin')
    expect(fw.a).toBeCloseTo((2 * tf - 0.02) / (2 * tf + 0.02), 14)
    expect(fw.b).toBeCloseTo((2 * 3.8) / (2 * tf + 0.02), 12)
    expect(fw.warnings).toEqual([])
  })

  it('refuses Tustin when T_f < T/2, warns, and falls back to backward Euler', () => {
    const sharp: Gains = { ...gains, kd: 0.05, n: 20 } // T_f = 0.35 ms < 10 ms
    const fw = firmwareConstants(rig, sharp, { discretization: 'tustin' })
    expect(derivativeCoefficients(0.05, 0.05 / (20 * 7.2), 0.02, 'tustin').ok).toBe(false)
    expect(fw.discretization).toBe('backward-euler')
    expect(fw.warnings.map(w => w.code)).toEqual(['tustin-refused'])
    expect(fw.a).toBeGreaterThanOrEqual(0)
    expect(fw.cSource).toMatch(/backward Euler/)
  })

  it('says so when the derivative acts on the error', () => {
    const fw = firmwareConstants(rig, { ...gains, derivativeOn: 'error' })
    expect(fw.cSource).toMatch(/s = error/)
    expect(fw.json.derivativeOn).toBe('error')
  })
})

describe('the exported recipe at power-up', () => {
  // Runs the C block's arithmetic the way the microcontroller does, with the constants read back
  // from its #defines: the ball rests near one end, the setpoint is mid-track.
  const kit = KIT_PRESETS[0]!.rig
  const planned = planGains(kit, DEFAULT_TARGETS).gains!
  const fw = firmwareConstants(kit, planned)
  const defines = Object.fromEntries(
    [...fw.cSource.matchAll(/#define (TW_\w+)\s+(-?[\d.]+(?:e[-+]?\d+)?)f?/gi)].map(m => [
      m[1]!,
      Number(m[2]),
    ]),
  )
  const clamp = (v: number) =>
    Math.max(-defines.TW_SERVO_LIMIT_DEG!, Math.min(defines.TW_SERVO_LIMIT_DEG!, v))

  function firstCommands(readings: number[], setpoint: number, asExported: boolean) {
    let d = 0
    let i = 0
    let n = 0
    let sPrev = 0
    const out: number[] = []
    readings.forEach((reading, k) => {
      const error = setpoint - reading
      const s = -reading // derivative on measurement
      if (k === 0 && asExported) sPrev = s
      d = defines.TW_D_A! * d + defines.TW_D_B! * (s - sPrev)
      sPrev = s
      i = i + defines.TW_KI_T! * error
      let servo = clamp(defines.TW_KP! * error + i + d)
      if (asExported && n < defines.TW_SOFT_START!) {
        n = n + 1
        servo = (servo * n) / defines.TW_SOFT_START!
      }
      out.push(servo)
    })
    return out
  }

  it('starts the servo gently: no derivative kick, the command eased in over half a second', () => {
    expect(fw.cSource).toMatch(/First sample only: .*s_prev = s of that sample/s)
    expect(defines.TW_SOFT_START).toBe(Math.round(0.5 * kit.loopRate))
    expect(fw.json.softStartSamples).toBe(defines.TW_SOFT_START)
    // The ball rests near the far end (900 counts), the setpoint is mid-track (512).
    const still = Array.from({ length: 60 }, () => 900)
    const eased = firstCommands(still, 512, true)
    // The first command is the proportional and integral terms alone, scaled by 1/TW_SOFT_START.
    expect(eased[0]).toBeCloseTo(
      clamp((defines.TW_KP! + defines.TW_KI_T!) * -388) / defines.TW_SOFT_START!, 9)
    expect(Math.abs(eased[0]!)).toBeLessThan(2)
    // Without the first-sample line and the soft start (the recipe as it used to read), the
    // derivative jumps from 0 to the reading and throws the servo to its clamp at once.
    expect(defines.TW_KP! * 388).toBeLessThan(defines.TW_SERVO_LIMIT_DEG! / 2)
    const kicked = firstCommands(still, 512, false)
    expect(Math.abs(kicked[0]!)).toBeCloseTo(defines.TW_SERVO_LIMIT_DEG!, 6)
    // The soft start never lets a command grow faster than the eased-in limit.
    eased.forEach((v, k) => {
      const n = Math.min(k + 1, defines.TW_SOFT_START!)
      const limit = (defines.TW_SERVO_LIMIT_DEG! * n) / defines.TW_SOFT_START!
      expect(Math.abs(v)).toBeLessThanOrEqual(limit + 1e-9)
    })
  })
})

describe('a track that reads backwards (the reading sign)', () => {
  // The kit rig with its track wired end for end: the raw ADC value falls as the ball moves
  // toward +x. The exported recipe is run on a small-angle ball-and-beam (x'' = K_b·θ, servo lag
  // τ_s, command written on the next tick), integrated finely between samples.
  const kit = { ...KIT_PRESETS[0]!.rig, sensorReversed: true }
  const planned = planGains(kit, DEFAULT_TARGETS).gains!
  const fw = firmwareConstants(kit, planned)
  const defines = definesOf(fw)
  const plant = plantOf(kit)
  const fullScale = 2 ** kit.adcBits - 1

  function run(overrides: Partial<Defines>) {
    const recipe = recipeOf(defines, planned.derivativeOn, overrides)
    const length = plant.sensorLength
    let x = 0.3 * length
    let v = 0
    let theta = 0
    let held = 0
    const sub = 50
    const h = plant.period / sub
    const setpoint = Math.round(0.5 * length * plant.countsPerMeter)
    let hitEnd = false
    let x2s = 0
    for (let k = 0; k < 5 * kit.loopRate; k++) {
      const count = Math.min(fullScale, Math.max(0, Math.floor(x * plant.countsPerMeter)))
      const raw = fullScale - count // wired backwards
      const servo = recipe.step(raw, setpoint)
      for (let j = 0; j < sub; j++) {
        theta += (h * (held - theta)) / plant.servoLag
        v += h * plant.kb * theta
        x += h * v
        if (x < 0 || x > length) {
          x = Math.min(length, Math.max(0, x))
          v = 0
          hitEnd = true
        }
      }
      held = (servo * Math.PI) / 180
      if (k === 5 * kit.loopRate - 1) x2s = x
    }
    return { hitEnd, finalError: Math.abs(x2s - 0.5 * length) }
  }

  it('carries TW_READING_SIGN = -1 and the full scale into the C block and the JSON', () => {
    expect(fw.readingSign).toBe(-1)
    expect(defines.TW_READING_SIGN).toBe(-1)
    expect(defines.TW_ADC_FULL_SCALE).toBe(1023)
    expect(fw.cSource).toContain('reading = TW_READING_SIGN > 0 ? raw : TW_ADC_FULL_SCALE - raw;')
    expect(fw.json.readingSign).toBe(-1)
    expect(fw.json.adcFullScale).toBe(1023)
    expect(firmwareConstants(KIT_PRESETS[0]!.rig, planned).json.readingSign).toBe(1)
  })

  it('holds the ball with the exported constants; without the sign it runs to the end stop', () => {
    const held = run({})
    expect(held.hitEnd).toBe(false)
    expect(held.finalError).toBeLessThan(0.003)
    const backwards = run({ TW_READING_SIGN: 1 })
    expect(backwards.hitEnd).toBe(true)
  })
})

describe('the servo pulse in microseconds', () => {
  const kit = KIT_PRESETS[0]!.rig
  const planned = planGains(kit, DEFAULT_TARGETS).gains!
  it('exports the centre, trim, µs per degree and limit; every C line fits 78 characters', () => {
    const degreeRig = { ...kit, sensorReversed: true, servoResolution: 'degree' as const }
    for (const rig of [kit, degreeRig]) {
      const fw = firmwareConstants(rig, planned)
      const d = definesOf(fw)
      expect(d.TW_SERVO_CENTER_US).toBe(1500)
      expect(d.TW_SERVO_TRIM_US).toBe(0)
      expect(d.TW_US_PER_DEG).toBeCloseTo(1000 / 90, 4)
      expect(d.TW_SERVO_LIMIT_US).toBeCloseTo(fw.servoLimitDeg * (1000 / 90), 2)
      expect(fw.json.servoLimitUs).toBeCloseTo(fw.servoLimitDeg * (1000 / 90), 9)
      for (const line of fw.cSource.split('\n')) expect(line.length).toBeLessThanOrEqual(78)
    }
    const custom = firmwareConstants({ ...kit, servoCenterUs: 1520, servoUsPerDeg: 10 }, planned)
    expect(custom.json.servoCenterUs).toBe(1520)
    expect(recipeOf(definesOf(custom), 'measurement').pulse(-12.34)).toBe(1520 - 123)
  })

  it('writes whole degrees when the servo library takes degrees', () => {
    const fw = firmwareConstants({ ...kit, servoResolution: 'degree' }, planned)
    expect(fw.cSource).toMatch(/servo\.write\(90 \+ round\(servo\)\)/)
    expect(fw.json.servoResolution).toBe('degree')
    expect(firmwareConstants(kit, planned).cSource).toMatch(/writeMicroseconds/)
  })
})
