/** A short human number: `digits` significant figures, no trailing zeros. */
export function fmt(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return String(value)
  return String(Number(value.toPrecision(digits)))
}
