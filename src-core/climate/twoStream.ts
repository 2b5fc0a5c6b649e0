/**
 * Beyond the thin limit: a delta-Eddington two-stream layer and the adding method with a Lambertian
 * surface.
 *
 * Delta-Eddington: Joseph, J. H., Wiscombe, W. J. & Weinman, J. A. (1976), "The delta-Eddington
 * approximation for radiative flux transfer", J. Atmos. Sci. 33, 2452–2459. The forward diffraction peak
 * (fraction f = g²) is treated as unscattered: τ' = (1 − ωf) τ, ω' = (1 − f) ω / (1 − ωf), g' = g/(1 + g).
 *
 * Two-stream equations in the generalized form of Meador, W. E. & Weaver, W. R. (1980), "Two-stream
 * approximations to radiative transfer in planetary atmospheres: a unified description of existing
 * methods and a new improvement", J. Atmos. Sci. 37, 630–643, with their Eddington coefficients
 *   γ₁ = (7 − ω(4 + 3g))/4,  γ₂ = −(1 − ω(4 − 3g))/4,  γ₃ = (2 − 3gμ₀)/4,  γ₄ = 1 − γ₃,
 *   dF↑/dτ =  γ₁F↑ − γ₂F↓ − γ₃ ω πF_s e^{−τ/μ₀},   dF↓/dτ = γ₂F↑ − γ₁F↓ + γ₄ ω πF_s e^{−τ/μ₀}.
 * Solved here directly (not from a recalled closed form): homogeneous modes with eigenvalues ±k,
 * k² = γ₁² − γ₂² = 3(1 − ω)(1 − ωg), eigenvectors (γ₁ + k, γ₂) for e^{+kτ} and (γ₂, γ₁ + k) for e^{−kτ}
 * (scaled so that nothing overflows), the particular solution Z e^{−τ/μ₀} with
 *   Z↑ = ω(γ₃ − α₂μ₀)/(1 − k²μ₀²),  Z↓ = −ω(γ₄ + α₁μ₀)/(1 − k²μ₀²),  α₁ = γ₁γ₄ + γ₂γ₃, α₂ = γ₁γ₃ + γ₂γ₄
 * (for unit incident flux on a horizontal surface), and the boundary conditions F↓(0) = 0, F↑(τ₁) = 0 (τ₁ = layer optical depth).
 * When k μ₀ = 1 the particular solution is singular (the full solution is not): μ₀ is moved by 2 parts
 * in 10⁶. When ω = 1 (k = 0) the homogeneous solution is linear in τ and is used as such.
 * The absorptance is computed independently of R and T from the flux divergence,
 *   A = (1 − ω') [ 2 ∫₀^τ₁ (F↑ + F↓) dτ + 1 − e^{−τ₁/μ₀} ],
 * so that R + T + A = 1 is a real check of the solution.
 *
 * Optional upscatter fraction β (the share of singly scattered sunlight the phase function sends into the upper
 * hemisphere, e.g. a population's β̄): the source term then takes the phase function's own β instead of the
 * Eddington phase function's, γ₃ = β/(1 − f) (delta-scaled: the forward peak f = g² carries no upscatter; capped
 * at 1), as Coakley, J. A. & Chýlek, P. (1975), "The two-stream approximation in radiative transfer: including
 * the angle of the incident radiation", J. Atmos. Sci. 32, 409–418, feed the direct beam its own upscatter
 * fraction. γ₃ only splits the singly scattered beam between up and down (γ₃ + γ₄ = 1), so R + T + A = 1 holds
 * for any β. To first order in τ, at μ₀ = 1/2 (where the beam's slant path 1/μ₀ equals the mean path 2 of
 * diffuse light), the layer over a Lambertian surface then changes the reflectance by
 *   ΔR = 2τ [ (1 − R_s)² β ω − 2 R_s (1 − ω) ],
 * the thin-layer form of Chylek & Wong (1995): with the same β̄ both methods agree as τ → 0.
 */
import { sunlitDayQuadrature } from './insolation.ts'
import { gaussLegendreOn } from '../numeric/index.ts'
import { atmosphereAbove, checkRange, checkRangeOpenLow } from './validate.ts'

/** Largest asymmetry parameter accepted (the delta scaling degenerates as g → 1). */
const G_MAX = 0.99

export interface TwoStreamLayerInput {
  /** Optical depth τ of the layer, 0..1000. */
  tau: number
  /** Single-scattering albedo ω, 0..1. */
  omega: number
  /** Asymmetry parameter g, 0..0.99. */
  asymmetry: number
  /**
   * Upscatter fraction β of the single scattering, 0..1, used at every sun angle (give the population's β̄ to
   * compare like with like with the thin-layer form). Omitted: the Eddington phase function's own,
   * γ₃ = (2 − 3g′μ₀)/4, whose thin-limit equivalent is {@link twoStreamEquivalentUpscatter}.
   */
  upscatter?: number
}

export interface DeltaScaled {
  tau: number
  omega: number
  asymmetry: number
  /** Delta-scaled upscatter fraction β/(1 − g²), capped at 1, when the layer was given β; else undefined. */
  upscatter?: number
}

/**
 * Delta-Eddington scaling (Joseph, Wiscombe & Weinman 1976): f = g², τ' = (1 − ωf)τ,
 * ω' = (1 − f)ω/(1 − ωf), g' = g/(1 + g). Domain as {@link TwoStreamLayerInput}.
 */
export function deltaEddingtonScaling(layer: TwoStreamLayerInput): DeltaScaled {
  checkLayer(layer)
  return scaleUnchecked(layer)
}

function checkLayer(l: TwoStreamLayerInput): void {
  checkRange('tau', l.tau, 0, 1000)
  checkRange('omega', l.omega, 0, 1)
  checkRange('asymmetry', l.asymmetry, 0, G_MAX)
  if (l.upscatter !== undefined) checkRange('upscatter', l.upscatter, 0, 1)
}

function scaleUnchecked(l: TwoStreamLayerInput): DeltaScaled {
  const f = l.asymmetry * l.asymmetry
  const d = 1 - l.omega * f
  const scaled: DeltaScaled = { tau: d * l.tau, omega: ((1 - f) * l.omega) / d, asymmetry: l.asymmetry / (1 + l.asymmetry) }
  if (l.upscatter !== undefined) scaled.upscatter = Math.min(1, l.upscatter / (1 - f))
  return scaled
}

/** Response of a layer over a black surface to a direct beam of unit flux on a horizontal surface. */
export interface DirectBeamResponse {
  /** Reflectance (diffuse, up out of the top). */
  reflectance: number
  /** Diffuse transmittance (out of the bottom, scattered). */
  diffuseTransmittance: number
  /** Direct transmittance e^{−τ'/μ₀} (delta-scaled: includes the forward-peak light). */
  directTransmittance: number
  /** Absorptance, from the flux divergence (independent of R and T). */
  absorptance: number
}

/** Solves the scaled Eddington layer for one μ₀ (no input checks). */
function solveScaled(tau: number, w: number, g: number, mu0In: number, beta?: number): DirectBeamResponse {
  const g1 = (7 - w * (4 + 3 * g)) / 4
  const g2 = -(1 - w * (4 - 3 * g)) / 4
  const k = Math.sqrt(Math.max(0, 3 * (1 - w) * (1 - w * g)))
  let mu0 = mu0In
  if (Math.abs(1 - k * k * mu0 * mu0) < 1e-6) mu0 *= (mu0 * 1.000002 <= 1) ? 1.000002 : 0.999998
  const g3 = beta ?? (2 - 3 * g * mu0) / 4
  const g4 = 1 - g3
  const a1 = g1 * g4 + g2 * g3
  const a2 = g1 * g3 + g2 * g4
  const den = 1 - k * k * mu0 * mu0
  const zu = (w * (g3 - a2 * mu0)) / den
  const zd = (-w * (g4 + a1 * mu0)) / den
  const eb = Math.exp(-tau / mu0)

  // Homogeneous modes h1, h2 as functions returning [up, down] and their integrals over [0, τ].
  let h1u0: number, h1d0: number, h1uT: number, h1dT: number, h2u0: number, h2d0: number, h2uT: number, h2dT: number
  let int1: number, int2: number // ∫ (up + down) dτ of each mode
  if (k > 1e-6) {
    const ek = Math.exp(-k * tau)
    const e1 = -Math.expm1(-k * tau) / k // (1 − e^{−kτ})/k
    // h1 = (g1 + k, g2) e^{−k(τ* − τ)},  h2 = (g2, g1 + k) e^{−kτ}
    h1u0 = (g1 + k) * ek
    h1d0 = g2 * ek
    h1uT = g1 + k
    h1dT = g2
    h2u0 = g2
    h2d0 = g1 + k
    h2uT = g2 * ek
    h2dT = (g1 + k) * ek
    int1 = (g1 + k + g2) * e1
    int2 = (g2 + g1 + k) * e1
  } else {
    // conservative: F = c + τ M c with M = [[g1, −g1], [g1, −g1]]; basis (1, 1) and (1 + g1τ, g1τ)
    h1u0 = 1
    h1d0 = 1
    h1uT = 1
    h1dT = 1
    h2u0 = 1
    h2d0 = 0
    h2uT = 1 + g1 * tau
    h2dT = g1 * tau
    int1 = 2 * tau
    int2 = tau + g1 * tau * tau
  }
  // Boundary conditions: c1 h1d0 + c2 h2d0 = −zd ;  c1 h1uT + c2 h2uT = −zu eb
  const det = h1d0 * h2uT - h2d0 * h1uT
  const b1 = -zd
  const b2 = -zu * eb
  const c1 = (b1 * h2uT - h2d0 * b2) / det
  const c2 = (h1d0 * b2 - b1 * h1uT) / det
  const R = c1 * h1u0 + c2 * h2u0 + zu
  const Td = c1 * h1dT + c2 * h2dT + zd * eb
  const oneMinusEb = -Math.expm1(-tau / mu0)
  const intF = c1 * int1 + c2 * int2 + (zu + zd) * mu0 * oneMinusEb
  const A = (1 - w) * (2 * intF + oneMinusEb)
  return { reflectance: R, diffuseTransmittance: Td, directTransmittance: eb, absorptance: A }
}

/**
 * Delta-Eddington reflectance, transmittance and absorptance of a plane-parallel layer over a black
 * surface for a direct solar beam at cos(zenith) μ₀ (fractions of the incident flux on a horizontal
 * surface). Domain: τ 0..1000, ω 0..1, g 0..0.99, 0 < μ₀ ≤ 1. Accuracy of delta-Eddington: typically a
 * few percent (absolute) in reflectance, worse at grazing sun.
 */
export function deltaEddingtonDirectBeam(layer: TwoStreamLayerInput, cosZenith: number): DirectBeamResponse {
  checkLayer(layer)
  checkRangeOpenLow('cosZenith', cosZenith, 0, 1)
  const s = scaleUnchecked(layer)
  return solveScaled(s.tau, s.omega, s.asymmetry, cosZenith, s.upscatter)
}

/** Response of a layer to diffuse (isotropic-radiance) illumination from above (or, by symmetry, below). */
export interface DiffuseResponse {
  reflectance: number
  /** Total transmittance (diffuse + unscattered). */
  transmittance: number
  absorptance: number
}

/**
 * Delta-Eddington layer response to isotropic (diffuse) illumination, by Gauss–Legendre quadrature over
 * incidence angle of the direct-beam response weighted by the flux 2μ dμ:
 *   R̄ = 2∫₀¹ R(μ) μ dμ, T̄ = 2∫₀¹ [T_d(μ) + e^{−τ'/μ}] μ dμ, Ā = 2∫₀¹ A(μ) μ dμ.
 * The layer is homogeneous, so the same values hold for light arriving from below. Domain as
 * {@link deltaEddingtonDirectBeam}; nodes 4..64 (default 16).
 */
export function deltaEddingtonDiffuse(layer: TwoStreamLayerInput, nodes = 16): DiffuseResponse {
  checkLayer(layer)
  checkRange('nodes', nodes, 4, 64)
  return diffuseUnchecked(scaleUnchecked(layer), Math.round(nodes))
}

function diffuseUnchecked(s: DeltaScaled, nodes: number): DiffuseResponse {
  const { nodes: x, weights: w } = gaussLegendreOn(nodes, 0, 1)
  let R = 0
  let T = 0
  let A = 0
  for (let i = 0; i < nodes; i++) {
    const r = solveScaled(s.tau, s.omega, s.asymmetry, x[i], s.upscatter)
    const wt = 2 * w[i] * x[i]
    R += wt * r.reflectance
    T += wt * (r.diffuseTransmittance + r.directTransmittance)
    A += wt * r.absorptance
  }
  return { reflectance: R, transmittance: T, absorptance: A }
}

/** Fractions of the incident direct flux for layer + Lambertian surface. They sum to 1. */
export interface LayerOverSurface {
  /** System (planetary) reflectance. */
  reflectance: number
  /** Fraction absorbed by the surface. */
  surfaceAbsorptance: number
  /** Fraction absorbed in the layer. */
  layerAbsorptance: number
}

/**
 * Adding method: a delta-Eddington layer over a Lambertian surface of albedo R_s, for a direct beam at μ₀.
 * With direct-beam R(μ₀), total transmittance T(μ₀) = T_d + e^{−τ'/μ₀}, absorptance A(μ₀), and diffuse
 * R̄, T̄, Ā of the layer, the multiple reflections between surface and layer sum to 1/(1 − R_s R̄):
 *   reflectance         = R + T R_s T̄ / (1 − R_s R̄)
 *   surface absorptance = T (1 − R_s) / (1 − R_s R̄)
 *   layer absorptance   = A + T R_s Ā / (1 − R_s R̄)
 * (e.g. Liou 2002, An Introduction to Atmospheric Radiation, ch. 6; standard adding). Domain as
 * {@link deltaEddingtonDirectBeam} plus 0 ≤ R_s ≤ 1.
 */
export function layerOverLambertianSurface(layer: TwoStreamLayerInput, cosZenith: number, surfaceAlbedo: number): LayerOverSurface {
  checkLayer(layer)
  checkRangeOpenLow('cosZenith', cosZenith, 0, 1)
  checkRange('surfaceAlbedo', surfaceAlbedo, 0, 1)
  const s = scaleUnchecked(layer)
  return addSurface(solveScaled(s.tau, s.omega, s.asymmetry, cosZenith, s.upscatter), diffuseUnchecked(s, 16), surfaceAlbedo)
}

function addSurface(d: DirectBeamResponse, dif: DiffuseResponse, Rs: number): LayerOverSurface {
  const T = d.diffuseTransmittance + d.directTransmittance
  const m = 1 / (1 - Rs * dif.reflectance)
  return {
    reflectance: d.reflectance + T * Rs * dif.transmittance * m,
    surfaceAbsorptance: T * (1 - Rs) * m,
    layerAbsorptance: d.absorptance + T * Rs * dif.absorptance * m
  }
}

/**
 * Effective upscatter fraction of the direct beam implied by the delta-Eddington two-stream in the thin
 * limit: its first-order reflectance is ω'τ'γ₃/μ₀ = ωτ (1 − g²)(2 − 3g'μ₀)/4 / μ₀, so
 *   β_eff(μ₀) = (1 − g²)(2 − 3 μ₀ g/(1 + g))/4.
 * Use it as β in the thin-layer formulas to compare like with like. Domain: g 0..0.99, 0 < μ₀ ≤ 1.
 */
export function twoStreamEquivalentUpscatter(asymmetry: number, cosZenith: number): number {
  checkRange('asymmetry', asymmetry, 0, G_MAX)
  checkRangeOpenLow('cosZenith', cosZenith, 0, 1)
  return ((1 - asymmetry * asymmetry) * (2 - (3 * cosZenith * asymmetry) / (1 + asymmetry))) / 4
}

export interface TwoStreamForcingInput extends TwoStreamLayerInput {
  /** Cosine of the solar zenith angle μ₀, 0 < μ₀ ≤ 1. */
  cosZenith: number
  /** Surface albedo R_s, 0..1. */
  surfaceAlbedo: number
  /**
   * Incident flux on a horizontal surface above the layer (before the T² and (1 − A_c) factors are
   * applied), W m⁻². Default S₀ μ₀.
   */
  incidentFluxWm2?: number
  /** One-way transmittance above the layer (applied twice), 0..1; default 0.76. */
  transmittance?: number
  /** Cloud fraction (the cloudy part is taken as unforced), 0..1; default 0.6. */
  cloudFraction?: number
  /** Solar constant, W m⁻²; default 1361 (used only when incidentFluxWm2 is not given). */
  solarConstant?: number
}

export interface TwoStreamForcingResult {
  /** Change of net downward flux at the top of the atmosphere, W m⁻² (negative = cooling). */
  toaWm2: number
  /** Change of net downward flux at the surface, W m⁻² (≤ 0 for any aerosol: surface dimming). */
  surfaceWm2: number
  /** toa − surface: extra solar absorption in the layer (atmospheric heating), W m⁻². */
  atmosphereWm2: number
  /** Flux that the fractions are multiplied by: incident × T² × (1 − A_c), W m⁻². */
  effectiveIncidentWm2: number
  /** Layer + surface fractions, and the surface alone for reference. */
  withLayer: LayerOverSurface
  withoutLayer: LayerOverSurface
}

/**
 * Direct forcing of a uniform aerosol layer computed with the delta-Eddington layer and the adding
 * method with a Lambertian surface: the clear-sky layer vs. no layer, at one sun angle. The flux
 * differences are scaled by F = incident × T² × (1 − A_c) (the T² two-way factor is the usual
 * screening approximation, applied to all three terms alike). Domain as {@link layerOverLambertianSurface}.
 */
export function twoStreamForcing(input: TwoStreamForcingInput): TwoStreamForcingResult {
  checkLayer(input)
  checkRangeOpenLow('cosZenith', input.cosZenith, 0, 1)
  checkRange('surfaceAlbedo', input.surfaceAlbedo, 0, 1)
  const { T, Ac, S0 } = atmosphereAbove(input)
  const inc = input.incidentFluxWm2 ?? S0 * input.cosZenith
  checkRange('incidentFluxWm2', inc, 0, 1e5, 'W m⁻²')
  const s = scaleUnchecked(input)
  const withLayer = addSurface(solveScaled(s.tau, s.omega, s.asymmetry, input.cosZenith, s.upscatter), diffuseUnchecked(s, 16), input.surfaceAlbedo)
  return forcingFromFractions(withLayer, input.surfaceAlbedo, inc * T * T * (1 - Ac))
}

function forcingFromFractions(withLayer: LayerOverSurface, Rs: number, F: number): TwoStreamForcingResult {
  const withoutLayer: LayerOverSurface = { reflectance: Rs, surfaceAbsorptance: 1 - Rs, layerAbsorptance: 0 }
  const toa = -F * (withLayer.reflectance - Rs)
  const sfc = F * (withLayer.surfaceAbsorptance - (1 - Rs))
  return { toaWm2: toa, surfaceWm2: sfc, atmosphereWm2: toa - sfc, effectiveIncidentWm2: F, withLayer, withoutLayer }
}

export interface DailyTwoStreamInput extends TwoStreamLayerInput {
  /** Surface albedo R_s, 0..1. */
  surfaceAlbedo: number
  /** Latitude, −90..90°. */
  latitudeDeg: number
  /** Day of year, 1 ≤ d < 367. */
  dayOfYear: number
  /** One-way transmittance above the layer, 0..1; default 0.76. */
  transmittance?: number
  /** Cloud fraction, 0..1; default 0.6. */
  cloudFraction?: number
  /** Solar constant, W m⁻²; default 1361. */
  solarConstant?: number
  /** Hour-angle quadrature nodes, 4..64; default 20. */
  nodes?: number
}

export interface DailyTwoStreamResult {
  /** 24-hour mean change of net flux at the top of the atmosphere, W m⁻². */
  toaWm2: number
  /** 24-hour mean change of net flux at the surface, W m⁻². */
  surfaceWm2: number
  /** toa − surface, W m⁻². */
  atmosphereWm2: number
  /** 24-hour mean TOA insolation, W m⁻². */
  insolationWm2: number
  /** Day length, hours. */
  dayLengthHours: number
}

/**
 * Daily-mean (24 h) two-stream forcing at a latitude and day of year: the flux-weighted sum, over the
 * nodes of {@link sunlitDayQuadrature}, of the layer + surface fraction changes times T² (1 − A_c).
 * W m⁻²; exactly 0 in polar night. Domain as {@link twoStreamForcing} plus latitude and day of year.
 */
export function dailyMeanTwoStreamForcing(input: DailyTwoStreamInput): DailyTwoStreamResult {
  checkLayer(input)
  checkRange('surfaceAlbedo', input.surfaceAlbedo, 0, 1)
  const { T, Ac, S0 } = atmosphereAbove(input)
  const q = sunlitDayQuadrature(input.latitudeDeg, input.dayOfYear, input.nodes ?? 20, S0)
  let toa = 0
  let sfc = 0
  if (q.cosZenith.length > 0) {
    const s = scaleUnchecked(input)
    const dif = diffuseUnchecked(s, 16)
    const Rs = input.surfaceAlbedo
    for (let i = 0; i < q.cosZenith.length; i++) {
      const f = forcingFromFractions(addSurface(solveScaled(s.tau, s.omega, s.asymmetry, q.cosZenith[i], s.upscatter), dif, Rs), Rs, q.fluxWeightsWm2[i] * T * T * (1 - Ac))
      toa += f.toaWm2
      sfc += f.surfaceWm2
    }
  }
  return { toaWm2: toa, surfaceWm2: sfc, atmosphereWm2: toa - sfc, insolationWm2: q.insolationWm2, dayLengthHours: q.dayLengthHours }
}
