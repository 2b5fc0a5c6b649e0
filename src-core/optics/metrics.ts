/**
 * Figures derived from bulk optics: Ångström exponents, visual range, haze index, the air's Rayleigh
 * scattering, and the depth of a sample's layer.
 */
import { InputError } from '../errors.ts'
import { rayleighOpticalDepth } from '../climate/index.ts'
import type { LayerSpec } from '../study/model.ts'
import type { AngstromExponents, WavelengthOptics, WithheldFigure } from './types.ts'

/** Ångström exponent between two wavelengths: å = −ln(σ₁/σ₂)/ln(λ₁/λ₂). NaN when either σ is not positive. */
export function angstromExponent(sigma1: number, lambda1: number, sigma2: number, lambda2: number): number {
  if (!(sigma1 > 0 && sigma2 > 0) || lambda1 === lambda2) return NaN
  return -Math.log(sigma1 / sigma2) / Math.log(lambda1 / lambda2)
}

/** Least-squares slope of ln σ against ln λ, negated: the Ångström exponent fitted over all wavelengths. */
export function angstromFitOf(wavelengths: readonly number[], sigmas: readonly number[]): number {
  let n = 0
  let sx = 0
  let sy = 0
  let sxx = 0
  let sxy = 0
  for (let i = 0; i < wavelengths.length; i++) {
    if (!(sigmas[i] > 0)) continue
    const x = Math.log(wavelengths[i])
    const y = Math.log(sigmas[i])
    n++
    sx += x
    sy += y
    sxx += x * x
    sxy += x * y
  }
  if (n < 2) return NaN
  const den = n * sxx - sx * sx
  return den === 0 ? NaN : -(n * sxy - sx * sy) / den
}

/**
 * Ångström exponent at each of ascending wavelengths: −Δln σ/Δln λ between the neighbours on either side (the
 * wavelength below and the one above; at the ends, the wavelength itself and its one neighbour). Exact for a
 * power law σ ∝ λ^(−å) (Ångström 1929, common practice). NaN where a σ it needs is not positive, or with fewer
 * than two wavelengths.
 */
export function localAngstromExponents(wavelengths: readonly number[], sigmas: readonly number[]): number[] {
  const n = wavelengths.length
  const out: number[] = new Array(n).fill(NaN)
  if (n < 2) return out
  for (let i = 0; i < n; i++) {
    const lo = Math.max(0, i - 1)
    const hi = Math.min(n - 1, i + 1)
    out[i] = angstromExponent(sigmas[lo], wavelengths[lo], sigmas[hi], wavelengths[hi])
  }
  return out
}

/**
 * Ångström exponents of extinction, scattering and absorption, fitted over all rows. The absorption exponent is
 * NaN, with its reason in `withheld.abs`, unless every row's absorption is measurable (absorptionWithheld).
 */
export function angstromFit(rows: readonly WavelengthOptics[]): AngstromExponents {
  const wl = rows.map((r) => r.wavelength_nm)
  const weak = rows.find((r) => absorptionWithheld(r.abs, r.ext) !== null)
  return {
    ext: angstromFitOf(wl, rows.map((r) => r.ext)),
    sca: angstromFitOf(wl, rows.map((r) => r.sca)),
    abs: weak ? NaN : angstromFitOf(wl, rows.map((r) => r.abs)),
    ...(weak ? { withheld: { abs: `${absorptionWithheld(weak.abs, weak.ext)} at ${weak.wavelength_nm} nm` } } : {})
  }
}

/**
 * When a figure has no meaning. An absorption Ångström exponent is the slope of ln σabs against ln λ: where the
 * absorption is tiny it follows only the traces of k in the index tables (a non-absorbing sample gave −14…+11
 * from σabs ≈ 1e-4 Mm⁻¹), so it is given only where σabs is at least ABSORPTION_FLOOR_MM (about the detection
 * limit of a filter-based absorption photometer over an hour, common practice) and at least
 * ABSORPTION_SHARE_MIN of σext (ω ≤ 0.99: below that share, σabs is inside the uncertainty of σext − σsca as
 * measured, common practice).
 */
export const ABSORPTION_FLOOR_MM = 0.1
export const ABSORPTION_SHARE_MIN = 0.01

/**
 * Visual range and haze index only for visible light: Koschmieder's 2 % contrast threshold is that of the human
 * eye in daylight (Koschmieder 1924; Middleton 1952, Vision through the Atmosphere), and the deciview scale is
 * defined on mid-visible extinction (Pitchford & Malm 1994). 400–700 nm (common practice).
 */
export const VISIBLE_NM: readonly [number, number] = [400, 700]

/** Why an absorption Ångström exponent from σabs (Mm⁻¹) beside σext would mean nothing, or null when it means something. */
export function absorptionWithheld(absMm: number, extMm: number): string | null {
  if (!(absMm >= ABSORPTION_FLOOR_MM)) return `σabs below ${ABSORPTION_FLOOR_MM} Mm⁻¹ (too little absorption for an exponent)`
  if (!(absMm >= ABSORPTION_SHARE_MIN * extMm)) return `σabs below ${ABSORPTION_SHARE_MIN * 100} % of σext (ω above ${1 - ABSORPTION_SHARE_MIN}: too little absorption for an exponent)`
  return null
}

/** Why visual range or haze index at this wavelength would mean nothing, or null. */
export function visibilityWithheld(wavelengthNm: number): string | null {
  if (wavelengthNm < VISIBLE_NM[0] || wavelengthNm > VISIBLE_NM[1]) return `defined for visible light only (${VISIBLE_NM[0]}–${VISIBLE_NM[1]} nm)`
  return null
}

/**
 * Why a haze index would mean nothing, or null: outside the visible, or below its zero (b_ext + b_Rayleigh under
 * 10 Mm⁻¹, which the scale takes as clean air: a haze index is not negative).
 */
export function deciviewWithheld(wavelengthNm: number, totalExtMm: number): string | null {
  const v = visibilityWithheld(wavelengthNm)
  if (v) return v
  if (!(totalExtMm >= 10)) return 'below the scale’s clean-air zero (b_ext + b_Rayleigh under 10 Mm⁻¹)'
  return null
}

/**
 * Local absorption Ångström exponents (localAngstromExponents of σabs), NaN with a reason wherever the
 * absorption at the wavelength or at a neighbour it uses is withheld (absorptionWithheld).
 */
export function localAbsorptionExponents(wavelengths: readonly number[], abs: readonly number[], ext: readonly number[]): { value: number; withheld: string | null }[] {
  const values = localAngstromExponents(wavelengths, abs)
  const n = wavelengths.length
  return values.map((value, i) => {
    for (const k of [Math.max(0, i - 1), i, Math.min(n - 1, i + 1)]) {
      const why = absorptionWithheld(abs[k], ext[k])
      if (why) return { value: NaN, withheld: k === i ? why : `${why} at ${wavelengths[k]} nm` }
    }
    return n < 2 ? { value: NaN, withheld: 'needs two wavelengths or more' } : { value, withheld: null }
  })
}

/** Koschmieder visual range, km, for a total extinction coefficient in Mm⁻¹: V = 3.912 / b_ext. */
export function visualRangeKm(extinctionMm: number): number {
  return extinctionMm > 0 ? 3912 / extinctionMm : Infinity
}

/** Haze index in deciviews: dv = 10 ln(b_ext / 10 Mm⁻¹) (Pitchford & Malm 1994, Atmos. Environ. 28:1049). */
export function deciview(extinctionMm: number): number {
  return extinctionMm > 0 ? 10 * Math.log(extinctionMm / 10) : -Infinity
}

/**
 * Scale height of the air, m: H = R T/(M g) at 288.15 K (U.S. Standard Atmosphere 1976 sea-level
 * temperature; M = 0.0289644 kg/mol, g = 9.80665 m s⁻²), about 8.4 km.
 */
export const AIR_SCALE_HEIGHT_M = (8.314462618 * 288.15) / (0.0289644 * 9.80665)

/**
 * Rayleigh scattering coefficient of sea-level air, Mm⁻¹: the column's Rayleigh optical depth at
 * 1013.25 hPa divided by the scale height (an isothermal column holds H times the sea-level density).
 */
export function rayleighScatteringMm(wavelengthUm: number): number {
  return (rayleighOpticalDepth(wavelengthUm) / AIR_SCALE_HEIGHT_M) * 1e6
}

/**
 * Depth of the column the sample fills, m: a uniform layer's depth, or for a layer whose concentration
 * falls off exponentially from the surface with scale height H, the equivalent uniform depth H.
 * For a layer given by its optical depth, the caller derives the depth from σext(550 nm); this returns 0.
 */
export function layerDepthM(layer: LayerSpec): number {
  if (layer.kind === 'depth') {
    if (!(layer.depth_m >= 0)) throw new InputError('layer: depth_m', `${layer.depth_m} m is not a depth`, 'Give the layer depth in metres, 0 or more.')
    return layer.depth_m
  }
  if (layer.kind === 'scale-height') {
    if (!(layer.scale_height_m > 0)) throw new InputError('layer: scale_height_m', `${layer.scale_height_m} m is not a scale height`, 'Give the scale height in metres, greater than 0.')
    return layer.scale_height_m
  }
  return 0
}

/** A row's withheld figures and their reasons in one line ("angstrom_abs: …; deciview: …"), for CSV and text output. */
export function withheldText(row: Pick<WavelengthOptics, 'withheld'>): string {
  return (Object.entries(row.withheld) as [WithheldFigure, string][]).map(([k, why]) => `${k}: ${why}`).join('; ')
}
