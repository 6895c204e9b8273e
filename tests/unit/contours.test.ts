import { describe, expect, it } from 'vitest'
import { contourSegments } from '../../shared/utils/contours'

describe('contourSegments', () => {
  it('traces the level line of a plane through the grid', () => {
    // v = x + y on a 3×3 grid; the line v = 1 runs from (1, 0) to (0, 1).
    const xs = [0, 1, 2],
      ys = [0, 1, 2]
    const grid = ys.map(y => xs.map(x => x + y))
    const segs = contourSegments(grid, xs, ys, 1.5)
    expect(segs.length).toBeGreaterThan(0)
    for (const s of segs) {
      expect(s.x1 + s.y1).toBeCloseTo(1.5, 12)
      expect(s.x2 + s.y2).toBeCloseTo(1.5, 12)
    }
  })

  it('skips cells with a missing value and finds nothing when the level is out of range', () => {
    expect(
      contourSegments(
        [
          [0, 1],
          [null, 3],
        ],
        [0, 1],
        [0, 1],
        0.5,
      ),
    ).toEqual([])
    expect(
      contourSegments(
        [
          [0, 1],
          [2, 3],
        ],
        [0, 1],
        [0, 1],
        10,
      ),
    ).toEqual([])
  })

  it('gives two segments in a saddle cell', () => {
    expect(
      contourSegments(
        [
          [1, 0],
          [0, 1],
        ],
        [0, 1],
        [0, 1],
        0.5,
      ),
    ).toHaveLength(2)
  })
})
