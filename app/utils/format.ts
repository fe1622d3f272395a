/** A number to `digits` significant figures, without exponent notation for everyday magnitudes. */
export function sig(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const magnitude = Math.floor(Math.log10(Math.abs(value)))
  if (magnitude < -4 || magnitude >= 9) return value.toExponential(digits - 1)
  const decimals = Math.max(0, digits - 1 - magnitude)
  const rounded = Number(value.toPrecision(digits))
  return rounded.toLocaleString('en-US', { minimumFractionDigits: decimals, maximumFractionDigits: decimals })
}

/** A whole or decimal number with thousands separators and at most `decimals` decimals. */
export function fixed(value: number | null | undefined, decimals = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return value.toLocaleString('en-US', { maximumFractionDigits: decimals, minimumFractionDigits: 0 })
}
