// Roots of a real polynomial by the Aberth–Ehrlich simultaneous iteration (cubically convergent,
// all roots at once). Degree here is at most 7, so a few dozen iterations suffice.
import type { Polynomial } from './plant'

export interface Complex {
  re: number
  im: number
}

/** All complex roots of the polynomial (highest power first). */
export function polynomialRoots(poly: Polynomial): Complex[] {
  let p = poly
  while (p.length > 1 && p[0] === 0) p = p.slice(1)
  const n = p.length - 1
  if (n < 1) return []
  const lead = p[0]!
  const c = p.map(x => x / lead)
  // Fujiwara's bound on the root moduli sets the starting circle.
  let radius = 0
  for (let k = 1; k <= n; k++) radius = Math.max(radius, Math.abs(c[k]!) ** (1 / k))
  radius = Math.max(2 * radius, 1e-300)
  const re = new Float64Array(n)
  const im = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    const a = (2 * Math.PI * k) / n + 0.4
    re[k] = radius * Math.cos(a)
    im[k] = radius * Math.sin(a)
  }
  for (let iter = 0; iter < 500; iter++) {
    let moved = 0
    for (let i = 0; i < n; i++) {
      // Horner for p and p' at z_i
      let pr = 1
      let pi = 0
      let dr = 0
      let di = 0
      const zr = re[i]!
      const zi = im[i]!
      for (let k = 1; k <= n; k++) {
        const ndr = dr * zr - di * zi + pr
        const ndi = dr * zi + di * zr + pi
        dr = ndr
        di = ndi
        const npr = pr * zr - pi * zi + c[k]!
        const npi = pr * zi + pi * zr
        pr = npr
        pi = npi
      }
      if (pr === 0 && pi === 0) continue
      // ratio = p/p'
      const dd = dr * dr + di * di
      const rr = dd > 0 ? (pr * dr + pi * di) / dd : pr
      const ri = dd > 0 ? (pi * dr - pr * di) / dd : pi
      let sr = 0
      let si = 0
      for (let j = 0; j < n; j++) {
        if (j === i) continue
        const xr = zr - re[j]!
        const xi = zi - im[j]!
        const xd = xr * xr + xi * xi
        if (xd === 0) continue
        sr += xr / xd
        si += -xi / xd
      }
      // w = ratio / (1 − ratio·s)
      const br = 1 - (rr * sr - ri * si)
      const bi = -(rr * si + ri * sr)
      const bd = br * br + bi * bi
      const wr = (rr * br + ri * bi) / bd
      const wi = (ri * br - rr * bi) / bd
      re[i] = zr - wr
      im[i] = zi - wi
      moved = Math.max(moved, Math.hypot(wr, wi) / Math.max(Math.hypot(re[i]!, im[i]!), 1e-300))
    }
    if (moved < 1e-15) break
  }
  const out: Complex[] = []
  for (let k = 0; k < n; k++) out.push({ re: re[k]!, im: im[k]! })
  return out
}
