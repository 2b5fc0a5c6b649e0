/**
 * Where the thin-layer forcing stops being trustworthy, said in words.
 *
 * The thin-layer form (Chylek & Wong 1995) is first order in τ: it leaves out the layer's attenuation of its own
 * beam and multiple scattering between layer and surface. The delta-Eddington layer over a Lambertian surface
 * (Joseph, Wiscombe & Weinman 1976; twoStream.ts), given the same upscatter fraction β̄, agrees with it as τ → 0
 * and keeps the higher orders. Where the two differ by more than THIN_LAYER_TRUSTED_SHARE of the two-stream
 * figure (or of the verdict margin, whichever is larger), the thin-layer figures carry a warning that names the
 * two-stream figure to use instead.
 */
import { DEFAULT_ATMOSPHERIC_TRANSMITTANCE, DEFAULT_CLOUD_FRACTION, SOLAR_CONSTANT_WM2 } from './constants.ts'
import { thinLayerForcing } from './thinLayer.ts'
import { twoStreamForcing } from './twoStream.ts'
import { checkRange } from './validate.ts'

/**
 * Largest share by which the thin-layer forcing may depart from the two-stream layer (same τ, ω, β̄, surface
 * and atmosphere; μ₀ = 0.5, incident S₀/4) before its figures carry a warning: 0.1 (10 %). With the same β̄ the
 * two differ by about 0.3·τ relative for a weakly absorbing layer (0.5 % at τ = 0.01, 4.5 % at τ = 0.1), so the
 * warning starts near τ ≈ 0.2, the optical depth below which the thin form is usually taken as valid (common
 * practice: τ ≲ 0.1–0.2).
 */
export const THIN_LAYER_TRUSTED_SHARE = 0.1

/** Below this (W m⁻²) a difference between the two methods is never worth a warning, whatever its share. */
const DIFFERENCE_FLOOR_WM2 = 0.05

/**
 * The asymmetry parameter g whose delta-Eddington layer implies the mean upscatter fraction β̄ in the thin limit:
 * the inverse of β̄(g) = ∫₀¹ (1 − g²)(2 − 3μ₀ g/(1 + g))/4 dμ₀ = (1 − g)(2 + g/2)/4 (twoStreamEquivalentUpscatter
 * averaged over μ₀), g = (√(25 − 32β̄) − 3)/2, clamped to 0…0.99. Used where only β̄ is known.
 */
export function asymmetryFromUpscatter(upscatter: number): number {
  checkRange('upscatter', upscatter, 0, 1)
  const g = (Math.sqrt(Math.max(0, 25 - 32 * upscatter)) - 3) / 2
  return Math.min(0.99, Math.max(0, g))
}

function fmt(x: number): string {
  return Number(x.toPrecision(3)).toString()
}

/**
 * The warning the thin-layer figures carry when they depart from the two-stream figure of the same layer by more
 * than THIN_LAYER_TRUSTED_SHARE (of |two-stream|, or of the margin when that is larger), else null.
 */
export function thinLayerDepartureWarning(thinWm2: number, twoStreamWm2: number, tau: number, marginWm2 = 0.5): string | null {
  const diff = Math.abs(thinWm2 - twoStreamWm2)
  if (!(diff > DIFFERENCE_FLOOR_WM2 && diff > THIN_LAYER_TRUSTED_SHARE * Math.max(Math.abs(twoStreamWm2), marginWm2))) return null
  const share = Math.abs(twoStreamWm2) > 0 ? `${fmt((100 * diff) / Math.abs(twoStreamWm2))} %` : `${fmt(diff)} W m⁻²`
  return (
    `Thin-layer forcing ${fmt(thinWm2)} W m⁻² is outside its range: it departs from the two-stream (delta-Eddington) layer's ` +
    `${fmt(twoStreamWm2)} W m⁻² by ${share}, more than the ${100 * THIN_LAYER_TRUSTED_SHARE} % allowed, because the thin form is first order ` +
    `in τ (here τ = ${fmt(tau)}). Use the two-stream figure for this layer.`
  )
}

export interface ThinLayerCheckInput {
  tau: number
  omega: number
  /** Mean upscatter fraction β̄, used by both methods. */
  upscatter: number
  surfaceAlbedo: number
  /** Asymmetry parameter for the delta scaling; default asymmetryFromUpscatter(β̄). */
  asymmetry?: number
  transmittance?: number
  cloudFraction?: number
  solarConstant?: number
  /** The verdict's margin, W m⁻² (default 0.5). */
  marginWm2?: number
}

export interface ThinLayerCheck {
  thinWm2: number
  /** The two-stream layer's TOA forcing (μ₀ = 0.5, incident S₀/4, the same β̄). */
  twoStreamWm2: number
  /** The g it used. */
  asymmetry: number
  /** null when the thin-layer figure is within THIN_LAYER_TRUSTED_SHARE of the two-stream one. */
  warning: string | null
}

/** Compares the thin-layer forcing with the two-stream layer given the same β̄, and words the warning if needed. */
export function thinLayerCheck(input: ThinLayerCheckInput): ThinLayerCheck {
  const common = {
    transmittance: input.transmittance ?? DEFAULT_ATMOSPHERIC_TRANSMITTANCE,
    cloudFraction: input.cloudFraction ?? DEFAULT_CLOUD_FRACTION,
    solarConstant: input.solarConstant ?? SOLAR_CONSTANT_WM2
  }
  const thin = thinLayerForcing({ tau: input.tau, omega: input.omega, upscatter: input.upscatter, surfaceAlbedo: input.surfaceAlbedo, ...common }).forcingWm2
  const g = input.asymmetry ?? asymmetryFromUpscatter(input.upscatter)
  const two = twoStreamForcing({
    tau: input.tau,
    omega: input.omega,
    asymmetry: g,
    upscatter: input.upscatter,
    surfaceAlbedo: input.surfaceAlbedo,
    cosZenith: 0.5,
    incidentFluxWm2: common.solarConstant / 4,
    ...common
  }).toaWm2
  return { thinWm2: thin, twoStreamWm2: two, asymmetry: g, warning: thinLayerDepartureWarning(thin, two, input.tau, input.marginWm2) }
}
