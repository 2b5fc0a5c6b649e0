/**
 * Optically thin aerosol layer: the global-mean screening estimate of the direct radiative forcing.
 *
 * Chylek, P. & Wong, J. (1995), "Effect of absorbing aerosols on global radiation budget",
 * Geophys. Res. Lett. 22, 929–931; equivalent to Haywood, J. M. & Shine, K. P. (1995), "The effect of
 * anthropogenic sulfate and soot aerosol on the clear sky planetary radiation budget",
 * Geophys. Res. Lett. 22, 603–606:
 *
 *   ΔF = −(S₀/4) T² (1 − A_c) [ 2 (1 − R_s)² β̄ τ_sca − 4 R_s τ_abs ],   τ_sca = ω τ,  τ_abs = (1 − ω) τ.
 *
 * Negative ΔF means the layer cools (less solar energy kept by the Earth–atmosphere system).
 */
import { InputError } from '../errors.ts'
import { atmosphereAbove, checkRange, checkRangeOpenLow } from './validate.ts'

/** Inputs of the global-mean thin-layer estimate. All dimensionless unless noted. */
export interface ThinLayerInput {
  /** Aerosol optical depth τ at the wavelength (or band) of interest, 0 ≤ τ ≤ 10 (meaningful for τ ≲ 0.1). */
  tau: number
  /** Single-scattering albedo ω, 0 ≤ ω ≤ 1. */
  omega: number
  /** Mean upscatter fraction β̄ (fraction of scattered sunlight sent to the upper hemisphere), 0 ≤ β̄ ≤ 1. */
  upscatter: number
  /** Broadband surface albedo R_s, 0 ≤ R_s ≤ 1. */
  surfaceAlbedo: number
  /** One-way transmittance of the atmosphere above the layer T, 0..1; default 0.76 (Haywood & Shine 1995). */
  transmittance?: number
  /** Cloud fraction A_c, 0..1; default 0.6 (Haywood & Shine 1995). The cloudy part is assumed unforced. */
  cloudFraction?: number
  /** Solar constant S₀ in W m⁻²; default 1361 (Kopp & Lean 2011). */
  solarConstant?: number
}

export interface ThinLayerResult {
  /** Global-mean top-of-atmosphere forcing ΔF, W m⁻² (negative = cooling). */
  forcingWm2: number
  /** Forcing efficiency ΔF/τ, W m⁻² per unit optical depth. */
  efficiencyWm2PerTau: number
  /** Critical single-scattering albedo: the layer cools when ω > ω_crit. */
  omegaCritical: number
  /** Surface albedo at which the sign of ΔF flips for this ω and β̄ (cools below it, warms above it). */
  flipSurfaceAlbedo: number
  /** Scattering and absorption optical depths ω τ and (1 − ω) τ. */
  tauScattering: number
  tauAbsorption: number
}

/** Checks the common thin-layer inputs and fills the defaults. */
function thinInputs(i: ThinLayerInput) {
  checkRange('tau', i.tau, 0, 10)
  checkRange('omega', i.omega, 0, 1)
  checkRange('upscatter', i.upscatter, 0, 1)
  checkRange('surfaceAlbedo', i.surfaceAlbedo, 0, 1)
  return atmosphereAbove(i)
}

/**
 * Global-mean direct forcing of an optically thin, uniform aerosol layer (Chylek & Wong 1995; Haywood &
 * Shine 1995). Domain: τ small (the expression is first order in τ; use {@link twoStreamForcing} beyond
 * τ ≈ 0.1). Returns ΔF in W m⁻², the efficiency ΔF/τ, ω_crit and the sign-flip surface albedo.
 */
export function thinLayerForcing(input: ThinLayerInput): ThinLayerResult {
  const { T, Ac, S0 } = thinInputs(input)
  const { tau, omega, upscatter: beta, surfaceAlbedo: Rs } = input
  const efficiency = thinLayerEfficiency(S0, T, Ac, Rs, beta, omega)
  return {
    forcingWm2: efficiency * tau,
    efficiencyWm2PerTau: efficiency,
    // degenerate β̄ = 0 over a black surface: the forcing is 0 for every ω; report ω_crit = 0
    omegaCritical: beta > 0 || Rs > 0 ? criticalSingleScatteringAlbedo(Rs, beta) : 0,
    flipSurfaceAlbedo: beta > 0 ? signFlipSurfaceAlbedo(omega, beta) : omega < 1 ? 0 : 1,
    tauScattering: omega * tau,
    tauAbsorption: (1 - omega) * tau
  }
}

/**
 * The thin-layer forcing per unit optical depth, ΔF/τ = −(S₀/4) T² (1 − A_c) [2 (1 − R_s)² β̄ ω − 4 R_s (1 − ω)]
 * (Chylek & Wong 1995), W m⁻², for inputs already checked (thinLayerForcing checks them; forcingMap checks
 * the ones its grid shares once, and builds the rest inside their domain).
 */
export function thinLayerEfficiency(S0: number, T: number, Ac: number, Rs: number, beta: number, omega: number): number {
  return -(S0 / 4) * T * T * (1 - Ac) * (2 * (1 - Rs) ** 2 * beta * omega - 4 * Rs * (1 - omega))
}

/**
 * Critical single-scattering albedo of a thin layer, ω_crit = 2R_s / (2R_s + β̄ (1 − R_s)²)
 * (Chylek & Wong 1995; the zero of the thin-layer forcing). The layer cools when ω > ω_crit and warms
 * when ω < ω_crit. Domain: 0 ≤ R_s ≤ 1, 0 ≤ β̄ ≤ 1, not both R_s = 0 and β̄ = 0.
 */
export function criticalSingleScatteringAlbedo(surfaceAlbedo: number, upscatter: number): number {
  checkRange('surfaceAlbedo', surfaceAlbedo, 0, 1)
  checkRange('upscatter', upscatter, 0, 1)
  const den = 2 * surfaceAlbedo + upscatter * (1 - surfaceAlbedo) ** 2
  if (den === 0) {
    throw new InputError('upscatter', 'with zero upscatter over a black surface the thin-layer forcing is zero for every ω, so there is no critical value', 'Give an upscatter fraction above 0.')
  }
  return (2 * surfaceAlbedo) / den
}

/**
 * Surface albedo at which the thin-layer forcing changes sign for given ω and β̄: the root in [0, 1] of
 * β̄ ω (1 − R)² = 2 R (1 − ω), i.e. β̄ω R² − 2(β̄ω + 1 − ω) R + β̄ω = 0. The two roots multiply to 1, so the
 * one in [0, 1] is the smaller, computed in the cancellation-free form R = 2β̄ω / (B + √(B² − 4β̄²ω²)),
 * B = 2(β̄ω + 1 − ω). ω = 1 gives 1 (a non-absorbing layer cools over any surface darker than white);
 * ω = 0 gives 0. Domain: 0 ≤ ω ≤ 1, 0 < β̄ ≤ 1.
 */
export function signFlipSurfaceAlbedo(omega: number, upscatter: number): number {
  checkRange('omega', omega, 0, 1)
  checkRangeOpenLow('upscatter', upscatter, 0, 1)
  const bw = upscatter * omega
  const B = 2 * (bw + 1 - omega)
  // B² − 4 b²ω² = (B − 2bω)(B + 2bω) = 2(1 − ω)(4bω + 2(1 − ω)) ≥ 0
  const disc = 2 * (1 - omega) * (4 * bw + 2 * (1 - omega))
  return (2 * bw) / (B + Math.sqrt(disc))
}
