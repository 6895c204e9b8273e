// The measured run: CSV parsing with every bad row reported, and the fit of the plant gain K_b and
// the servo lag τ_s checked against runs the planner's own simulation made with known values
// (a different lever arm and a slower servo than the rig as entered) plus seeded reading noise.
import { describe, expect, it } from 'vitest'
import {
  fitRun,
  parseRunCsv,
  planGains,
  plantOf,
  RUN_LOG_SNIPPET,
  RUN_MAX_ROWS,
  runScenario,
} from '../../../shared/utils/planner'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../../shared/utils/planner/presets'
import { simulatedLog } from './runs'

// The kit at 100 Hz with a servo that takes a pulse every sample, as in the log the bench times.
const rig = { ...KIT_PRESETS[0]!.rig, loopRate: 100, servoFrameHz: 100 }
const gains = planGains(rig, DEFAULT_TARGETS).gains!
const truth = {
  ...rig,
  leverArm: rig.leverArm * 1.2,
  servoSecondsPer60: rig.servoSecondsPer60 * 1.4,
}

describe('parseRunCsv', () => {
  it('reads the columns in any order, in counts or mm, and starts the time at 0', () => {
    const ks = plantOf(rig).countsPerMeter
    const counts = parseRunCsv(
      'command_deg,time_s,position_counts,setpoint_counts\n1.5,2.00,512,600\n-0.5,2.01,514,600\n',
      rig,
    )
    expect(counts.errors).toEqual([])
    expect(counts.unit).toBe('counts')
    const first = counts.samples[0]!
    expect(first.t).toBe(0)
    expect(first.position).toBeCloseTo(512 / ks, 14)
    expect(first.setpoint).toBeCloseTo(600 / ks, 14)
    expect(first.command).toBeCloseTo((1.5 * Math.PI) / 180, 14)
    expect(counts.samples[1]!.t).toBeCloseTo(0.01, 12)
    const mm = parseRunCsv('time_s,position_mm\n0,120\n0.02,121.5', rig)
    expect(mm.unit).toBe('mm')
    expect(mm.samples[1]!.position).toBeCloseTo(0.1215, 14)
    expect(mm.samples[1]!.setpoint).toBeNull()
    expect(mm.hasSetpoint).toBe(false)
    expect(mm.hasCommand).toBe(false)
  })

  it('reports every bad row by line with why', () => {
    const rows = ['time_s,position_counts,command_deg']
    for (let k = 0; k < 12; k++) rows.push(`${k * 0.01},${500 + k},0.5`)
    rows[3] = '0.02,abc,0.5'
    rows[6] = '0.05,505'
    rows[9] = '0.01,508,0.5'
    rows[11] = '0.10,510,'
    const run = parseRunCsv(rows.join('\n'), rig)
    expect(run.errors).toEqual([
      { line: 4, message: 'position_counts "abc" is not a number.' },
      { line: 7, message: 'This row has 2 values; the first row names 3.' },
      { line: 10, message: 'time_s 0.01 does not come after the row before (0.07).' },
      { line: 12, message: 'command_deg "" is not a number.' },
    ])
  })

  it('names a missing or doubled column on the first row, and refuses over-long logs', () => {
    expect(parseRunCsv('t,position_counts\n0,1', rig).errors[0]!.message).toMatch(/time_s/)
    expect(parseRunCsv('time_s,x\n0,1', rig).errors[0]!.message).toMatch(/position_counts or/)
    expect(parseRunCsv('time_s,position_counts,position_mm\n0,1,2', rig).errors[0]!.message)
      .toMatch(/only one of/)
    const long = ['time_s,position_counts']
    for (let k = 0; k < RUN_MAX_ROWS + 3; k++) long.push(`${k * 0.01},500`)
    const run = parseRunCsv(long.join('\n'), rig)
    expect(run.errors).toHaveLength(1)
    expect(run.errors[0]!.line).toBe(RUN_MAX_ROWS + 2)
    expect(run.errors[0]!.message).toMatch(/more than 5000 rows/)
  })

  it('the firmware snippet prints exactly the columns the parser reads', () => {
    const header = /"(time_s[^"]*)"/.exec(RUN_LOG_SNIPPET)![1]!
    const run = parseRunCsv(`${header}\n` + Array.from({ length: 12 }, (_, k) =>
      `${(k * 0.01).toFixed(3)},${500 + k},600,${(0.1 * k).toFixed(2)}`).join('\n'), rig)
    expect(run.errors).toEqual([])
    expect(run.hasSetpoint && run.hasCommand).toBe(true)
    expect(RUN_LOG_SNIPPET.split('\n').every(l => l.length <= 78)).toBe(true)
  })

  it('runScenario takes the start, the setpoint change and the length from the log', () => {
    const run = parseRunCsv(simulatedLog(truth, gains), rig).samples
    const s = runScenario(run)
    expect(s.setpointTime).toBeCloseTo(1, 9)
    expect(s.duration).toBeCloseTo(run.at(-1)!.t, 12)
    expect(s.initialPosition).toBe(run[0]!.position)
  })
})

describe('fitRun', () => {
  const kbTrue = plantOf(truth).kb
  const tauTrue = plantOf(truth).servoLag

  // Tolerances: 1 % on K_b and 5 % on τ_s with 2 counts of noise, from replaying the logged
  // command; 3 % and 10 % when only the setpoint is logged (the closed loop hides the lag more).
  const cases = [['all', 0.01, 0.05], ['no-command', 0.03, 0.1]] as const
  for (const [columns, kbTol, tauTol] of cases) {
    for (const seed of [1, 2]) {
      it(`recovers K_b and τ_s from a run (${columns} columns, seed ${seed})`, () => {
        const run = parseRunCsv(simulatedLog(truth, gains, { noiseCounts: 2, seed, columns }), rig)
        expect(run.errors).toEqual([])
        const fit = fitRun(rig, gains, run.samples)
        expect(fit.problem).toBeNull()
        expect(fit.method).toBe(columns === 'all' ? 'replay' : 'closed-loop')
        expect(Math.abs(fit.kb / kbTrue - 1)).toBeLessThan(kbTol)
        expect(Math.abs(fit.servoLag / tauTrue - 1)).toBeLessThan(tauTol)
        expect(fit.modelKb).toBeCloseTo(plantOf(rig).kb, 12)
        expect(fit.rmsAfterMm).toBeLessThan(fit.rmsBeforeMm / 2)
        // the corrected inputs reproduce the fitted plant
        const corrected = { ...rig, ...fit.corrected }
        expect(plantOf(corrected).kb).toBeCloseTo(fit.kb, 9)
        expect(plantOf(corrected).servoLag).toBeCloseTo(fit.servoLag, 12)
        expect(fit.corrected.leverArm! / truth.leverArm).toBeCloseTo(1, 1)
        expect(fit.fitted.t).toHaveLength(run.samples.length)
        expect(fit.predicted.xMm).toHaveLength(run.samples.length)
      })
    }
  }

  it('without the command or the setpoint there is nothing to fit on, and it says so', () => {
    const run = parseRunCsv(
      'time_s,position_mm\n' + Array.from({ length: 20 }, (_, k) => `${k / 100},${100 + k}`)
        .join('\n'), rig)
    const fit = fitRun(rig, gains, run.samples)
    expect(fit.problem).toMatch(/command_deg.*setpoint/)
    expect(fit.corrected).toEqual({})
  })
})
