// The glossary explains every result the planner shows (docs/planner-model.md §13).
import { describe, expect, it } from 'vitest'
import { PLANNER_GLOSSARY } from '../../../shared/utils/planner-glossary'

describe('PLANNER_GLOSSARY', () => {
  it('has a unique anchor and a plain sentence for every entry', () => {
    const ids = PLANNER_GLOSSARY.map(e => e.id)
    expect(new Set(ids).size).toBe(ids.length)
    for (const e of PLANNER_GLOSSARY) {
      expect(e.id).toMatch(/^[a-z]+(-[a-z]+)*$/)
      expect(e.meaning).toMatch(/^[A-Z].*\.$/s)
      expect(e.meaning).not.toMatch(/undefined|NaN|\$\{/)
    }
  })

  it('covers every result the page shows', () => {
    const ids = PLANNER_GLOSSARY.map(e => e.id)
    for (const id of [
      'gain-margin',
      'phase-margin',
      'continuous-stand-in',
      'extra-delay',
      'designed-for',
      'natural-frequency',
      'damping',
      'overshoot',
      'settling-time',
      'bandwidth',
      'sensitivity-peak',
      'gain-crossover',
      'phase-crossover',
      'soft-start',
      'derivative-filter',
      'discretization',
      'servo-deadband',
      'servo-steps',
      'jitter',
      'what-if-band',
      'run-fit',
    ])
      expect(ids, id).toContain(id)
  })

  it('takes its numbers from the model, not from memory', () => {
    const text = (id: string) => PLANNER_GLOSSARY.find(e => e.id === id)!.meaning
    expect(text('gain-margin')).toMatch(/Below 6 dB/)
    expect(text('phase-margin')).toMatch(/Below 30°/)
    expect(text('soft-start')).toMatch(/first 0\.5 s/)
    expect(text('loop-rate')).toMatch(/10 to 1000 Hz/)
    expect(text('calibration-residual')).toMatch(/0\.5 mm/)
  })
})
