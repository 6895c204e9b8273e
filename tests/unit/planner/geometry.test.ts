import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG } from './fixtures'
import {
  beamAngleRange,
  leverBeamAngle,
  leverRatioAt,
  leverServoAngle,
  reachableServoRange,
  type LeverGeometry,
} from '../../../shared/utils/planner'

const g: LeverGeometry = { leverArm: 0.025, pivotToLink: 0.2, pushrodLength: 0.1 }

/** |B − P| for the linkage at (θ, α): should equal the pushrod length. */
function rodLength(theta: number, alpha: number, geo: LeverGeometry) {
  const bx = geo.pivotToLink * Math.cos(alpha)
  const by = geo.pivotToLink * Math.sin(alpha)
  const px = geo.pivotToLink - geo.leverArm + geo.leverArm * Math.cos(theta)
  const py = -geo.pushrodLength + geo.leverArm * Math.sin(theta)
  return Math.hypot(bx - px, by - py)
}

describe('exact lever geometry', () => {
  it('is level at θ = 0 and keeps the pushrod length over the travel', () => {
    expect(leverBeamAngle(0, g)).toBeCloseTo(0, 14)
    for (let deg = -90; deg <= 90; deg += 15) {
      const theta = (deg * Math.PI) / 180
      const alpha = leverBeamAngle(theta, g)!
      expect(rodLength(theta, alpha, g)).toBeCloseTo(g.pushrodLength, 12)
    }
  })

  it('tilts the beam the way the horn turns, with slope d/L_a at level', () => {
    expect(leverBeamAngle(0.3, g)!).toBeGreaterThan(0)
    expect(leverBeamAngle(-0.3, g)!).toBeLessThan(0)
    expect(leverRatioAt(0, g)).toBeCloseTo(g.leverArm / g.pivotToLink, 6)
  })

  it('inverts: servo angle for a beam angle, on the branch through level', () => {
    for (const theta of [-1.5, -0.4, 0, 0.2, 0.9, 1.2]) {
      const alpha = leverBeamAngle(theta, g)!
      expect(leverServoAngle(alpha, g)).toBeCloseTo(theta, 9)
    }
  })

  it('reports a linkage that cannot reach as null, and the reachable range', () => {
    // A pushrod shorter than the horn swing cannot follow the horn over the top.
    const short: LeverGeometry = { leverArm: 0.03, pivotToLink: 0.2, pushrodLength: 0.02 }
    expect(leverBeamAngle(Math.PI / 2, short)).toBeNull()
    const [lo, hi] = reachableServoRange(short, Math.PI / 2)
    expect(hi).toBeLessThan(Math.PI / 2)
    expect(lo).toBeGreaterThan(-Math.PI / 2)
    expect(leverBeamAngle(hi, short)).not.toBeNull()
    expect(leverBeamAngle(hi + 1e-6, short)).toBeNull()
  })

  it('finds where the linkage folds back: past it more servo angle tilts the beam less', () => {
    const r = beamAngleRange(REFERENCE_RIG) // d = 25 mm, L_a = 200 mm, ℓ = 100 mm
    expect(r.maxAtServoAngle).toBeGreaterThan(1)
    expect(r.maxAtServoAngle).toBeLessThan(Math.PI / 2)
    expect(leverRatioAt(r.maxAtServoAngle, g)!).toBeCloseTo(0, 5)
    expect(leverBeamAngle(r.maxAtServoAngle, g)!).toBeCloseTo(r.max, 12)
    expect(leverBeamAngle(Math.PI / 2, g)!).toBeLessThan(r.max)
    expect(leverRatioAt(r.maxAtServoAngle - 0.1, g)!).toBeGreaterThan(0)
    expect(leverRatioAt(r.maxAtServoAngle + 0.1, g)!).toBeLessThan(0)
  })

  it('gives the beam angle limit of a kit rig, below the small-angle estimate', () => {
    const r = beamAngleRange(REFERENCE_RIG)
    expect(r.reachable).toBe(true)
    expect(r.smallAngle).toBeCloseTo((0.025 / 0.2) * (Math.PI / 2), 12)
    expect(r.max).toBeGreaterThan(0)
    expect(r.max).toBeLessThan(r.smallAngle)
    expect(r.min).toBeLessThan(0)
  })

  it('uses θ/N_g for a direct drive', () => {
    const r = beamAngleRange({ ...REFERENCE_RIG, drive: 'direct', gearRatio: 30 })
    expect(r.max).toBeCloseTo(Math.PI / 2 / 30, 14)
  })
})
