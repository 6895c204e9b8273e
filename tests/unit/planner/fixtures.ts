// A fixed reference rig for the model's tests, so that changing the shop's kit presets
// never changes what a test expects: 400 mm beam on a centre pivot, pushrod 200 mm out,
// 25 mm horn, 100 mm pushrod, 19 mm solid steel ball on rails 10 mm apart, 0.12 s/60° servo
// with 180° travel, 50 Hz loop, 10-bit ADC over the whole beam (2560 counts/m).
import type { Rig, Targets } from '../../../shared/utils/planner'

export const REFERENCE_RIG: Rig = {
  beamLength: 0.4,
  pivotToLink: 0.2,
  leverArm: 0.025,
  drive: 'lever',
  ballDiameter: 0.019,
  ballShell: 'solid',
  ballMaterial: 'steel',
  railGap: 0.01,
  servoSecondsPer60: 0.12,
  servoTravel: Math.PI,
  servoType: 'analog',
  loopRate: 50,
  adcBits: 10,
  pushrodLength: 0.1,
}

/** The targets the model's tests were written against (PD, 10 %, 3.5 s, N = 10, lag-aware). */
export const REFERENCE_TARGETS: Targets = {
  overshootPct: 10,
  settlingTime: 3.5,
  form: 'PD',
  derivativeFilterN: 10,
  method: 'lag-aware',
  derivativeOn: 'measurement',
}
