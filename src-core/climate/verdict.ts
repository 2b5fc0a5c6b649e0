/**
 * Plain-words verdict (cools / warms / too close to call), a forcing map over surface albedo and ω, and
 * the planetary effective emission temperature.
 */
import { InputError } from '../errors.ts'
import { DEFAULT_ATMOSPHERIC_TRANSMITTANCE, DEFAULT_CLOUD_FRACTION, SOLAR_CONSTANT_WM2, STEFAN_BOLTZMANN_WM2K4 } from './constants.ts'
import { criticalSingleScatteringAlbedo, signFlipSurfaceAlbedo, thinLayerEfficiency, thinLayerForcing } from './thinLayer.ts'
import { twoStreamEquivalentUpscatter, twoStreamForcing } from './twoStream.ts'
import { atmosphereAbove, checkInteger, checkRange, checkRangeOpenLow } from './validate.ts'

/** The caution every verdict carries. */
export const FORCING_CAUTION =
  'First-order, screening estimate of the direct forcing of a uniform aerosol layer, not a climate projection; ' +
  'any decision taken on it rests with qualified review under the local occupational-health and environmental ' +
  'rules and the organisation’s own procedures.'

/** Default margin below which the sign of the forcing is not called, W m⁻². */
export const DEFAULT_VERDICT_MARGIN_WM2 = 0.5

export type ForcingVerdictWord = 'cools' | 'warms' | 'too close to call'

export interface ForcingVerdictInput {
  /** Aerosol optical depth τ, 0..10. */
  tau: number
  /** Single-scattering albedo ω, 0..1. */
  omega: number
  /** Surface albedo R_s, 0..1. */
  surfaceAlbedo: number
  /** 'thin-layer' (default; needs upscatter) or 'two-stream' (needs asymmetry). */
  method?: 'thin-layer' | 'two-stream'
  /**
   * Mean upscatter fraction β̄, 0..1: needed by the thin-layer method; with the two-stream method optional, and
   * then the layer's single scattering uses it too (see twoStream.ts), so both methods assume the same scattering.
   */
  upscatter?: number
  /** Asymmetry parameter g, 0..0.99 (two-stream method). */
  asymmetry?: number
  /**
   * Sun angle for the two-stream method, default μ₀ = 0.5 (the flux-weighted mean daytime slant path of
   * the globe; with incident flux S₀/4 this makes the two-stream reduce to the thin-layer global mean).
   */
  cosZenith?: number
  /** One-way transmittance above the layer, default 0.76. */
  transmittance?: number
  /** Cloud fraction, default 0.6. */
  cloudFraction?: number
  /** Solar constant, default 1361 W m⁻². */
  solarConstant?: number
  /** |ΔF| below this is "too close to call", W m⁻² (default 0.5; give your uncertainty). */
  marginWm2?: number
}

export interface ForcingVerdict {
  verdict: ForcingVerdictWord
  method: 'thin-layer' | 'two-stream'
  /** Global-mean TOA forcing, W m⁻² (negative = cooling). */
  forcingWm2: number
  marginWm2: number
  omega: number
  /** ω above which this layer cools over this surface. */
  omegaCritical: number
  surfaceAlbedo: number
  /** Surface albedo above which a layer with this ω warms. */
  flipSurfaceAlbedo: number
  /** The numbers that decide it, in words. */
  explanation: string
  /** Always present: what this estimate is and is not. */
  caution: string
}

/** A number for the explanation's words, with the minus sign U+2212 (typographic practice for written text). */
function fmt(x: number, digits = 3): string {
  return Number.isFinite(x) ? Number(x.toPrecision(digits)).toString().replace(/-/g, '\u2212') : String(x)
}

/** Largest x in [0, 1] with pred(x) true, assuming pred is true below and false above a single switch. */
function bisectSwitch(pred: (x: number) => boolean): number {
  if (!pred(0)) return 0
  if (pred(1)) return 1
  let lo = 0
  let hi = 1
  for (let i = 0; i < 50; i++) {
    const mid = 0.5 * (lo + hi)
    if (pred(mid)) lo = mid
    else hi = mid
  }
  return 0.5 * (lo + hi)
}

/**
 * Says whether a uniform aerosol layer cools or warms (global-mean TOA direct forcing), or that |ΔF| is
 * below the margin. Thin-layer method: Chylek & Wong (1995) with ω_crit and the flip albedo in closed
 * form. Two-stream method: delta-Eddington + adding at μ₀ (default 0.5) with incident flux S₀/4, with
 * ω_crit and the flip albedo found by bisection (ΔF decreases monotonically with ω and increases with R_s).
 * Always carries {@link FORCING_CAUTION}.
 */
export function forcingVerdict(input: ForcingVerdictInput): ForcingVerdict {
  const method = input.method ?? 'thin-layer'
  const margin = input.marginWm2 ?? DEFAULT_VERDICT_MARGIN_WM2
  checkRange('marginWm2', margin, 0, 1e4, 'W m⁻²')
  checkRange('tau', input.tau, 0, 10)
  checkRange('omega', input.omega, 0, 1)
  checkRange('surfaceAlbedo', input.surfaceAlbedo, 0, 1)
  const common = {
    transmittance: input.transmittance ?? DEFAULT_ATMOSPHERIC_TRANSMITTANCE,
    cloudFraction: input.cloudFraction ?? DEFAULT_CLOUD_FRACTION,
    solarConstant: input.solarConstant ?? SOLAR_CONSTANT_WM2
  }
  let forcing: number
  let omegaCrit: number
  let flip: number
  let detail: string
  if (method === 'thin-layer') {
    if (input.upscatter === undefined) {
      throw new InputError('upscatter', 'the thin-layer method needs the mean upscatter fraction β̄', "Give upscatter (0..1), or use method 'two-stream' with an asymmetry parameter.")
    }
    const r = thinLayerForcing({ tau: input.tau, omega: input.omega, upscatter: input.upscatter, surfaceAlbedo: input.surfaceAlbedo, ...common })
    forcing = r.forcingWm2
    omegaCrit = r.omegaCritical
    flip = r.flipSurfaceAlbedo
    detail = `thin-layer estimate with β̄ = ${fmt(input.upscatter)}`
  } else if (method === 'two-stream') {
    if (input.asymmetry === undefined) {
      throw new InputError('asymmetry', 'the two-stream method needs the asymmetry parameter g', "Give asymmetry (0..0.99), or use method 'thin-layer' with an upscatter fraction.")
    }
    const mu0 = input.cosZenith ?? 0.5
    checkRangeOpenLow('cosZenith', mu0, 0, 1)
    const g = input.asymmetry
    const inc = common.solarConstant / 4
    const up = input.upscatter
    const toa = (omega: number, Rs: number) =>
      twoStreamForcing({ tau: input.tau, omega, asymmetry: g, upscatter: up, cosZenith: mu0, surfaceAlbedo: Rs, incidentFluxWm2: inc, ...common }).toaWm2
    forcing = toa(input.omega, input.surfaceAlbedo)
    if (input.tau === 0) {
      // no layer: show the thin-limit values with the given upscatter, or the two-stream equivalent one at this μ₀
      const beta = up ?? twoStreamEquivalentUpscatter(g, mu0)
      omegaCrit = criticalSingleScatteringAlbedo(input.surfaceAlbedo, beta)
      flip = signFlipSurfaceAlbedo(input.omega, beta)
      detail = `no layer (τ = 0); critical values are the thin limit with β̄ = ${fmt(beta)}`
    } else {
      // ω_crit: smallest ω that cools; flip albedo: largest R_s that still cools
      omegaCrit = 1 - bisectSwitch((x) => toa(1 - x, input.surfaceAlbedo) < 0)
      flip = bisectSwitch((x) => toa(input.omega, x) < 0)
      detail = `delta-Eddington two-stream at μ₀ = ${fmt(mu0)} with g = ${fmt(g)} and ${up === undefined ? `its own upscatter fraction (β = ${fmt(twoStreamEquivalentUpscatter(g, mu0))} at this μ₀)` : `β̄ = ${fmt(up)}`}`
    }
  } else {
    throw new InputError('method', `"${String(method)}" is not a known method`, "Use 'thin-layer' or 'two-stream'.")
  }
  const verdict: ForcingVerdictWord = Math.abs(forcing) < margin ? 'too close to call' : forcing < 0 ? 'cools' : 'warms'
  const side = input.omega > omegaCrit ? 'above' : input.omega < omegaCrit ? 'below' : 'equal to'
  const explanation =
    `ΔF = ${fmt(forcing)} W m⁻² (${detail}; margin ${fmt(margin)} W m⁻²). ` +
    `ω = ${fmt(input.omega)} is ${side} the critical ω_crit = ${fmt(omegaCrit)} for surface albedo ${fmt(input.surfaceAlbedo)}; ` +
    `a layer with this ω cools over surfaces darker than albedo ${fmt(flip)} and warms over brighter ones.`
  return {
    verdict,
    method,
    forcingWm2: forcing,
    marginWm2: margin,
    omega: input.omega,
    omegaCritical: omegaCrit,
    surfaceAlbedo: input.surfaceAlbedo,
    flipSurfaceAlbedo: flip,
    explanation,
    caution: FORCING_CAUTION
  }
}

export interface ForcingMapInput {
  /** Number of surface-albedo grid points over [0, 1], 2..2000. */
  nSurfaceAlbedo: number
  /** Number of ω grid points over [omegaMin, omegaMax], 2..2000. */
  nOmega: number
  /** Optical depth τ, 0..10. */
  tau: number
  /** Mean upscatter fraction β̄, 0 < β̄ ≤ 1. */
  upscatter: number
  /** Lower end of the ω axis, default 0.5. */
  omegaMin?: number
  /** Upper end of the ω axis, default 1. */
  omegaMax?: number
  transmittance?: number
  cloudFraction?: number
  solarConstant?: number
  /**
   * A forcing added everywhere on the map, W m⁻² (the layer's infrared part, which depends on neither the surface's
   * albedo nor the visible ω): gives the net zero line. Default 0.
   */
  offsetWm2?: number
}

export interface ForcingMap {
  /** Surface-albedo axis, evenly spaced over [0, 1]. */
  surfaceAlbedo: Float64Array
  /** ω axis, evenly spaced over [omegaMin, omegaMax]. */
  omega: Float64Array
  /** Thin-layer forcing, W m⁻², row-major by ω: value at (R_s[i], ω[j]) is forcingWm2[j * nSurfaceAlbedo + i]. */
  forcingWm2: Float64Array
  /**
   * Zero-forcing line as a polyline (R_s, ω_crit(R_s)) inside the map: it starts where ω_crit = omegaMin
   * (at R_s = flip albedo of omegaMin) and follows the R_s grid up to R_s = 1 (ω_crit = 1).
   * Empty if omegaMin ≥ 1.
   */
  zeroLine: { surfaceAlbedo: Float64Array; omegaCritical: Float64Array }
  /**
   * Where the thin-layer forcing plus offsetWm2 is zero, at the R_s grid points where that ω lies on the map: the
   * thin-layer form is linear in ω, so ω = (4R_s + L/(Cτ)) / (2(1 − R_s)²β̄ + 4R_s) with C = (S₀/4)T²(1 − A_c).
   * Empty without an offset or a layer.
   */
  netZeroLine: { surfaceAlbedo: Float64Array; omega: Float64Array }
}

/**
 * Thin-layer (Chylek & Wong 1995) forcing over a grid of surface albedo 0..1 and ω omegaMin..omegaMax,
 * with the zero line ω_crit(R_s) as a polyline. Returned as typed arrays for plotting.
 */
export function forcingMap(input: ForcingMapInput): ForcingMap {
  checkInteger('nSurfaceAlbedo', input.nSurfaceAlbedo, 2, 2000)
  checkInteger('nOmega', input.nOmega, 2, 2000)
  checkRangeOpenLow('upscatter', input.upscatter, 0, 1)
  const wMin = input.omegaMin ?? 0.5
  const wMax = input.omegaMax ?? 1
  checkRange('omegaMin', wMin, 0, 1)
  checkRange('omegaMax', wMax, 0, 1)
  if (wMax <= wMin) throw new InputError('omegaMax', `${wMax} is not above omegaMin = ${wMin}`, 'Give omegaMax larger than omegaMin.')
  const nR = input.nSurfaceAlbedo
  const nW = input.nOmega
  const R = new Float64Array(nR)
  const W = new Float64Array(nW)
  for (let i = 0; i < nR; i++) R[i] = i / (nR - 1)
  for (let j = 0; j < nW; j++) W[j] = wMin + ((wMax - wMin) * j) / (nW - 1)
  const F = new Float64Array(nR * nW)
  // the inputs every cell shares are checked once (a cell's ω and R_s lie in [0, 1] by construction)
  checkRange('tau', input.tau, 0, 10)
  const { T, Ac, S0 } = atmosphereAbove(input)
  for (let j = 0; j < nW; j++) {
    for (let i = 0; i < nR; i++) F[j * nR + i] = input.tau * thinLayerEfficiency(S0, T, Ac, R[i], input.upscatter, W[j])
  }
  const xs: number[] = []
  const ys: number[] = []
  if (wMin < 1) {
    const r0 = signFlipSurfaceAlbedo(wMin, input.upscatter)
    xs.push(r0)
    ys.push(wMin)
    for (let i = 0; i < nR; i++) {
      if (R[i] <= r0) continue
      xs.push(R[i])
      ys.push(criticalSingleScatteringAlbedo(R[i], input.upscatter))
    }
  }
  const L = input.offsetWm2 ?? 0
  checkRange('offsetWm2', L, -1e4, 1e4, 'W m⁻²')
  const nx: number[] = []
  const ny: number[] = []
  const ct = (S0 / 4) * T * T * (1 - Ac) * input.tau
  if (L !== 0 && ct > 0) {
    for (let i = 0; i < nR; i++) {
      const den = 2 * (1 - R[i]) ** 2 * input.upscatter + 4 * R[i]
      const w = (4 * R[i] + L / ct) / den
      if (w >= wMin && w <= wMax) {
        nx.push(R[i])
        ny.push(w)
      }
    }
  }
  return {
    surfaceAlbedo: R,
    omega: W,
    forcingWm2: F,
    zeroLine: { surfaceAlbedo: Float64Array.from(xs), omegaCritical: Float64Array.from(ys) },
    netZeroLine: { surfaceAlbedo: Float64Array.from(nx), omega: Float64Array.from(ny) }
  }
}

/**
 * Effective emission temperature of a planet in radiative balance, T_e = [S₀ (1 − A) / (4σ)]^{1/4}, K
 * (common practice; ≈ 255 K for Earth with planetary albedo A = 0.3). Domain: 0 ≤ A ≤ 1, S₀ ≥ 0.
 */
export function effectiveEmissionTemperature(planetaryAlbedo: number, solarConstant: number = SOLAR_CONSTANT_WM2): number {
  checkRange('planetaryAlbedo', planetaryAlbedo, 0, 1)
  checkRange('solarConstant', solarConstant, 0, 1e5, 'W m⁻²')
  return ((solarConstant * (1 - planetaryAlbedo)) / (4 * STEFAN_BOLTZMANN_WM2K4)) ** 0.25
}
