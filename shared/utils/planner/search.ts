// One-dimensional search: golden-section minimisation of a unimodal function on [a, b]
// (Press et al., Numerical Recipes, "Golden Section Search in One Dimension").

/** The x in [a, b] where f is smallest, to within `tolerance`, for f unimodal there. */
export function goldenMinimum(
  f: (x: number) => number,
  a: number,
  b: number,
  tolerance: number,
): number {
  const r = (Math.sqrt(5) - 1) / 2
  let lo = a
  let hi = b
  let c = hi - r * (hi - lo)
  let d = lo + r * (hi - lo)
  let fc = f(c)
  let fd = f(d)
  while (hi - lo > tolerance) {
    if (fc < fd) {
      hi = d
      d = c
      fd = fc
      c = hi - r * (hi - lo)
      fc = f(c)
    } else {
      lo = c
      c = d
      fc = fd
      d = lo + r * (hi - lo)
      fd = f(d)
    }
  }
  return (lo + hi) / 2
}
