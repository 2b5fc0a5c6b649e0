// Invented sizer files made from a known size distribution (lognormal modes in volume-equivalent diameter), for the
// merge tests and the demo files in resources/field. Each instrument's bins are laid out in its own diameter; their
// volume-equivalent edges are found here by bisection on the FORWARD conversions (mobilityDiameter,
// aerodynamicDiameter), so the files do not rest on the inverse functions that `merge` uses. Each bin holds the
// exact number of the modes between those edges (lognormal CDF through erfc), as dN/dlogDp of its own diameter.
import { edgesFromMidpoints, erfc, fromVolumeEquivalent, type ConversionSettings } from '../../src-core/index.ts'

export interface Mode {
  /** cm⁻³ */
  n: number
  /** count median diameter, µm (volume-equivalent) */
  cmdUm: number
  gsd: number
}

/** Number of particles (cm⁻³) of the modes with lo < d_ve < hi (µm). */
export function numberBetween(modes: readonly Mode[], lo: number, hi: number): number {
  let s = 0
  for (const m of modes) {
    const z = (d: number) => Math.log(d / m.cmdUm) / (Math.SQRT2 * Math.log(m.gsd))
    // P(lo < D < hi) = ½[erfc(z(lo)) − erfc(z(hi))], accurate in both tails
    s += 0.5 * m.n * (erfc(z(lo)) - erfc(z(hi)))
  }
  return s
}

/** Log-spaced midpoints from a to b (any unit), `perDecade` a decade. */
export function logMidpoints(a: number, b: number, perDecade: number): number[] {
  const n = Math.round(Math.log10(b / a) * perDecade)
  return Array.from({ length: n + 1 }, (_, i) => Number((a * Math.pow(b / a, i / n)).toPrecision(6)))
}

/** The volume-equivalent diameter (µm) whose native diameter is `native` (µm), by bisection on the forward conversion. */
export function veByBisection(kind: 'mobility' | 'aerodynamic', native: number, s: ConversionSettings): number {
  let lo = native / 10
  let hi = native * 10
  for (let i = 0; i < 200 && hi / lo - 1 > 1e-14; i++) {
    const mid = Math.sqrt(lo * hi)
    if (fromVolumeEquivalent(kind, mid, s) < native) lo = mid
    else hi = mid
  }
  return Math.sqrt(lo * hi)
}

/** dN/dlogDp (native diameter) of each bin of an instrument whose bin midpoints are `midpointsUm`. */
export function instrumentValues(kind: 'mobility' | 'aerodynamic', midpointsUm: readonly number[], modes: readonly Mode[], s: ConversionSettings): number[] {
  const e = edgesFromMidpoints(midpointsUm)
  const ve = Array.from(e, (d) => veByBisection(kind, d, s))
  return midpointsUm.map((_, j) => numberBetween(modes, ve[j], ve[j + 1]) / Math.log10(e[j + 1] / e[j]))
}

/** ISO times from `start` (ISO, with zone) every `stepS` seconds, `count` of them, without those for which `skip` says so. */
export function clock(start: string, stepS: number, count: number, skip: (t: Date) => boolean = () => false): string[] {
  const t0 = Date.parse(start)
  const out: string[] = []
  for (let i = 0; i < count; i++) {
    const t = new Date(t0 + i * stepS * 1000)
    if (!skip(t)) out.push(t.toISOString().replace('.000Z', 'Z'))
  }
  return out
}

/** A time-rows sizer file as the current reader takes it: metadata lines, then time and one column per bin. */
export function sizerFile(o: { title: string[]; unit: 'nm' | 'um'; midpointsUm: readonly number[]; times: readonly string[]; values: (t: string, i: number) => readonly number[] }): string {
  const scale = o.unit === 'nm' ? 1000 : 1
  const lines = [...o.title, `units: ${o.unit}`, 'quantity: dN/dlogDp', 'diameters: midpoints', '', ['time', ...o.midpointsUm.map((d) => String(Number((d * scale).toPrecision(6))))].join(',')]
  o.times.forEach((t, i) => lines.push([t, ...o.values(t, i).map((v) => String(Number(v.toPrecision(7))))].join(',')))
  return lines.join('\n') + '\n'
}

/** The invented test and demo aerosol: an accumulation mode and a coarse mode (volume-equivalent diameters). */
export const KNOWN_MODES: readonly Mode[] = [
  { n: 3000, cmdUm: 0.09, gsd: 1.7 },
  { n: 6, cmdUm: 1.2, gsd: 1.7 }
]
export const KNOWN_DENSITY = 1.8
export const KNOWN_SHAPE_FACTOR = 1.15
/** Mobility sizer 10–800 nm (mobility diameter), aerodynamic sizer 0.5–20 µm (aerodynamic diameter), 32 bins a decade. */
export const MOBILITY_MIDPOINTS_UM = logMidpoints(0.01, 0.8, 32)
export const AERODYNAMIC_MIDPOINTS_UM = logMidpoints(0.5, 20, 32)
