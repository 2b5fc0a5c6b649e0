/**
 * Solar spectrum approximation and Rayleigh optical depth.
 *
 * APPROXIMATION: the Sun is represented by a blackbody at the IAU 2015 nominal effective temperature
 * 5772 K, scaled so that its integral over all wavelengths equals S₀. The real top-of-atmosphere solar
 * spectrum differs from this by tens of percent in the ultraviolet (absorption lines, limb darkening)
 * and by a few percent band-by-band in the visible and near infrared; use it only to weight a handful
 * of bands in a screening estimate. Ozone, water vapour and other gaseous absorption are NOT included.
 */
import { InputError } from '../errors.ts'
import {
  BOLTZMANN_CONSTANT_JK,
  PLANCK_CONSTANT_JS,
  SOLAR_CONSTANT_WM2,
  SPEED_OF_LIGHT_MS,
  STANDARD_PRESSURE_HPA,
  STEFAN_BOLTZMANN_WM2K4,
  SUN_EFFECTIVE_TEMPERATURE_K
} from './constants.ts'
import { blackbodyFractionBelow } from './planck.ts'
import { checkFinite, checkRange, checkRangeOpenLow } from './validate.ts'

/** Second radiation constant c₂ = hc/k in µm K. */
const C2_UM_K = ((PLANCK_CONSTANT_JS * SPEED_OF_LIGHT_MS) / BOLTZMANN_CONSTANT_JK) * 1e6

/**
 * Spectral irradiance at the top of the atmosphere of a 5772 K blackbody scaled to total S₀, W m⁻² µm⁻¹:
 * E(λ) = S₀ · π B_λ(T) / (σ T⁴), with Planck's B_λ = 2hc² λ⁻⁵ / (exp(hc/λkT) − 1).
 * An approximation of the real solar spectrum (see the module note). Domain: λ > 0 µm.
 */
export function solarSpectralIrradiance(wavelengthUm: number, solarConstant: number = SOLAR_CONSTANT_WM2): number {
  checkRangeOpenLow('wavelengthUm', wavelengthUm, 0, 1e6, 'µm')
  checkRange('solarConstant', solarConstant, 0, 1e5, 'W m⁻²')
  const T = SUN_EFFECTIVE_TEMPERATURE_K
  const lam = wavelengthUm * 1e-6
  const x = C2_UM_K / (wavelengthUm * T)
  if (x > 700) return 0
  const piB = (2 * Math.PI * PLANCK_CONSTANT_JS * SPEED_OF_LIGHT_MS ** 2) / lam ** 5 / Math.expm1(x) // W m⁻² m⁻¹
  return ((solarConstant * piB) / (STEFAN_BOLTZMANN_WM2K4 * T ** 4)) * 1e-6
}

/**
 * Fraction of a 5772 K blackbody's energy at wavelengths below λ (0..1): blackbodyFractionBelow (planck.ts) at the
 * Sun's effective temperature. Domain: λ > 0 µm (Infinity gives 1).
 */
export function solarFractionBelow(wavelengthUm: number): number {
  return blackbodyFractionBelow(wavelengthUm, SUN_EFFECTIVE_TEMPERATURE_K)
}

/**
 * Fraction of S₀ (blackbody approximation, see module note) in each band between consecutive edges.
 * Domain: edges strictly increasing, > 0 µm (Infinity allowed as the last edge). Returns n − 1 fractions.
 */
export function solarBandFractions(edgesUm: readonly number[]): Float64Array {
  if (!Array.isArray(edgesUm) || edgesUm.length < 2) {
    throw new InputError('edgesUm', 'fewer than two band edges were given', 'Give at least two increasing wavelengths in µm.')
  }
  const F = edgesUm.map((e, i) => {
    if (typeof e !== 'number' || Number.isNaN(e) || e <= 0) {
      throw new InputError(`edgesUm[${i}]`, `${String(e)} is not a positive wavelength`, 'Give positive wavelengths in µm.')
    }
    if (i > 0 && e <= edgesUm[i - 1]) {
      throw new InputError(`edgesUm[${i}]`, `${e} µm is not larger than the previous edge ${edgesUm[i - 1]} µm`, 'Give the band edges in strictly increasing order.')
    }
    return solarFractionBelow(e)
  })
  const out = new Float64Array(F.length - 1)
  for (let i = 0; i < out.length; i++) out[i] = F[i + 1] - F[i]
  return out
}

/** Lower and upper wavelength limits (µm) of the band-weight range used by {@link solarBandWeights}. */
export const SOLAR_BAND_RANGE_UM: readonly [number, number] = Object.freeze([0.3, 4]) as readonly [number, number]

export interface SolarBandWeights {
  /** Band centres as given, µm. */
  centresUm: Float64Array
  /** Band edges (n + 1 values), µm: 0.3, midpoints between centres, 4. */
  edgesUm: Float64Array
  /** Fraction of S₀ in each band (blackbody approximation). */
  fractions: Float64Array
  /** Band-integrated irradiance, W m⁻² (fraction × S₀). */
  irradianceWm2: Float64Array
  /** Fraction of S₀ below 0.3 µm (not represented by any band; ≈ 3.2 % for the 5772 K blackbody). */
  fractionBelowRange: number
  /** Fraction of S₀ above 4 µm (not represented by any band; ≈ 1 % for the 5772 K blackbody). */
  fractionAboveRange: number
}

/**
 * Solar weights for a set of band-centre wavelengths within 0.3–4 µm: edges are put half-way between
 * neighbouring centres and at 0.3 and 4 µm, and each band gets its fraction of S₀ from the 5772 K
 * blackbody approximation. The fractions sum to 1 − (fraction below 0.3 µm) − (fraction above 4 µm);
 * the remainder is reported, not redistributed. Domain: centres strictly increasing within [0.3, 4] µm.
 */
export function solarBandWeights(centresUm: readonly number[], solarConstant: number = SOLAR_CONSTANT_WM2): SolarBandWeights {
  checkRange('solarConstant', solarConstant, 0, 1e5, 'W m⁻²')
  const [lo, hi] = SOLAR_BAND_RANGE_UM
  if (!Array.isArray(centresUm) || centresUm.length < 1) {
    throw new InputError('centresUm', 'no band centres were given', 'Give at least one wavelength in µm from 0.3 to 4.')
  }
  centresUm.forEach((c, i) => {
    checkRange(`centresUm[${i}]`, c, lo, hi, 'µm')
    if (i > 0 && c <= centresUm[i - 1]) {
      throw new InputError(`centresUm[${i}]`, `${c} µm is not larger than the previous centre ${centresUm[i - 1]} µm`, 'Give the band centres in strictly increasing order.')
    }
  })
  const n = centresUm.length
  const edges = [lo]
  for (let i = 1; i < n; i++) edges.push(0.5 * (centresUm[i - 1] + centresUm[i]))
  edges.push(hi)
  const fractions = solarBandFractions(edges)
  const irr = new Float64Array(n)
  for (let i = 0; i < n; i++) irr[i] = fractions[i] * solarConstant
  return {
    centresUm: Float64Array.from(centresUm),
    edgesUm: Float64Array.from(edges),
    fractions,
    irradianceWm2: irr,
    fractionBelowRange: solarFractionBelow(lo),
    fractionAboveRange: 1 - solarFractionBelow(hi)
  }
}

/** Published fits for the Rayleigh optical depth of the air column. */
export type RayleighFormula = 'hansen-travis-1974' | 'bodhaine-1999'

/**
 * Rayleigh (molecular scattering) optical depth of the whole air column at wavelength λ (µm) and surface
 * pressure p (hPa), scaled linearly with p from the standard-pressure fit:
 *  - 'hansen-travis-1974' (default): τ_R = 0.008569 λ⁻⁴ (1 + 0.0113 λ⁻² + 0.00013 λ⁻⁴) at 1013.25 hPa;
 *    Hansen, J. E. & Travis, L. D. (1974), Space Sci. Rev. 16, 527–610. Domain here 0.2–4 µm.
 *  - 'bodhaine-1999': τ_R = 0.0021520 (1.0455996 − 341.29061 λ⁻² − 0.90230850 λ²) /
 *    (1 + 0.0027059889 λ⁻² − 85.968563 λ²) (their eq. 30, sea level, 45° latitude, 360 ppm CO₂);
 *    Bodhaine, B. A., Wood, N. B., Dutton, E. G. & Slusser, J. R. (1999), J. Atmos. Oceanic Technol. 16,
 *    1854–1861 (coefficients from memory). Domain here 0.25–1 µm (the fit loses the λ⁻⁴ behaviour beyond).
 * Pressure domain 1–1100 hPa.
 */
export function rayleighOpticalDepth(
  wavelengthUm: number,
  pressureHpa: number = STANDARD_PRESSURE_HPA,
  formula: RayleighFormula = 'hansen-travis-1974'
): number {
  checkFinite('wavelengthUm', wavelengthUm)
  checkRange('pressureHpa', pressureHpa, 1, 1100, 'hPa')
  const l2 = 1 / (wavelengthUm * wavelengthUm)
  let tau: number
  if (formula === 'hansen-travis-1974') {
    checkRange('wavelengthUm', wavelengthUm, 0.2, 4, 'µm')
    tau = 0.008569 * l2 * l2 * (1 + 0.0113 * l2 + 0.00013 * l2 * l2)
  } else if (formula === 'bodhaine-1999') {
    checkRange('wavelengthUm', wavelengthUm, 0.25, 1, 'µm')
    const lam2 = wavelengthUm * wavelengthUm
    tau = (0.002152 * (1.0455996 - 341.29061 * l2 - 0.9023085 * lam2)) / (1 + 0.0027059889 * l2 - 85.968563 * lam2)
  } else {
    throw new InputError('formula', `"${String(formula)}" is not a known Rayleigh formula`, "Use 'hansen-travis-1974' or 'bodhaine-1999'.")
  }
  return (tau * pressureHpa) / STANDARD_PRESSURE_HPA
}
