// The what-if envelope: the drawn response when the rig is not quite as measured (servo 30 %
// slower, plant gain ±30 %, one more sample of delay), as a band with the worst margins
// (docs/planner-model.md, "What-if envelope"). Each variant is simulated with the same options
// as the prediction and analysed as the sampled loop the firmware runs.
import { analyzeLoop } from './analyze'
import type { Gains, Rig } from './schema'
import { simulate, type SimulateOptions } from './simulate'

export type WhatIfId = 'nominal' | 'servo-slower' | 'gain-low' | 'gain-high' | 'extra-delay'

/** How far the what-ifs move the rig: a fair guess of what a hand measurement misses. */
export const WHAT_IF_SCALE = 0.3

export interface WhatIfVariant {
  id: WhatIfId
  label: string
  stable: boolean
  gainMarginDb: number | null
  phaseMarginDeg: number | null
  /** The ball reached a beam end in this variant's run. */
  hitEnd: boolean
}

export interface WhatIfEnvelope {
  /** s, the nominal run's time axis. */
  t: number[]
  /** Ball position, mm: the lowest and highest of every variant at each time. */
  lowerMm: number[]
  upperMm: number[]
  variants: WhatIfVariant[]
  worstGainMarginDb: number | null
  worstPhaseMarginDeg: number | null
  allStable: boolean
}

interface WhatIf {
  id: WhatIfId
  label: string
  rig: (rig: Rig) => Rig
  sim: SimulateOptions
  extraDelaySamples: number
}

/** The rig with its plant gain K_b scaled: the lever arm (or the gear reduction) changed. */
function withPlantGain(rig: Rig, scale: number): Rig {
  return rig.drive === 'lever'
    ? { ...rig, leverArm: rig.leverArm * scale }
    : { ...rig, gearRatio: (rig.gearRatio ?? 1) / scale }
}

const pct = Math.round(WHAT_IF_SCALE * 100)
const WHAT_IFS: WhatIf[] = [
  { id: 'nominal', label: 'as measured', rig: r => r, sim: {}, extraDelaySamples: 0 },
  {
    id: 'servo-slower',
    label: `servo ${pct} % slower`,
    rig: r => ({ ...r, servoSecondsPer60: r.servoSecondsPer60 * (1 + WHAT_IF_SCALE) }),
    sim: { servoLagScale: 1 + WHAT_IF_SCALE },
    extraDelaySamples: 0,
  },
  {
    id: 'gain-low',
    label: `plant gain ${pct} % lower`,
    rig: r => withPlantGain(r, 1 - WHAT_IF_SCALE),
    sim: { kbScale: 1 - WHAT_IF_SCALE },
    extraDelaySamples: 0,
  },
  {
    id: 'gain-high',
    label: `plant gain ${pct} % higher`,
    rig: r => withPlantGain(r, 1 + WHAT_IF_SCALE),
    sim: { kbScale: 1 + WHAT_IF_SCALE },
    extraDelaySamples: 0,
  },
  {
    id: 'extra-delay',
    label: 'one more sample of delay',
    rig: r => r,
    sim: { extraDelaySamples: 1 },
    extraDelaySamples: 1,
  },
]

function worst(values: (number | null)[]): number | null {
  const known = values.filter((v): v is number => v !== null)
  return known.length ? Math.min(...known) : null
}

export function whatIfEnvelope(
  rig: Rig,
  gains: Gains,
  options: SimulateOptions = {},
): WhatIfEnvelope {
  const runs = WHAT_IFS.map((w) => {
    // the simulation scales the plant inside; the analysis sees the rig as changed
    const run = simulate(rig, gains, { ...options, ...w.sim })
    const a = analyzeLoop(w.rig(rig), gains, {
      discretization: options.discretization,
      extraDelaySamples: w.extraDelaySamples,
    })
    const variant: WhatIfVariant = {
      id: w.id,
      label: w.label,
      stable: a.stable,
      gainMarginDb: a.stable ? a.gainMarginDb : null,
      phaseMarginDeg: a.stable ? a.phaseMarginDeg : null,
      hitEnd: run.events.hitEnd,
    }
    return { run, variant }
  })
  const nominal = runs[0]!.run
  const lowerMm = nominal.x.map(v => v * 1000)
  const upperMm = [...lowerMm]
  for (const { run } of runs.slice(1)) {
    for (let i = 0; i < lowerMm.length; i++) {
      const v = run.x[i]! * 1000
      if (v < lowerMm[i]!) lowerMm[i] = v
      if (v > upperMm[i]!) upperMm[i] = v
    }
  }
  const variants = runs.map(r => r.variant)
  const allStable = variants.every(v => v.stable)
  return {
    t: nominal.t,
    lowerMm,
    upperMm,
    variants,
    worstGainMarginDb: allStable ? worst(variants.map(v => v.gainMarginDb)) : null,
    worstPhaseMarginDeg: allStable ? worst(variants.map(v => v.phaseMarginDeg)) : null,
    allStable,
  }
}
