// Gain Planner benchmark: `npm run bench`. Prints medians and a figure table; it asserts nothing
// (timing belongs here, never in a test). Targets (docs/planner-model.md, "Speed"):
// analyzeLoop < 0.1 ms, a 100×100 stability map within one frame (≤ 16 ms), the measured-run fit
// of a 10 s log at 100 Hz < 200 ms, and a keystroke to updated results ≤ 50 ms in Chromium (run
// by bench/keystroke.ts when it is there).
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import {
  analyzeLoop,
  DEFAULT_TARGETS,
  fitRun,
  KIT_PRESETS,
  planGains,
  plantOf,
  rigSchema,
  simulate,
  stabilityMap,
  type Gains,
  type Rig,
  type RunSample,
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
  for (let i = 0; i < Math.max(inner, 5); i++) fn()
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
const mapMs = time(() => stabilityMap(preset, mapOptions, 100), 1, 31)
const pidMapMs = time(
  () => stabilityMap(preset, { ...mapOptions, ki: 0.2 * g.kp }, 100),
  1,
  31,
)
const simMs = time(
  () => simulate(preset, g, { duration: 10, nudge: { time: 5, speed: 0.1 } }),
  1,
  25,
)

// A logged run to fit: the kit rig at 100 Hz, 10 s, a setpoint step at 1 s, the "real" rig 20 %
// livelier with a 30 % slower servo than measured, and ±1 mm of deterministic noise.
const logRig: Rig = { ...preset, loopRate: 100 }
const logGains = planGains(logRig, DEFAULT_TARGETS).gains ?? g
const truth = simulate(logRig, logGains, {
  duration: 10,
  setpointTime: 1,
  outputEvery: 1,
  kbScale: 1.2,
  servoLagScale: 1.3,
})
const log: RunSample[] = []
for (let i = 0; i < truth.t.length; i++) {
  const t = truth.t[i]!
  if (log.length > 0 && t - log[log.length - 1]!.t < 0.01 - 1e-9) continue
  log.push({
    t,
    position: truth.x[i]! + 0.001 * (2 * random() - 1),
    setpoint: truth.setpoint[i]!,
    command: truth.command[i]!,
  })
}
const fitMs = time(() => fitRun(logRig, logGains, log), 1, 9)

/** The page engineer's Chromium keystroke benchmark, when it is in this tree. */
async function keystroke(): Promise<{ medianMs: number, p95Ms: number, samples: number } | null> {
  const file = fileURLToPath(new URL('./keystroke.ts', import.meta.url))
  if (!existsSync(file)) return null
  try {
    const mod = (await import(file)) as {
      measureKeystroke?: () => Promise<{ medianMs: number, p95Ms: number, samples: number }>
    }
    return mod.measureKeystroke ? await mod.measureKeystroke() : null
  } catch (error) {
    console.log(`(keystroke benchmark did not run: ${(error as Error).message})`)
    return null
  }
}
const key = await keystroke()

const rows: [string, number | null, string][] = [
  ['analyzeLoop, per rig (200 random rigs)', median(analyzePerRig), '< 0.1 ms'],
  ['planGains, per rig (200 random rigs)', median(planPerRig), ''],
  ['stabilityMap 100×100, PD (classroom rig)', mapMs, '≤ 16 ms'],
  ['stabilityMap 100×100, PID (classroom rig)', pidMapMs, '≤ 16 ms'],
  ['simulate, 10 s nonlinear (classroom rig)', simMs, ''],
  [`fitRun, 10 s log at 100 Hz (${log.length} samples)`, fitMs, '< 200 ms'],
  [
    key ? `keystroke → results, Chromium (${key.samples} keystrokes)` : 'keystroke → results',
    key ? key.medianMs : null,
    '≤ 50 ms',
  ],
]
const width = Math.max(...rows.map(r => r[0].length))
console.log(`${'Gain Planner benchmark'.padEnd(width)}  median ms   target`)
for (const [name, ms, target] of rows) {
  const figure = ms === null ? 'not run' : ms.toFixed(ms < 1 ? 4 : 2)
  console.log(`${name.padEnd(width)}  ${figure.padStart(9)}   ${target}`)
}
console.log(
  `(analyzeLoop per rig: fastest ${Math.min(...analyzePerRig).toFixed(4)} ms, slowest `
  + `${Math.max(...analyzePerRig).toFixed(4)} ms)`,
)
if (key) console.log(`(keystroke p95: ${key.p95Ms.toFixed(1)} ms)`)
else console.log('(keystroke: bench/keystroke.ts is not in this tree, or Chromium did not start)')
