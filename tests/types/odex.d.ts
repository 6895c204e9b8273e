/* eslint-disable @typescript-eslint/no-invalid-void-type -- odex's own signatures */
// The slice of odex's API the tests use. odex ships TypeScript sources that do not pass this
// project's strict checks, so the type-checker reads this declaration instead (see the
// `paths` entry in nuxt.config.ts). odex itself is unchanged and runs as published.
export type Derivative = (x: number, y: number[]) => number[]
export type OutputFunction = (xBest: number, y: number[]) => boolean | void
export interface SolverResult {
  x: number
  y: number[]
  outcome: number
  nStep: number
  nAccept: number
  nReject: number
  nEval: number
}
export class Solver {
  constructor(n: number)
  absoluteTolerance: number | number[]
  relativeTolerance: number | number[]
  maxSteps: number
  denseOutput: boolean
  solve(
    f: Derivative,
    x: number,
    y0: number[],
    xEnd: number,
    solOut?: (
      n: number,
      xOld: number,
      x: number,
      y: number[],
      dense?: (c: number, x: number) => number,
    ) => boolean | void,
  ): SolverResult
  grid(
    dt: number,
    out: OutputFunction,
  ): (
    n: number,
    xOld: number,
    x: number,
    y: number[],
    dense?: (c: number, x: number) => number,
  ) => boolean | void
}
