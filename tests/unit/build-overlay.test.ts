import { describe, expect, it } from 'vitest'
import { overlayResponses } from '../../shared/utils/build-overlay'
import { planGains } from '../../shared/utils/planner/plan'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'

describe('overlay of several sheets', () => {
  const rig = KIT_PRESETS[0]!.rig
  const plan = planGains(rig, DEFAULT_TARGETS)
  const gains = plan.gains!
  const sheet = (title: string, kpScale: number) => ({
    title,
    inputs: { rig, targets: DEFAULT_TARGETS, gains: { ...gains, kp: gains.kp * kpScale } },
  })

  it('draws one curve per sheet from the same start through the same step', () => {
    const o = overlayResponses([sheet('planned', 1), sheet('softer', 0.6)])
    expect(o.curves.map(c => c.label)).toEqual(['planned', 'softer'])
    const step = o.setpoint.x[o.setpoint.x.length - 1]!
    expect(step).toBeGreaterThan(0)
    for (const c of o.curves) {
      expect(c.x[0]).toBeCloseTo(0, 6)
      expect(c.t.length).toBe(c.x.length)
      // The planned gains settle: the ball ends near the setpoint.
      expect(Math.abs(c.x[c.x.length - 1]! - step)).toBeLessThan(0.1 * step)
    }
    expect(o.curves[0]!.x).not.toEqual(o.curves[1]!.x)
  })

  it('gives nothing for no sheet', () => {
    expect(overlayResponses([]).curves).toEqual([])
  })
})
