/**
 * Numbers in messages, written as a person reads them: about four significant digits (never fewer than the
 * whole-number digits, so 24753.82 reads "24 754", not "24 750"), large whole parts grouped by threes with a
 * narrow space, and e-notation (as it would be typed) outside 1e-4 … 1e9.
 */

/** The narrow no-break space that groups the digits of large numbers (SI practice). */
export const DIGIT_GROUP = '\u202f'

/** `x` for a message: `digits` significant digits (default 4), no trailing zeros, grouped from 10 000 up. */
export function readableNumber(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x)
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a < 1e-4 || a >= 1e9) return x.toExponential(digits - 1).replace(/\.?0+e/, 'e').replace('e+', 'e')
  const whole = Math.floor(Math.log10(a)) + 1
  const text = whole > digits ? String(Math.round(x)) : String(Number(x.toPrecision(digits)))
  const [int, frac] = text.split('.')
  const sign = int.startsWith('-') ? '−' : ''
  const digitsOnly = int.replace('-', '')
  const grouped = digitsOnly.length > 4 ? digitsOnly.replace(/\B(?=(\d{3})+$)/g, DIGIT_GROUP) : digitsOnly
  return `${sign}${grouped}${frac ? `.${frac}` : ''}`
}

/**
 * `x` for a message beside a limit it broke: as `readableNumber`, with more digits where four would make it
 * read as the limit itself (a GSD of 0.99999 must not read "1" in "must be greater than 1").
 */
export function readableBeside(x: number, ...limits: number[]): string {
  for (let d = 4; d < 17; d++) {
    const t = readableNumber(x, d)
    if (!limits.some((l) => l !== x && readableNumber(l, d) === t)) return t
  }
  return String(x)
}

/** A range for a message: "0–10", "180–330 K". */
export function readableRange(lo: number, hi: number, unit = ''): string {
  return `${readableNumber(lo)}–${readableNumber(hi)}${unit ? ` ${unit}` : ''}`
}
