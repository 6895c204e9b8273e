// Gain Planner benchmark: `npm run bench`. Prints medians; it asserts nothing (timing belongs
// here, never in a test). Targets: analyzeLoop < 0.1 ms, a 100×100 stability map < 150 ms.
import {
  analyzeLoop,
  DEFAULT_TARGETS,
  KIT_PRESETS,
  planGains,
  plantOf,
  rigSchema,
  simulate,
  stabilityMap,
  type Gains,
  type Rig,
  type Targets,
} from '../shared/utils/planner'

// A small deterministic generator, so every run times the same rigs.
let seed = 20240611
function random(): number {
  seed = (seed * 1664525 + 1013904223) >>> 0
  return seed / 4294967296
}
const between = (lo: number, hi: number) => lo + (hi - lo) * random()

function randomRig(): Rig {
  const beamLength = between(0.25, 1)
  const ballDiameter = between(0.01, 0.04)
  const rig: Rig = {
    beamLength,
    pivotToLink: beamLength * between(0.4, 1),
    leverArm: between(0.012, 0.04),
    drive: 'lever',
    ballDiameter,
    ballShell: random() < 0.7 ? 'solid' : 'thin-shell',
    railGap: ballDiameter * between(0, 0.7),
    servoSecondsPer60: between(0.06, 0.25),
    servoTravel: Math.PI,
    loopRate: between(25, 200),
    adcBits: 10 + Math.floor(random() * 3),
  }
  return rigSchema.parse(rig)
}

function targetsFor(rig: Rig): Targets {
  const lag = plantOf(rig).effectiveLag
  return {
    ...DEFAULT_TARGETS,
    form: random() < 0.75 ? 'PD' : 'PID',
    overshootPct: between(2, 20),
    settlingTime: lag * between(30, 80),
  }
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2
}

/** Median over `outer` rounds of the mean time of `inner` calls, ms per call. */
function time(fn: () => unknown, inner: number, outer: number): number {
  for (let i = 0; i < inner; i++) fn()
  const rounds: number[] = []
  for (let r = 0; r < outer; r++) {
    const t0 = performance.now()
    for (let i = 0; i < inner; i++) fn()
    rounds.push((performance.now() - t0) / inner)
  }
  return median(rounds)
}

const cases: { rig: Rig, targets: Targets, gains: Gains }[] = []
while (cases.length < 200) {
  const rig = randomRig()
  const targets = targetsFor(rig)
  const plan = planGains(rig, targets)
  if (plan.gains) cases.push({ rig, targets, gains: plan.gains })
}

// Warm the JIT on every path before timing anything.
for (const c of cases) {
  analyzeLoop(c.rig, c.gains)
  planGains(c.rig, c.targets)
}

const analyzePerRig = cases.map(c => time(() => analyzeLoop(c.rig, c.gains), 20, 5))
const planPerRig = cases.map(c => time(() => planGains(c.rig, c.targets), 10, 3))

const preset = KIT_PRESETS[0]!.rig
const presetPlan = planGains(preset, DEFAULT_TARGETS)
const g = presetPlan.gains!
const mapOptions = {
  kpRange: [0, 3 * g.kp] as [number, number],
  kdRange: [0, 3 * g.kd] as [number, number],
  n: g.n,
  derivativeOn: g.derivativeOn,
}
const mapMs = time(() => stabilityMap(preset, mapOptions, 100), 1, 15)
const simMs = time(
  () => simulate(preset, g, { duration: 10, nudge: { time: 5, speed: 0.1 } }),
  1,
  25,
)

const rows: [string, number, string][] = [
  ['analyzeLoop, per rig (200 random rigs)', median(analyzePerRig), '< 0.1 ms'],
  ['planGains, per rig (200 random rigs)', median(planPerRig), ''],
  ['stabilityMap 100×100 (classroom rig)', mapMs, '< 150 ms'],
  ['simulate, 10 s nonlinear (classroom rig)', simMs, ''],
]
const width = Math.max(...rows.map(r => r[0].length))
console.log(`${'Gain Planner benchmark'.padEnd(width)}  median ms   target`)
for (const [name, ms, target] of rows) {
  console.log(`${name.padEnd(width)}  ${ms.toFixed(ms < 1 ? 4 : 2).padStart(9)}   ${target}`)
}
console.log(
  `(analyzeLoop per rig: fastest ${Math.min(...analyzePerRig).toFixed(4)} ms, slowest `
  + `${Math.max(...analyzePerRig).toFixed(4)} ms)`,
)
