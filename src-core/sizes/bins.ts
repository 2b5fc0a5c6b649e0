/**
 * Measured size distributions in bins (e.g. from a mobility sizer, an aerodynamic sizer or an optical particle counter).
 *
 * Canonical form: { edges (µm, strictly ascending, n+1 values), dNdlogD (cm⁻³, n values) }, where
 * dNdlogD[i] is dN/dlog₁₀D in bin i and — the one shape assumption — the number distribution is
 * flat in log D inside each bin (BIN_SHAPE). Every other quantity is an exact integral under that
 * assumption: the bin's k-th moment is
 *     dN/dlogD · ∫_{lo}^{hi} D^k dlog₁₀D = dN/dlogD · (hi^k − lo^k) / (k ln 10)   (k ≠ 0),
 * so conversions from dS/dlogDp or dV/dlogDp give the bin exactly the surface or volume it reported.
 *
 * Bin numbers in error messages count from 1 (the first bin is "bin 1").
 */
import { InputError } from '../errors.ts'
import { fmt, requirePositive } from './format.ts'

/** The shape assumed inside a bin, for results to quote. */
export const BIN_SHAPE =
  'Inside each bin the number distribution is taken as flat in log D (constant dN/dlogD between the bin edges); bin surfaces, volumes and masses are exact integrals under that assumption.'

/** Canonical binned distribution. edges in µm (n+1, strictly ascending), dNdlogD in cm⁻³ (n, >= 0). */
export interface SizeBins {
  readonly edges: Float64Array
  readonly dNdlogD: Float64Array
}

/** Diameter units accepted for bin diameters. 'um' is accepted as a spelling of 'µm'. */
export const DIAMETER_UNITS = ['nm', 'µm', 'um'] as const
export type DiameterUnit = (typeof DIAMETER_UNITS)[number]

/**
 * Quantities a measured bin value can be given as, with units:
 *  - 'dN/dlogDp'  cm⁻³            number per unit log₁₀ D
 *  - 'dN'         cm⁻³            number in the bin
 *  - 'dS/dlogDp'  µm² cm⁻³        surface per unit log₁₀ D (bin average: S_bin / Δlog₁₀D)
 *  - 'dV/dlogDp'  µm³ cm⁻³        volume per unit log₁₀ D (bin average)
 *  - 'dM/dlogDp'  µg m⁻³          mass per unit log₁₀ D (bin average; needs density in g cm⁻³)
 */
export const BIN_QUANTITIES = ['dN/dlogDp', 'dN', 'dS/dlogDp', 'dV/dlogDp', 'dM/dlogDp'] as const
export type BinQuantity = (typeof BIN_QUANTITIES)[number]

/** A measurement as read from a file, before conversion. */
export interface MeasuredBins {
  /** Bin diameters: n+1 edges or n midpoints (see `diameterKind`), in `diameterUnit`. */
  readonly diameters: ArrayLike<number>
  /** 'edges' (n+1 values, ascending) or 'midpoints' (n values, ascending). */
  readonly diameterKind: 'edges' | 'midpoints'
  readonly diameterUnit: DiameterUnit
  readonly quantity: BinQuantity
  /** n values of `quantity`, one per bin. */
  readonly values: ArrayLike<number>
  /** Particle density in g cm⁻³; required for 'dM/dlogDp'. */
  readonly density?: number
}

/** ∫_{lo}^{hi} D^k dlog₁₀D, exact, accurate also for narrow bins. lo, hi > 0. */
export function binPowerIntegral(lo: number, hi: number, k: number): number {
  const r = Math.log(hi / lo)
  if (k === 0) return r / Math.LN10
  // (hi^k − lo^k)/(k ln10) = lo^k · expm1(k r) / (k ln10)
  return (Math.pow(lo, k) * Math.expm1(k * r)) / (k * Math.LN10)
}

function binWhere(i: number, lo: number, hi: number, unit: string): string {
  return `bin ${i + 1} (${fmt(lo)}–${fmt(hi)} ${unit})`
}

function checkUnit(unit: unknown): number {
  if (unit === 'nm') return 1e-3
  if (unit === 'µm' || unit === 'um' || unit === 'μm') return 1 // µ micro sign, μ Greek mu
  throw new InputError('bin diameters: unit', `unknown diameter unit "${String(unit)}"`, `Use one of: ${DIAMETER_UNITS.map((u) => `'${u}'`).join(', ')}.`)
}

function checkQuantity(q: unknown): BinQuantity {
  if (typeof q === 'string' && (BIN_QUANTITIES as readonly string[]).includes(q)) return q as BinQuantity
  throw new InputError('bin values: quantity', `unknown quantity "${String(q)}"`, `Use one of: ${BIN_QUANTITIES.map((u) => `'${u}'`).join(', ')}.`)
}

/**
 * Edges from bin midpoints: inner edges at the geometric means √(m_i m_{i+1}) of neighbouring
 * midpoints; the outer edges mirrored in log D (lowest edge m₀² / e₁, highest m_{n−1}² / e_{n−1}),
 * so the first and last bins are as wide in log D as half-widths on their inner side.
 * For log-spaced midpoints this gives every bin the same log width. Needs >= 2 strictly ascending,
 * positive, finite midpoints (any unit; edges come back in the same unit).
 */
export function edgesFromMidpoints(midpoints: ArrayLike<number>, unit: string = 'µm'): Float64Array {
  const n = midpoints.length
  if (n < 2) {
    throw new InputError('bin midpoints', `${n} midpoint${n === 1 ? '' : 's'} given; edges can only be inferred from 2 or more`, 'Give the bin edges instead, or at least two midpoints.')
  }
  for (let i = 0; i < n; i++) {
    const m = midpoints[i]
    if (typeof m !== 'number' || !Number.isFinite(m)) {
      throw new InputError(`bin ${i + 1} (midpoint ${String(m)} ${unit})`, `the midpoint diameter is ${String(m)}, not a finite number`, 'Fix or remove this row.')
    }
    if (m <= 0) throw new InputError(`bin ${i + 1} (midpoint ${fmt(m)} ${unit})`, `the midpoint diameter ${fmt(m)} ${unit} is not positive`, 'Diameters must be greater than 0.')
    if (i > 0 && !(m > midpoints[i - 1])) {
      throw new InputError(
        `bin ${i + 1} (midpoint ${fmt(m)} ${unit})`,
        m === midpoints[i - 1]
          ? `the midpoint equals the one of bin ${i} (${fmt(midpoints[i - 1])} ${unit}), which gives a bin of zero width`
          : `the midpoint is below the one of bin ${i} (${fmt(midpoints[i - 1])} ${unit}); midpoints must be strictly ascending (unsorted or overlapping bins)`,
        'Sort the bins by diameter and remove duplicates.'
      )
    }
  }
  const e = new Float64Array(n + 1)
  for (let i = 1; i < n; i++) e[i] = Math.sqrt(midpoints[i - 1] * midpoints[i])
  e[0] = (midpoints[0] * midpoints[0]) / e[1]
  e[n] = (midpoints[n - 1] * midpoints[n - 1]) / e[n - 1]
  return e
}

function checkEdges(edges: ArrayLike<number>, unit: string): void {
  for (let i = 0; i < edges.length; i++) {
    const e = edges[i]
    if (typeof e === 'number' && Number.isFinite(e) && e > 0) continue
    const lo = i > 0 ? edges[i - 1] : e
    const hi = i < edges.length - 1 ? edges[i + 1] : e
    const where = i < edges.length - 1 ? binWhere(i, e, hi, unit) : binWhere(i - 1, lo, e, unit)
    if (typeof e !== 'number' || !Number.isFinite(e)) {
      throw new InputError(where, `bin edge ${i + 1} is ${String(e)}, not a finite number`, 'Fix or remove this row.')
    }
    if (e <= 0) throw new InputError(where, `bin edge ${fmt(e)} ${unit} is not positive`, 'Diameters must be greater than 0.')
  }
  for (let i = 0; i + 1 < edges.length; i++) {
    const lo = edges[i]
    const hi = edges[i + 1]
    if (hi === lo) {
      throw new InputError(binWhere(i, lo, hi, unit), `the bin has zero width (both edges ${fmt(lo)} ${unit})`, 'Remove the duplicate edge.')
    }
    if (hi < lo) {
      throw new InputError(
        binWhere(i, lo, hi, unit),
        `the upper edge ${fmt(hi)} ${unit} is below the lower edge ${fmt(lo)} ${unit}; edges must be strictly ascending (unsorted or overlapping bins)`,
        'Sort the bins by diameter and make each bin start where the previous one ends.'
      )
    }
  }
}

/**
 * Converts a measured binned distribution to canonical SizeBins (edges in µm, dN/dlogD in cm⁻³),
 * assuming number flat in log D inside each bin (BIN_SHAPE). For 'dS/dlogDp', 'dV/dlogDp' and
 * 'dM/dlogDp' the value is read as the bin's total S, V or M divided by its log₁₀ width, and dN/dlogD is
 * chosen so the exact integral over the bin reproduces that total (not a midpoint evaluation):
 *     dN/dlogD = value · Δlog₁₀D / ∫ c D^k dlog₁₀D   with c D^k = π D² (S), (π/6) D³ (V), ρ (π/6) D³ (M).
 * Throws InputError naming the bin (number counted from 1, and its diameters in the input unit) for:
 * unknown unit or quantity, wrong array lengths, NaN or non-positive diameters, edges not strictly
 * ascending (unsorted, overlapping or zero-width bins), NaN or negative values, missing density.
 */
export function binsFromMeasurement(m: MeasuredBins): SizeBins {
  const scale = checkUnit(m.diameterUnit)
  const quantity = checkQuantity(m.quantity)
  const unit = m.diameterUnit === 'nm' ? 'nm' : 'µm'
  if (m.diameterKind !== 'edges' && m.diameterKind !== 'midpoints') {
    throw new InputError('bin diameters: kind', `unknown diameter kind "${String(m.diameterKind)}"`, "Use 'edges' (n+1 values) or 'midpoints' (n values).")
  }
  if (!m.diameters || typeof m.diameters.length !== 'number') throw new InputError('bin diameters', 'no diameters given', 'Give an array of diameters.')
  if (!m.values || typeof m.values.length !== 'number') throw new InputError('bin values', 'no values given', 'Give an array of values, one per bin.')
  const n = m.values.length
  if (n === 0) throw new InputError('bin values', 'no bins given', 'Give at least one bin.')
  if (m.diameterKind === 'edges' && m.diameters.length !== n + 1) {
    throw new InputError('bin diameters', `${m.diameters.length} edges given for ${n} values; n bins need n+1 edges (${n + 1})`, 'Give one more edge than values, or use diameterKind: \'midpoints\'.')
  }
  if (m.diameterKind === 'midpoints' && m.diameters.length !== n) {
    throw new InputError('bin diameters', `${m.diameters.length} midpoints given for ${n} values; there must be one midpoint per value`, 'Give one midpoint per value, or use diameterKind: \'edges\'.')
  }
  let density = NaN
  if (quantity === 'dM/dlogDp') {
    if (m.density === undefined) throw new InputError('bin values: density', "quantity 'dM/dlogDp' needs the particle density, none given", 'Give density in g cm⁻³.')
    requirePositive('bin values: density', m.density, 'the particle density', 'g cm⁻³', 'Give density in g cm⁻³.')
    density = m.density
  }

  let edgesIn: ArrayLike<number>
  if (m.diameterKind === 'midpoints') edgesIn = edgesFromMidpoints(m.diameters, unit)
  else {
    checkEdges(m.diameters, unit)
    edgesIn = m.diameters
  }
  // Place in error messages: the bin by its edges (and midpoint, when midpoints were given).
  const where = (i: number): string =>
    m.diameterKind === 'midpoints' ? `bin ${i + 1} (midpoint ${fmt(m.diameters[i])} ${unit})` : binWhere(i, edgesIn[i], edgesIn[i + 1], unit)

  const edges = new Float64Array(n + 1)
  for (let i = 0; i <= n; i++) edges[i] = edgesIn[i] * scale
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    const v = m.values[i]
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new InputError(where(i), `the ${quantity} value is ${String(v)}, not a finite number`, 'Fix the value, or give 0 for an empty bin.')
    }
    if (v < 0) throw new InputError(where(i), `the ${quantity} value ${fmt(v)} is negative; concentrations cannot be negative`, 'Set it to 0 (or fix the inversion that produced it).')
    const lo = edges[i]
    const hi = edges[i + 1]
    const dlog = binPowerIntegral(lo, hi, 0)
    switch (quantity) {
      case 'dN/dlogDp':
        out[i] = v
        break
      case 'dN':
        out[i] = v / dlog
        break
      case 'dS/dlogDp':
        out[i] = (v * dlog) / (Math.PI * binPowerIntegral(lo, hi, 2))
        break
      case 'dV/dlogDp':
        out[i] = (v * dlog) / ((Math.PI / 6) * binPowerIntegral(lo, hi, 3))
        break
      case 'dM/dlogDp':
        out[i] = (v * dlog) / (density * (Math.PI / 6) * binPowerIntegral(lo, hi, 3))
        break
    }
  }
  return { edges, dNdlogD: out }
}

/**
 * Checks canonical SizeBins (as built by binsFromMeasurement or by hand): Float64Array-like edges of
 * length n+1 in µm, strictly ascending and positive, and n finite, non-negative dN/dlogD values.
 */
export function checkSizeBins(bins: SizeBins): void {
  if (!bins || !bins.edges || !bins.dNdlogD) throw new InputError('size bins', 'expected { edges, dNdlogD }', 'Build the bins with binsFromMeasurement.')
  const n = bins.dNdlogD.length
  if (n === 0) throw new InputError('size bins', 'no bins', 'Give at least one bin.')
  if (bins.edges.length !== n + 1) {
    throw new InputError('size bins: edges', `${bins.edges.length} edges for ${n} bins; n bins need n+1 edges`, 'Give one more edge than values.')
  }
  checkEdges(bins.edges, 'µm')
  for (let i = 0; i < n; i++) {
    const v = bins.dNdlogD[i]
    if (Number.isFinite(v) && v >= 0) continue
    // the message is built only for a bad bin: this check runs on every row of a long record
    const w = binWhere(i, bins.edges[i], bins.edges[i + 1], 'µm')
    if (!Number.isFinite(v)) throw new InputError(w, `dN/dlogD is ${String(v)}, not a finite number`, 'Fix the value, or give 0 for an empty bin.')
    throw new InputError(w, `dN/dlogD ${fmt(v)} cm⁻³ is negative`, 'Set it to 0.')
  }
}

/**
 * Each bin's value as `quantity` (inverse of binsFromMeasurement), one per bin: 'dN/dlogDp' cm⁻³,
 * 'dN' cm⁻³, 'dS/dlogDp' µm² cm⁻³, 'dV/dlogDp' µm³ cm⁻³, 'dM/dlogDp' µg m⁻³ (needs density g cm⁻³).
 * Bin averages under BIN_SHAPE: e.g. dV/dlogDp = V_bin / Δlog₁₀D with V_bin the exact bin integral.
 */
export function binValues(bins: SizeBins, quantity: BinQuantity, density?: number): Float64Array {
  checkSizeBins(bins)
  const q = checkQuantity(quantity)
  if (q === 'dM/dlogDp') {
    if (density === undefined) throw new InputError('bin values: density', "quantity 'dM/dlogDp' needs the particle density, none given", 'Give density in g cm⁻³.')
    requirePositive('bin values: density', density, 'the particle density', 'g cm⁻³', 'Give density in g cm⁻³.')
  }
  const n = bins.dNdlogD.length
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    const lo = bins.edges[i]
    const hi = bins.edges[i + 1]
    const x = bins.dNdlogD[i]
    const dlog = binPowerIntegral(lo, hi, 0)
    switch (q) {
      case 'dN/dlogDp':
        out[i] = x
        break
      case 'dN':
        out[i] = x * dlog
        break
      case 'dS/dlogDp':
        out[i] = (x * Math.PI * binPowerIntegral(lo, hi, 2)) / dlog
        break
      case 'dV/dlogDp':
        out[i] = (x * (Math.PI / 6) * binPowerIntegral(lo, hi, 3)) / dlog
        break
      case 'dM/dlogDp':
        out[i] = (x * (density as number) * (Math.PI / 6) * binPowerIntegral(lo, hi, 3)) / dlog
        break
    }
  }
  return out
}

/**
 * k-th moment Σ_i dN/dlogD_i ∫_{lo_i}^{hi_i} D^k dlog₁₀D of binned data, µm^k cm⁻³, exact under
 * BIN_SHAPE. k any finite real.
 */
export function binMoment(bins: SizeBins, k: number): number {
  checkSizeBins(bins)
  if (!Number.isFinite(k)) throw new InputError('bin moment order', `k is ${String(k)}, not a finite number`, 'Give k as a finite number.')
  let s = 0
  for (let i = 0; i < bins.dNdlogD.length; i++) s += bins.dNdlogD[i] * binPowerIntegral(bins.edges[i], bins.edges[i + 1], k)
  return s
}

/** Total number concentration of bins, cm⁻³. */
export function binNumberConcentration(bins: SizeBins): number {
  return binMoment(bins, 0)
}
/** Total surface concentration π M₂ of bins, µm² cm⁻³ (spheres, BIN_SHAPE). */
export function binSurfaceConcentration(bins: SizeBins): number {
  return Math.PI * binMoment(bins, 2)
}
/** Total volume concentration (π/6) M₃ of bins, µm³ cm⁻³ (spheres, BIN_SHAPE). */
export function binVolumeConcentration(bins: SizeBins): number {
  return (Math.PI / 6) * binMoment(bins, 3)
}
/** Total mass concentration of bins, µg m⁻³, for particle density in g cm⁻³. */
export function binMassConcentration(bins: SizeBins, density: number): number {
  requirePositive('size bins: density', density, 'the particle density', 'g cm⁻³', 'Give density in g cm⁻³.')
  return density * binVolumeConcentration(bins)
}
