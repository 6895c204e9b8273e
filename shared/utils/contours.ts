// Iso-lines of a value sampled on a grid (marching squares, one segment per crossed cell),
// for drawing margin contours over the stability map. Cells with a missing corner are skipped.
export interface Segment {
  x1: number
  y1: number
  x2: number
  y2: number
}

/** grid[row][col] is the value at (xs[col], ys[row]); returns segments in x/y units. */
export function contourSegments(
  grid: (number | null)[][],
  xs: number[],
  ys: number[],
  level: number,
): Segment[] {
  const out: Segment[] = []
  const lerp = (a: number, b: number, va: number, vb: number) =>
    a + ((level - va) / (vb - va)) * (b - a)
  for (let r = 0; r + 1 < ys.length; r++) {
    for (let c = 0; c + 1 < xs.length; c++) {
      const v00 = grid[r]?.[c],
        v01 = grid[r]?.[c + 1],
        v10 = grid[r + 1]?.[c],
        v11 = grid[r + 1]?.[c + 1]
      if (v00 == null || v01 == null || v10 == null || v11 == null) continue
      const x0 = xs[c]!,
        x1 = xs[c + 1]!,
        y0 = ys[r]!,
        y1 = ys[r + 1]!
      // Crossing points on the cell's four edges (bottom, right, top, left).
      const pts: [number, number][] = []
      if ((v00 < level) !== (v01 < level)) pts.push([lerp(x0, x1, v00, v01), y0])
      if ((v01 < level) !== (v11 < level)) pts.push([x1, lerp(y0, y1, v01, v11)])
      if ((v10 < level) !== (v11 < level)) pts.push([lerp(x0, x1, v10, v11), y1])
      if ((v00 < level) !== (v10 < level)) pts.push([x0, lerp(y0, y1, v00, v10)])
      if (pts.length === 2)
        out.push({ x1: pts[0]![0], y1: pts[0]![1], x2: pts[1]![0], y2: pts[1]![1] })
      else if (pts.length === 4) {
        // A saddle: pair the crossings by the cell's mean, the usual disambiguation.
        const centreAbove = (v00 + v01 + v10 + v11) / 4 >= level
        const [b, ri, t, l] = pts as [
          [number, number],
          [number, number],
          [number, number],
          [number, number],
        ]
        const pairs: [[number, number], [number, number]][]
          = (v00 >= level) === centreAbove
            ? [
                [b, ri],
                [t, l],
              ]
            : [
                [b, l],
                [t, ri],
              ]
        for (const [p, q] of pairs) out.push({ x1: p[0], y1: p[1], x2: q[0], y2: q[1] })
      }
    }
  }
  return out
}
