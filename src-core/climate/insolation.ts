/**
 * Where and when: solar geometry, daily-mean insolation, a quadrature over the sunlit part of the day,
 * and the day-averaged thin-layer forcing with the slant-path (sun-angle dependent) form.
 */
import { DEFAULT_ATMOSPHERIC_TRANSMITTANCE, DEFAULT_CLOUD_FRACTION, SOLAR_CONSTANT_WM2 } from './constants.ts'
import { gaussLegendreOn } from '../numeric/index.ts'
import { checkInteger, checkRange, checkRangeOpenLow, evalChecked } from './validate.ts'

const DEG = Math.PI / 180

/** Day angle Γ = 2π (d − 1)/365 used by Spencer's series (d = day of year, 1 = 1 January). */
function dayAngle(dayOfYear: number): number {
  checkRange('dayOfYear', dayOfYear, 1, 366.999999)
  return (2 * Math.PI * (dayOfYear - 1)) / 365
}

/**
 * Solar declination δ in radians for a day of year d (1 ≤ d < 367, fractional days allowed), by the
 * Fourier series of Spencer, J. W. (1971), "Fourier series representation of the position of the Sun",
 * Search 2(5), 172 (coefficients as reproduced in Liou 2002, An Introduction to Atmospheric Radiation,
 * ch. 2; quoted from memory). Accuracy about 0.0006 rad (0.035°) for the present epoch.
 */
export function solarDeclinationRad(dayOfYear: number): number {
  const G = dayAngle(dayOfYear)
  return (
    0.006918 -
    0.399912 * Math.cos(G) +
    0.070257 * Math.sin(G) -
    0.006758 * Math.cos(2 * G) +
    0.000907 * Math.sin(2 * G) -
    0.002697 * Math.cos(3 * G) +
    0.00148 * Math.sin(3 * G)
  )
}

/**
 * Earth–Sun distance factor (d̄/d)² (mean over actual distance, squared; dimensionless, 0.966..1.035) for
 * a day of year, by the Fourier series of Spencer (1971), Search 2(5), 172 (from memory).
 */
export function earthSunDistanceFactor(dayOfYear: number): number {
  const G = dayAngle(dayOfYear)
  return 1.00011 + 0.034221 * Math.cos(G) + 0.00128 * Math.sin(G) + 0.000719 * Math.cos(2 * G) + 0.000077 * Math.sin(2 * G)
}

/** Sunset hour angle h₀ = arccos(−tan φ tan δ), clamped to [0, π] for polar night (0) and polar day (π). */
function sunsetHourAngle(phi: number, delta: number): number {
  const c = Math.cos(phi) * Math.cos(delta)
  const s = Math.sin(phi) * Math.sin(delta)
  if (c <= 1e-300) return s > 0 ? Math.PI : 0
  const x = -s / c
  if (x >= 1) return 0
  if (x <= -1) return Math.PI
  return Math.acos(x)
}

/**
 * Daily-mean (24-hour average) solar irradiance on a horizontal surface at the top of the atmosphere,
 * W m⁻²: Q = (S₀/π) (d̄/d)² (h₀ sin φ sin δ + cos φ cos δ sin h₀), with h₀ the sunset hour angle
 * (Liou 2002, An Introduction to Atmospheric Radiation, ch. 2). Exactly 0 in polar night.
 * Domain: latitude −90..90°, day of year 1 ≤ d < 367.
 */
export function dailyMeanInsolation(latitudeDeg: number, dayOfYear: number, solarConstant: number = SOLAR_CONSTANT_WM2): number {
  checkRange('latitudeDeg', latitudeDeg, -90, 90, '°')
  checkRange('solarConstant', solarConstant, 0, 1e5, 'W m⁻²')
  const phi = latitudeDeg * DEG
  const delta = solarDeclinationRad(dayOfYear)
  const h0 = sunsetHourAngle(phi, delta)
  if (h0 === 0) return 0
  const q = (solarConstant / Math.PI) * earthSunDistanceFactor(dayOfYear) * (h0 * Math.sin(phi) * Math.sin(delta) + Math.cos(phi) * Math.cos(delta) * Math.sin(h0))
  return Math.max(0, q)
}

/** Nodes and weights for averaging a function of μ₀ over the sunlit part of one day. */
export interface SunlitDayQuadrature {
  /** Cosine of the solar zenith angle μ₀ at each node (0 < μ₀ ≤ 1). Empty in polar night. */
  cosZenith: Float64Array
  /** Hour angle of each node, rad (0 = local noon; the afternoon half, mirrored for the morning). */
  hourAngleRad: Float64Array
  /**
   * Time weights: Σ timeWeights_i f(μ₀_i) ≈ 24-hour mean of f over the sunlit hours (f = 0 at night).
   * They sum to the sunlit fraction of the day h₀/π.
   */
  timeWeights: Float64Array
  /**
   * Flux weights, W m⁻²: S₀ (d̄/d)² μ₀_i × timeWeights_i, so Σ fluxWeights_i f(μ₀_i) ≈ 24-hour mean of the
   * incoming TOA flux times f. They sum to the daily-mean insolation.
   */
  fluxWeightsWm2: Float64Array
  /** Sunset hour angle h₀, rad (0 polar night, π polar day). */
  sunsetHourAngleRad: number
  /** Day length, hours (24 h₀/π). */
  dayLengthHours: number
  /** Σ fluxWeights: the daily-mean insolation by quadrature, W m⁻². */
  insolationWm2: number
}

/**
 * Gauss–Legendre quadrature in hour angle over [0, h₀] (the day is symmetric about noon) with n nodes
 * (default 20; 4..64). μ₀(h) = sin φ sin δ + cos φ cos δ cos h. Use the flux weights to average any
 * function of μ₀ (e.g. an upscatter fraction β(μ₀) or a slant-path transmittance exp(−τ/μ₀)) weighted by
 * the incoming solar flux. Polar night returns empty arrays and zero insolation.
 */
export function sunlitDayQuadrature(
  latitudeDeg: number,
  dayOfYear: number,
  nodes = 20,
  solarConstant: number = SOLAR_CONSTANT_WM2
): SunlitDayQuadrature {
  checkRange('latitudeDeg', latitudeDeg, -90, 90, '°')
  checkInteger('nodes', nodes, 4, 64)
  checkRange('solarConstant', solarConstant, 0, 1e5, 'W m⁻²')
  const phi = latitudeDeg * DEG
  const delta = solarDeclinationRad(dayOfYear)
  const e0 = earthSunDistanceFactor(dayOfYear)
  const h0 = sunsetHourAngle(phi, delta)
  const empty = new Float64Array(0)
  if (h0 === 0) {
    return { cosZenith: empty, hourAngleRad: empty, timeWeights: empty, fluxWeightsWm2: empty, sunsetHourAngleRad: 0, dayLengthHours: 0, insolationWm2: 0 }
  }
  const { nodes: x, weights: w } = gaussLegendreOn(nodes, 0, h0)
  const a = Math.sin(phi) * Math.sin(delta)
  const b = Math.cos(phi) * Math.cos(delta)
  const mu = new Float64Array(nodes)
  const tw = new Float64Array(nodes)
  const fw = new Float64Array(nodes)
  let q = 0
  for (let i = 0; i < nodes; i++) {
    // keep μ₀ strictly positive (rounding near sunset); the weight there is negligible
    mu[i] = Math.min(1, Math.max(1e-9, a + b * Math.cos(x[i])))
    tw[i] = w[i] / Math.PI // (1/2π) × 2 halves of the day
    fw[i] = solarConstant * e0 * mu[i] * tw[i]
    q += fw[i]
  }
  return { cosZenith: mu, hourAngleRad: x, timeWeights: tw, fluxWeightsWm2: fw, sunsetHourAngleRad: h0, dayLengthHours: (24 * h0) / Math.PI, insolationWm2: q }
}

/** Inputs for the thin-layer forcing at a given sun angle (slant-path form). */
export interface SlantThinLayerInput {
  /** Vertical aerosol optical depth τ (thin: τ/μ₀ ≪ 1), 0..10. */
  tau: number
  /** Single-scattering albedo ω, 0..1. */
  omega: number
  /** Upscatter fraction of the direct beam, a constant β̄ or a function β(μ₀) returning 0..1. */
  upscatter: number | ((cosZenith: number) => number)
  /**
   * Upscatter fraction for diffuse (isotropic) light reaching the layer from below, β_d = ∫₀¹ β(μ) dμ.
   * Default: computed from `upscatter` by 16-point Gauss–Legendre (equals β̄ when β is constant).
   */
  diffuseUpscatter?: number
  /** Surface albedo R_s, 0..1 (Lambertian). */
  surfaceAlbedo: number
  /** One-way transmittance above the layer, a number or a function of μ₀; default 0.76. */
  transmittance?: number | ((cosZenith: number) => number)
  /** Cloud fraction A_c, 0..1; default 0.6. */
  cloudFraction?: number
  /** Solar constant S₀, W m⁻²; default 1361. */
  solarConstant?: number
}

function diffuseUpscatterOf(input: SlantThinLayerInput): number {
  if (input.diffuseUpscatter !== undefined) {
    checkRange('diffuseUpscatter', input.diffuseUpscatter, 0, 1)
    return input.diffuseUpscatter
  }
  const u = input.upscatter
  if (typeof u === 'number') return u
  const { nodes: x, weights: w } = gaussLegendreOn(16, 0, 1)
  let s = 0
  for (let i = 0; i < x.length; i++) s += w[i] * evalChecked('upscatter', u, x[i], 0, 1)
  return s
}

function checkSlant(input: SlantThinLayerInput) {
  checkRange('tau', input.tau, 0, 10)
  checkRange('omega', input.omega, 0, 1)
  if (typeof input.upscatter === 'number') checkRange('upscatter', input.upscatter, 0, 1)
  checkRange('surfaceAlbedo', input.surfaceAlbedo, 0, 1)
  const T = input.transmittance ?? DEFAULT_ATMOSPHERIC_TRANSMITTANCE
  if (typeof T === 'number') checkRange('transmittance', T, 0, 1)
  const Ac = input.cloudFraction ?? DEFAULT_CLOUD_FRACTION
  checkRange('cloudFraction', Ac, 0, 1)
  const S0 = input.solarConstant ?? SOLAR_CONSTANT_WM2
  checkRange('solarConstant', S0, 0, 1e5, 'W m⁻²')
  return { T, Ac, S0, betaD: diffuseUpscatterOf(input) }
}

/*
 * Derivation of the slant-path thin-layer form (first order in τ).
 *
 * Let a thin layer sit over a Lambertian surface of albedo R. For the direct beam at μ₀ the fraction
 * intercepted is τ/μ₀ (slant path, small τ): a fraction r₀ = β(μ₀) ω τ/μ₀ is scattered up and
 * a₀ = (1 − ω) τ/μ₀ is absorbed. Light reflected by the surface is isotropic (diffuse); for diffuse flux
 * (radiance weight 2μ dμ, path τ/μ) the layer reflects r̄ = ∫₀¹ 2μ β(μ) ωτ/μ dμ = 2 β_d ω τ with
 * β_d = ∫₀¹ β(μ) dμ, and absorbs ā = ∫₀¹ 2μ (1 − ω)τ/μ dμ = 2 (1 − ω) τ.
 * The adding formula for layer + surface, R_sys = r₀ + t₀ R t̄ / (1 − R r̄) with t₀ = 1 − r₀ − a₀ and
 * t̄ = 1 − r̄ − ā, expanded to first order in τ gives the change of system reflectance
 *
 *   ΔR(μ₀) = r₀ (1 − R) − R a₀ − R ā − R r̄ (1 − R)
 *          = (τ/μ₀) [β(μ₀) ω (1 − R) − R (1 − ω)] − 2τ R [(1 − ω) + β_d ω (1 − R)].
 *
 * With T the one-way transmittance above the layer (applied twice) and A_c the cloud fraction, the
 * instantaneous forcing is ΔF(μ₀) = −S₀ (d̄/d)² μ₀ T² (1 − A_c) ΔR(μ₀), and the daily mean is the
 * flux-weighted sum of ΔR over the sunlit-day quadrature nodes.
 *
 * Reduction to the global-mean form: with β constant (β_d = β), μ₀ ΔR = τ[βω(1 − R) − R(1 − ω)]
 * − 2μ₀ τ R[(1 − ω) + βω(1 − R)]. Averaged over the globe and the day, ⟨S μ₀⟩ = S₀/4 while the sunlit
 * fraction gives ⟨S · 1⟩ = S₀/2 (mean μ₀ over the sunlit hemisphere = 1/2), so
 *   ⟨ΔF⟩ = −T²(1 − A_c) τ { (S₀/2)[βω(1 − R) − R(1 − ω)] − (S₀/2)R[(1 − ω) + βω(1 − R)] }
 *        = −(S₀/4) T² (1 − A_c) [2 (1 − R)² β ω τ − 4 R (1 − ω) τ],
 * exactly the Chylek & Wong (1995) / Haywood & Shine (1995) expression: its factor 2 is the mean slant
 * path 1/⟨μ₀⟩ = 2 (direct beam) and the diffusivity factor 2 (diffuse light). The test suite checks this
 * reduction numerically by averaging the daily means over latitude.
 */

/**
 * Change of the reflectance of the layer + surface system caused by a thin aerosol layer at sun angle μ₀
 * (first order in τ/μ₀; see the derivation above). Dimensionless; positive = brighter = cooling.
 * Domain: 0 < μ₀ ≤ 1 with τ/μ₀ ≪ 1.
 */
export function thinLayerReflectanceChange(input: SlantThinLayerInput, cosZenith: number): number {
  checkRangeOpenLow('cosZenith', cosZenith, 0, 1)
  const { betaD } = checkSlant(input)
  return reflectanceChangeUnchecked(input, cosZenith, betaD)
}

function reflectanceChangeUnchecked(input: SlantThinLayerInput, mu0: number, betaD: number): number {
  const { tau, omega, surfaceAlbedo: R } = input
  const beta = typeof input.upscatter === 'number' ? input.upscatter : evalChecked('upscatter', input.upscatter, mu0, 0, 1)
  return (tau / mu0) * (beta * omega * (1 - R) - R * (1 - omega)) - 2 * tau * R * (1 - omega + betaD * omega * (1 - R))
}

export interface DailyMeanForcingResult {
  /** 24-hour mean TOA forcing, W m⁻² (0 in polar night). */
  forcingWm2: number
  /** 24-hour mean TOA insolation, W m⁻². */
  insolationWm2: number
  /** Day length, hours. */
  dayLengthHours: number
}

/**
 * Daily-mean (24 h) direct forcing of a thin aerosol layer at a latitude and day of year, using the
 * slant-path thin-layer form (derivation above) averaged with {@link sunlitDayQuadrature}:
 *   ΔF_day = −(1 − A_c) Σᵢ fluxWeightᵢ T(μ₀ᵢ)² ΔR(μ₀ᵢ).
 * W m⁻²; exactly 0 in polar night. Domain as for {@link thinLayerReflectanceChange}; nodes 4..64.
 */
export function dailyMeanThinLayerForcing(
  input: SlantThinLayerInput & { latitudeDeg: number; dayOfYear: number; nodes?: number }
): DailyMeanForcingResult {
  const { T, Ac, S0, betaD } = checkSlant(input)
  const q = sunlitDayQuadrature(input.latitudeDeg, input.dayOfYear, input.nodes ?? 20, S0)
  let f = 0
  for (let i = 0; i < q.cosZenith.length; i++) {
    const mu = q.cosZenith[i]
    const t = typeof T === 'number' ? T : evalChecked('transmittance', T, mu, 0, 1)
    f -= q.fluxWeightsWm2[i] * t * t * reflectanceChangeUnchecked(input, mu, betaD)
  }
  return { forcingWm2: f * (1 - Ac), insolationWm2: q.insolationWm2, dayLengthHours: q.dayLengthHours }
}
