// The what-if envelope: the drawn response when the rig is not quite as measured (servo 30 %
// slower, plant gain ±30 %, one more sample of delay), as a band with the worst margins.
// CONTRACT STUB: only the nominal run.
import { analyzeLoop } from './analyze'
import type { Gains, Rig } from './schema'
import { simulate, type SimulateOptions } from './simulate'

export type WhatIfId = 'nominal' | 'servo-slower' | 'gain-low' | 'gain-high' | 'extra-delay'

export interface WhatIfVariant {
  id: WhatIfId
  label: string
  stable: boolean
  gainMarginDb: number | null
  phaseMarginDeg: number | null
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

export function whatIfEnvelope(
  rig: Rig,
  gains: Gains,
  options: SimulateOptions = {},
): WhatIfEnvelope {
  const run = simulate(rig, gains, options)
  const a = analyzeLoop(rig, gains, { discretization: options.discretization })
  const mm = run.x.map(v => v * 1000)
  return {
    t: run.t,
    lowerMm: mm,
    upperMm: mm,
    variants: [
      {
        id: 'nominal',
        label: 'as measured',
        stable: a.stable,
        gainMarginDb: a.gainMarginDb,
        phaseMarginDeg: a.phaseMarginDeg,
      },
    ],
    worstGainMarginDb: a.gainMarginDb,
    worstPhaseMarginDeg: a.phaseMarginDeg,
    allStable: a.stable,
  }
}
