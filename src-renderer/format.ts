// Number formatting for tables, fields and exports (display only).

/** The minus sign U+2212 for every hyphen-minus in a written number ("-1.5e-3" → "−1.5e−3"). */
export const minus = (text: string): string => text.replace(/-/g, '\u2212')

/**
 * A number with `digits` significant digits, plain notation where sensible, no trailing zeros; negative numbers and
 * exponents with the minus sign U+2212 (the fields' readers take it back).
 */
export function num(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a >= 1e-3 && a < 1e6) return minus(String(Number(x.toPrecision(digits))))
  return minus(x.toExponential(digits - 1).replace(/\.?0+e/, 'e').replace('e+', 'e'))
}

/** A fixed number of decimals (ω, g and the like), with the minus sign U+2212; −0.00 is written 0.00. */
export const fixed = (x: number | null | undefined, decimals = 3): string => {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  const t = x.toFixed(decimals)
  return /^-0\.?0*$/.test(t) ? t.slice(1) : minus(t)
}

/** A diameter in µm, written in nm below 1 µm, with `digits` significant digits. */
export function diameter(um: number, digits = 4): string {
  return um < 1 ? `${num(um * 1000, digits)} nm` : `${num(um, digits)} µm`
}

/** A signed number with its sign always shown (forcing, differences). */
export function signed(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  const s = num(x, digits)
  return x > 0 ? `+${s}` : s
}

/** A file-name-safe version of a title. */
export function fileStem(title: string): string {
  return (
    title
      .normalize('NFKD')
      .replace(/[^\w\s.-]/g, '')
      .trim()
      .replace(/\s+/g, '-')
      .slice(0, 60) || 'motebench'
  )
}

const two = (x: number): string => String(x).padStart(2, '0')

/** A local date in ISO 8601 form, 2026-12-03. */
export function isoDate(d: Date): string {
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())}`
}

/** A local date and time to the minute, ISO 8601 order: 2026-12-03 17:40. */
export function isoDateTime(d: Date): string {
  return `${isoDate(d)} ${two(d.getHours())}:${two(d.getMinutes())}`
}
