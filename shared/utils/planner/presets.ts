// Tiltwright's own kit options, as rigs the planner can start from, and the default targets.
import type { Rig, Targets } from './schema'

export interface KitPreset {
  id: string
  name: string
  description: string
  rig: Rig
}

const DEG = Math.PI / 180

/**
 * What every Tiltwright kit ships (see the shop's catalog): the TW-S20 servo (0.16 s/60° at 6 V,
 * 180° travel), the adjustable lever arm (holes 12, 20 and 30 mm from the spline) with its 90 mm
 * pushrod, a centre pivot with the pushrod at the beam end, a 10-bit ADC, a 50 Hz loop.
 * The rail spacing (10 mm) is the kit track's; the sensed length is the track's, not the beam's.
 */
const KIT_COMMON = {
  drive: 'lever',
  ballShell: 'solid',
  ballMaterial: 'steel',
  railGap: 0.01,
  servoSecondsPer60: 0.16,
  servoTravel: 180 * DEG,
  servoType: 'analog',
  loopRate: 50,
  adcBits: 10,
  pushrodLength: 0.09,
} as const satisfies Partial<Rig>

const CLASSROOM = {
  ...KIT_COMMON,
  beamLength: 0.4,
  pivotToLink: 0.2,
  ballDiameter: 0.019,
  sensorLength: 0.36,
} as const
const LONG_BEAM = {
  ...KIT_COMMON,
  beamLength: 0.6,
  pivotToLink: 0.3,
  ballDiameter: 0.025,
  sensorLength: 0.56,
} as const

export const KIT_PRESETS: readonly KitPreset[] = [
  {
    id: 'classroom-20',
    name: 'Classroom Rig Kit, middle hole (20 mm)',
    description:
      '40 cm beam, centre pivot, pushrod at the beam end, lever arm in its 20 mm hole, 19 mm ball.',
    rig: { ...CLASSROOM, leverArm: 0.02 },
  },
  {
    id: 'classroom-12',
    name: 'Classroom Rig Kit, inner hole (12 mm)',
    description:
      'The classroom rig with the lever in its inner hole: a gentler beam for first tuning '
      + 'sessions.',
    rig: { ...CLASSROOM, leverArm: 0.012 },
  },
  {
    id: 'classroom-30',
    name: 'Classroom Rig Kit, outer hole (30 mm)',
    description:
      'The classroom rig with the lever in its outer hole: a livelier beam that needs smaller '
      + 'gains.',
    rig: { ...CLASSROOM, leverArm: 0.03 },
  },
  {
    id: 'long-beam-20',
    name: 'Long-Beam Rig Kit, middle hole (20 mm)',
    description:
      '60 cm beam, centre pivot, pushrod at the beam end, lever in its 20 mm hole, 25 mm ball.',
    rig: { ...LONG_BEAM, leverArm: 0.02 },
  },
]

export const DEFAULT_TARGETS: Targets = {
  overshootPct: 10,
  settlingTime: 5,
  form: 'PD',
  derivativeFilterN: 10,
  method: 'lag-aware',
  derivativeOn: 'measurement',
}
