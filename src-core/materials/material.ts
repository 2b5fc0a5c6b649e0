/**
 * The material model: what a component is (index, density, κ, sources) and how its refractive index is
 * read at one wavelength. Catalogue entries and user components share this shape.
 */
import { InputError } from '../errors.ts'

/** A complex refractive index m = n + ik (k >= 0 for an absorbing medium, time convention e^{−iωt}). */
export interface ComplexRefractiveIndex {
  readonly n: number
  readonly k: number
}

/** A tabulated index: rows sorted by wavelength, interpolated as described at `indexFromTable`. */
export interface TableIndex {
  readonly kind: 'table'
  readonly wavelengthsUm: readonly number[]
  readonly n: readonly number[]
  readonly k: readonly number[]
  /** One source string per row (per tabulated value pair). */
  readonly sources: readonly string[]
  /** ln of each wavelength, precomputed once. */
  readonly logWavelengths: readonly number[]
}

/** A wavelength-independent index. */
export interface ConstantIndex {
  readonly kind: 'constant'
  readonly n: number
  readonly k: number
}

/** An index given as two mathjs expressions of `wl_um` and `wl_nm`, compiled once. */
export interface ExpressionIndex {
  readonly kind: 'expression'
  readonly nExpression: string
  readonly kExpression: string
  /** Evaluates the compiled n (or k) expression at a wavelength in µm; throws InputError on a non-real result. */
  readonly evaluateN: (wavelengthUm: number) => number
  readonly evaluateK: (wavelengthUm: number) => number
}

export type IndexModel = TableIndex | ConstantIndex | ExpressionIndex

/** Solid→solution and solution→solid transitions of a crystalline salt, in percent RH. */
export interface PhaseChange {
  readonly deliquescenceRH: number
  readonly efflorescenceRH: number
}

/** A particle component: catalogue entry or user-defined. */
export interface Material {
  /** Lowercase, hyphenated, e.g. `ammonium-sulfate`. */
  readonly id: string
  readonly name: string
  /** Bulk density of the dry component, g cm⁻³. */
  readonly densityGcm3: number
  /** Hygroscopicity κ (Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961). */
  readonly kappa: number
  /** Present only for crystalline salts with a deliquescence/efflorescence hysteresis. */
  readonly phaseChange?: PhaseChange
  readonly index: IndexModel
  /** Wavelengths (µm) where the index is defined; [0, Infinity] for constants and expressions. */
  readonly rangeUm: readonly [number, number]
  readonly sources: {
    readonly index: string
    readonly density: string
    readonly kappa: string
    readonly phaseChange?: string
  }
  readonly notes?: string
}

/** Relative slack at the ends of a table, so that 2500 nm / 1000 = 2.5 µm and the like are not rejected. */
const RANGE_SLACK = 1e-9

/**
 * Builds a TableIndex from rows [wavelength µm, n, k] (ascending, distinct wavelengths), with one source per
 * row. Throws InputError naming `where` for an unsorted table, n <= 0, k < 0 or a non-finite value.
 *
 * Interpolation used by `refractiveIndexAt` between neighbouring rows λ₁ < λ < λ₂, with t = ln(λ/λ₁)/ln(λ₂/λ₁):
 *   n = n₁ + t (n₂ − n₁)                     (n linear in ln λ)
 *   k = exp(ln k₁ + t (ln k₂ − ln k₁))       (ln k linear in ln λ) when k₁ > 0 and k₂ > 0,
 *   k = k₁ + t (k₂ − k₁)                     (k linear in ln λ) otherwise.
 * At a tabulated wavelength the row's values are returned exactly. No extrapolation.
 */
export function buildTableIndex(where: string, rows: ReadonlyArray<readonly [number, number, number]>, sources: readonly string[]): TableIndex {
  if (rows.length < 2) {
    throw new InputError(where, `a refractive-index table needs at least 2 rows, got ${rows.length}`, 'Give rows of (wavelength µm, n, k) at two or more wavelengths, or use a constant index.')
  }
  const wavelengthsUm: number[] = []
  const n: number[] = []
  const k: number[] = []
  const logWavelengths: number[] = []
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i]
    if (!row || row.length < 3) {
      throw new InputError(`${where} row ${i + 1}`, 'the row does not have three values', 'Give each row as (wavelength µm, n, k).')
    }
    const [wl, ni, ki] = row
    if (!Number.isFinite(wl) || wl <= 0) {
      throw new InputError(`${where} row ${i + 1}`, `wavelength ${wl} µm is not a positive number`, 'Give wavelengths in µm, greater than 0.')
    }
    if (i > 0 && !(wl > wavelengthsUm[i - 1])) {
      throw new InputError(`${where} row ${i + 1}`, `wavelength ${wl} µm does not follow ${wavelengthsUm[i - 1]} µm in increasing order`, 'Sort the rows by wavelength and remove repeated wavelengths.')
    }
    if (!Number.isFinite(ni) || ni <= 0) {
      throw new InputError(`${where} at ${wl} µm`, `n = ${ni} is not a positive number`, 'The real part n of a refractive index must be greater than 0.')
    }
    if (!Number.isFinite(ki) || ki < 0) {
      throw new InputError(`${where} at ${wl} µm`, `k = ${ki} is not a number >= 0`, 'The imaginary part k must be 0 (no absorption) or positive.')
    }
    wavelengthsUm.push(wl)
    n.push(ni)
    k.push(ki)
    logWavelengths.push(Math.log(wl))
  }
  if (sources.length !== rows.length) {
    throw new Error(`${where}: ${sources.length} source strings for ${rows.length} rows`)
  }
  return { kind: 'table', wavelengthsUm, n, k, sources: sources.slice(), logWavelengths }
}

function requireWavelength(material: Material, wavelengthUm: number): void {
  if (typeof wavelengthUm !== 'number' || !Number.isFinite(wavelengthUm) || wavelengthUm <= 0) {
    throw new InputError(`${material.name} (${material.id}) refractive index`, `wavelength ${wavelengthUm} µm is not a positive number`, 'Give the wavelength in µm, greater than 0.')
  }
}

function interpolateTable(material: Material, t: TableIndex, wl: number): ComplexRefractiveIndex {
  const w = t.wavelengthsUm
  const last = w.length - 1
  if (wl < w[0] * (1 - RANGE_SLACK) || wl > w[last] * (1 + RANGE_SLACK)) {
    throw new InputError(
      `${material.name} (${material.id}) refractive index`,
      `wavelength ${wl} µm is outside its tabulated range ${w[0]} to ${w[last]} µm`,
      `Use wavelengths from ${w[0]} to ${w[last]} µm for this component, or give a table that covers ${wl} µm.`
    )
  }
  if (wl <= w[0]) return { n: t.n[0], k: t.k[0] }
  if (wl >= w[last]) return { n: t.n[last], k: t.k[last] }
  // binary search for w[lo] <= wl < w[lo + 1]
  let lo = 0
  let hi = last
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1
    if (w[mid] <= wl) lo = mid
    else hi = mid
  }
  if (wl === w[lo]) return { n: t.n[lo], k: t.k[lo] }
  const lw = t.logWavelengths
  const f = (Math.log(wl) - lw[lo]) / (lw[hi] - lw[lo])
  const n = t.n[lo] + f * (t.n[hi] - t.n[lo])
  const k1 = t.k[lo]
  const k2 = t.k[hi]
  const k = k1 > 0 && k2 > 0 ? Math.exp(Math.log(k1) + f * (Math.log(k2) - Math.log(k1))) : k1 + f * (k2 - k1)
  return { n, k }
}

/**
 * Complex refractive index m = n + ik of `material` at `wavelengthUm` (µm, > 0).
 * Tables interpolate as described at `buildTableIndex` and throw InputError outside their range (which names
 * the component, the wavelength and the range); constants hold at all wavelengths; expressions are evaluated
 * and must give a real n > 0 and k >= 0 there.
 */
export function refractiveIndexAt(material: Material, wavelengthUm: number): ComplexRefractiveIndex {
  requireWavelength(material, wavelengthUm)
  const idx = material.index
  switch (idx.kind) {
    case 'table':
      return interpolateTable(material, idx, wavelengthUm)
    case 'constant':
      return { n: idx.n, k: idx.k }
    case 'expression': {
      const n = idx.evaluateN(wavelengthUm)
      const k = idx.evaluateK(wavelengthUm)
      if (!(n > 0)) {
        throw new InputError(`${material.name} (${material.id}) n at ${wavelengthUm} µm`, `the expression "${idx.nExpression}" gives n = ${n}, not greater than 0`, 'Change the expression so that n > 0 at every study wavelength.')
      }
      if (!(k >= 0)) {
        throw new InputError(`${material.name} (${material.id}) k at ${wavelengthUm} µm`, `the expression "${idx.kExpression}" gives k = ${k}, which is negative`, 'Change the expression so that k >= 0 at every study wavelength.')
      }
      return { n, k }
    }
  }
}

/**
 * Where `material`'s refractive index at `wavelengthUm` comes from: for a table, the source of the tabulated row at
 * that wavelength, or of the two rows it lies between (both named when they differ, joined by " / "); otherwise
 * the material's index source.
 */
export function indexSourceAt(material: Material, wavelengthUm: number): string {
  const idx = material.index
  if (idx.kind !== 'table') return material.sources.index
  const w = idx.wavelengthsUm
  let hi = w.findIndex((x) => x >= wavelengthUm)
  if (hi < 0) hi = w.length - 1
  const lo = w[hi] === wavelengthUm || hi === 0 ? hi : hi - 1
  return [...new Set([idx.sources[lo], idx.sources[hi]])].join(' / ')
}
