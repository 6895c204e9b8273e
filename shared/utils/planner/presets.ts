// Tiltwright's own kit options, as rigs the planner can start from, and the default targets.
import type { Rig, Targets } from './schema'

export interface KitPreset {
  id: string
  name: string
  description: string
  rig: Rig
}

const DEG = Math.PI / 180

/** Common to every kit: a 19 mm solid steel ball, 10-bit ADC, 50 Hz loop, 0.12 s/60° servo with 180° travel. */
const KIT_COMMON = {
  drive: 'lever',
  ballDiameter: 0.019,
  ballShell: 'solid',
  ballMaterial: 'steel',
  railGap: 0.01,
  servoSecondsPer60: 0.12,
  servoTravel: 180 * DEG,
  servoType: 'analog',
  loopRate: 50,
  adcBits: 10,
  pushrodLength: 0.1,
} as const satisfies Partial<Rig>

export const KIT_PRESETS: readonly KitPreset[] = [
  {
    id: 'classroom-400',
    name: 'Classroom rig, 400 mm beam, 25 mm horn',
    description: 'Centre pivot, pushrod at the beam end (200 mm from the pivot), 25 mm servo horn.',
    rig: { ...KIT_COMMON, beamLength: 0.4, pivotToLink: 0.2, leverArm: 0.025 },
  },
  {
    id: 'classroom-400-gentle',
    name: 'Classroom rig, 400 mm beam, 18 mm horn',
    description: 'The classroom rig with the short horn: a gentler beam for first tuning sessions.',
    rig: { ...KIT_COMMON, beamLength: 0.4, pivotToLink: 0.2, leverArm: 0.018 },
  },
  {
    id: 'long-beam-600',
    name: 'Long-beam rig, 600 mm beam, 25 mm horn',
    description: 'Centre pivot, pushrod at the beam end (300 mm from the pivot), 25 mm servo horn.',
    rig: { ...KIT_COMMON, beamLength: 0.6, pivotToLink: 0.3, leverArm: 0.025 },
  },
  {
    id: 'compact-300',
    name: 'Compact rig, 300 mm beam, 20 mm horn',
    description: 'End pivot, pushrod 280 mm from the pivot, 20 mm servo horn: fits a small bench.',
    rig: { ...KIT_COMMON, beamLength: 0.3, pivotToLink: 0.28, leverArm: 0.02 },
  },
]

export const DEFAULT_TARGETS: Targets = {
  overshootPct: 10,
  settlingTime: 3.5,
  form: 'PD',
  derivativeFilterN: 10,
  method: 'lag-aware',
  derivativeOn: 'measurement',
}
