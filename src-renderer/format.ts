// Number formatting for tables, fields and exports (display only).

/** A number with `digits` significant digits, plain notation where sensible, no trailing zeros. */
export function num(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(digits)))
  return x.toExponential(digits - 1).replace(/\.?0+e/, 'e').replace('e+', 'e')
}

/** A fixed number of decimals (ω, g and the like). */
export const fixed = (x: number | null | undefined, decimals = 3): string =>
  x === null || x === undefined || !Number.isFinite(x) ? '—' : x.toFixed(decimals)

/** A diameter in µm, written in nm below 1 µm, with `digits` significant digits. */
export function diameter(um: number, digits = 4): string {
  return um < 1 ? `${num(um * 1000, digits)} nm` : `${num(um, digits)} µm`
}

/** A signed number with its sign always shown (forcing, differences). */
export function signed(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  const s = num(x, digits)
  return x > 0 ? `+${s}` : s.replace('-', '−')
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
