// The demo catalog: Tiltwright's own invented kits and parts, their classroom tiers and
// production batches. Prices are integer cents; drawings live in public/catalog/.
import type { ProductSpec } from '../server/database/schema'

export interface DemoProduct {
  slug: string
  name: string
  kind: 'kit' | 'part'
  summary: string
  description: string
  specs: ProductSpec[]
  image: string
  weightGrams: number
  tiers: [minQuantity: number, unitPriceCents: number][]
  batches: [code: string, quantityBuilt: number, builtOn: string][]
}

const spec = (label: string, value: string): ProductSpec => ({ label, value })

export const DEMO_CATALOG: DemoProduct[] = [
  {
    slug: 'rig-kit',
    name: 'Classroom Rig Kit',
    kind: 'kit',
    image: '/catalog/rig-kit.svg',
    weightGrams: 2100,
    summary:
      'Everything one bench needs to build a ball-on-beam rig: a 40 cm beam, pivot stand, '
      + 'servo, lever arm, two-rail track, sensor board and steel balls.',
    description:
      'The kit a class builds in three to four lessons. The beam is an aluminium channel on a '
      + 'ball-bearing pivot; a metal-gear servo tilts it through an adjustable lever arm and '
      + 'pushrod. The ball rolls on a resistive two-rail track read by the sensor board, which '
      + 'any 3.3 V or 5 V microcontroller reads on one analog pin. Sample PD firmware and the '
      + 'Gain Planner get the ball to settle on the first day of tuning.',
    specs: [
      spec('Beam', '40 cm aluminium channel, 0.2 kg'),
      spec('Pivot', 'Centre pivot on two 608 ball bearings'),
      spec('Servo', 'TW-S20 metal gear, 20 kg·cm at 6 V'),
      spec('Lever arm', '12–30 mm adjustable, 3 holes'),
      spec('Sensor', 'Two-rail resistive track, 0–3.3 V across 36 cm'),
      spec('Balls', '3 × 19 mm chrome steel'),
      spec('Power', '6 V 3 A supply (sold separately)'),
      spec('Build time', '3–4 lessons of 50 minutes'),
    ],
    tiers: [
      [1, 14900],
      [5, 13400],
      [12, 11900],
    ],
    batches: [
      ['RK-07', 40, '2026-09-14'],
      ['RK-08', 60, '2026-10-20'],
    ],
  },
  {
    slug: 'long-beam-kit',
    name: 'Long-Beam Rig Kit',
    kind: 'kit',
    image: '/catalog/long-beam-kit.svg',
    weightGrams: 2900,
    summary:
      'The classroom rig with a 60 cm beam: slower dynamics, more room for the ball, and a '
      + 'harder tuning problem for older students.',
    description:
      'Everything in the Classroom Rig Kit with a 60 cm beam and a longer rail track. The '
      + 'extra length lowers the natural frequency of the ball on the beam and makes integral '
      + 'action worth its while, which suits upper-school control projects.',
    specs: [
      spec('Beam', '60 cm aluminium channel, 0.3 kg'),
      spec('Servo', 'TW-S20 metal gear, 20 kg·cm at 6 V'),
      spec('Lever arm', '12–30 mm adjustable'),
      spec('Sensor', 'Two-rail resistive track across 56 cm'),
      spec('Balls', '3 × 25 mm chrome steel'),
      spec('Build time', '4 lessons of 50 minutes'),
    ],
    tiers: [
      [1, 17900],
      [5, 16200],
      [12, 14500],
    ],
    batches: [['LB-03', 24, '2026-10-02']],
  },
  {
    slug: 'steel-balls',
    name: 'Steel Ball Set',
    kind: 'part',
    image: '/catalog/steel-balls.svg',
    weightGrams: 220,
    summary:
      'Six chrome-steel balls: three of 19 mm and three of 25 mm, for comparing how mass and '
      + 'size change the response.',
    description:
      'Spares for the balls that roll under the radiator. Keep them away from young children: '
      + 'they are a choking hazard.',
    specs: [
      spec('Contents', '3 × 19 mm, 3 × 25 mm'),
      spec('Material', 'Chrome steel, polished'),
      spec('Masses', '28 g and 64 g each'),
    ],
    tiers: [
      [1, 950],
      [10, 800],
      [30, 675],
    ],
    batches: [['SB-21', 300, '2026-08-30']],
  },
  {
    slug: 'rail-track',
    name: 'Two-Rail Sensor Track',
    kind: 'part',
    image: '/catalog/rail-track.svg',
    weightGrams: 180,
    summary:
      'A replacement 36 cm resistive two-rail track for the 40 cm beam, pre-wired with a '
      + 'three-pin lead.',
    description:
      'One rail is a resistive strip, the other a conductive return; the ball bridges them '
      + 'and the voltage at the wiper reads its position. Fits the Classroom Rig Kit beam.',
    specs: [
      spec('Length', '36 cm active'),
      spec('Resistance', '10 kΩ end to end'),
      spec('Lead', '3-pin, 30 cm'),
    ],
    tiers: [
      [1, 2400],
      [5, 2100],
      [12, 1850],
    ],
    batches: [['RT-11', 80, '2026-09-05']],
  },
  {
    slug: 'servo-s20',
    name: 'TW-S20 Metal-Gear Servo',
    kind: 'part',
    image: '/catalog/servo-s20.svg',
    weightGrams: 90,
    summary:
      'The rig’s servo: metal gears, 20 kg·cm at 6 V, with a 25-tooth output spline that fits '
      + 'our lever arms.',
    description:
      'A spare or upgrade servo. Its stall current reaches 2.5 A: power it from the 6 V 3 A '
      + 'bench supply, not from a laptop USB port.',
    specs: [
      spec('Torque', '20 kg·cm at 6 V'),
      spec('Speed', '0.16 s / 60° at 6 V'),
      spec('Stall current', '2.5 A at 6 V'),
      spec('Spline', '25 teeth'),
    ],
    tiers: [
      [1, 1900],
      [10, 1650],
      [30, 1425],
    ],
    batches: [['SV-14', 120, '2026-09-22']],
  },
  {
    slug: 'lever-arm',
    name: 'Lever Arm and Pushrod Set',
    kind: 'part',
    image: '/catalog/lever-arm.svg',
    weightGrams: 60,
    summary:
      'An adjustable aluminium servo arm with three holes (12, 20 and 30 mm) and a ball-link '
      + 'pushrod.',
    description:
      'Changing the hole changes the gain from servo angle to beam angle; the Gain Planner '
      + 'asks which one you use.',
    specs: [
      spec('Holes', '12, 20 and 30 mm from the spline'),
      spec('Pushrod', 'M3 threaded, 90 mm, two ball links'),
    ],
    tiers: [
      [1, 750],
      [10, 625],
    ],
    batches: [['LA-09', 150, '2026-07-18']],
  },
  {
    slug: 'sensor-board',
    name: 'Rail Sensor Board',
    kind: 'part',
    image: '/catalog/sensor-board.svg',
    weightGrams: 40,
    summary:
      'The small board that conditions the rail signal: a buffered, low-pass filtered 0–3.3 V '
      + 'output for any microcontroller.',
    description:
      'Includes a first-order filter at about 150 Hz to tame contact noise as the ball rolls, '
      + 'and a pull-down so a lifted ball reads as zero rather than floating.',
    specs: [
      spec('Output', '0–3.3 V buffered'),
      spec('Filter', 'First order, about 150 Hz'),
      spec('Supply', '3.3 V or 5 V'),
    ],
    tiers: [
      [1, 1200],
      [10, 1040],
    ],
    batches: [['SN-05', 90, '2026-09-01']],
  },
  {
    slug: 'power-supply',
    name: '6 V 3 A Bench Supply',
    kind: 'part',
    image: '/catalog/power-supply.svg',
    weightGrams: 320,
    summary:
      'A desk power supply sized for the servo’s stall current, with a barrel lead and a '
      + 'screw-terminal adapter.',
    description:
      'Short-circuit protected; an LED shows when it is on. Switch off at the wall before '
      + 'adjusting the linkage.',
    specs: [
      spec('Output', '6 V DC, 3 A'),
      spec('Input', '100–240 V AC'),
      spec('Lead', '1.5 m, 5.5/2.1 mm barrel and terminal adapter'),
    ],
    tiers: [
      [1, 2200],
      [5, 1980],
      [12, 1760],
    ],
    batches: [['PS-04', 70, '2026-08-12']],
  },
]
