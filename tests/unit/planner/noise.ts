// Seeded noise for the tests: mulberry32 (a small public-domain generator, common practice for
// reproducible tests) and Box–Muller for a standard normal variate.

export function seeded(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

export function gaussian(uniform: () => number): () => number {
  return () => {
    const u = Math.max(uniform(), 1e-12)
    const v = uniform()
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v)
  }
}
