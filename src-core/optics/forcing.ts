/**
 * A sample's direct-forcing estimate at the study's site: the thin-layer form at 550 nm, weighted over
 * the solar spectrum, through the site's day, and the two-stream layer; the verdict; and the map of
 * forcing over surface albedo and ω. The formulas themselves live in src-core/climate.
 */
import {
  checkLongwaveInput,
  dailyMeanThinLayerForcing,
  DEFAULT_LAYER_HEIGHT_KM,
  DEFAULT_SURFACE_TEMPERATURE_K,
  DEFAULT_WATER_COLUMN_CM,
  LONGWAVE_METHOD,
  longwaveForcing,
  netForcing,
  netVerdict,
  DEFAULT_VERDICT_MARGIN_WM2,
  forcingMap,
  forcingVerdict,
  rayleighOpticalDepth,
  solarBandWeights,
  SOLAR_CONSTANT_WM2,
  surfaceTypeById,
  SURFACE_TYPES,
  thinLayerDepartureWarning,
  thinLayerForcing,
  twoStreamForcing
} from '../climate/index.ts'
import { InputError } from '../errors.ts'
import { readableNumber, readableRange } from '../numberText.ts'
import type { Site } from '../study/model.ts'
import { UPSCATTER_COS_ZENITH } from './upscatter.ts'
import { valueAt } from './sample.ts'
import type { ForcingMapData, LongwaveForcingDetail, LongwaveOptics, SampleForcing, SampleOptics, WavelengthOptics } from './types.ts'

/** Pressure at the top of the aerosol layer, hPa, for the Rayleigh part of the spectral transmittance (common practice: a boundary layer up to ~1.5 km). */
export const LAYER_TOP_PRESSURE_HPA = 850

/** The site's surface albedo: from the surface list, or the custom value. */
export function siteSurfaceAlbedo(site: Site): number {
  if (site.surface === 'custom') {
    if (site.surface_albedo === undefined) throw new InputError('site: surface_albedo', 'a custom surface needs an albedo', 'Give surface_albedo from 0 to 1, or choose a surface from the list.')
    return site.surface_albedo
  }
  return site.surface_albedo ?? surfaceTypeById(site.surface).albedo
}

/** The surface emissivity of a custom surface unless one is given (common practice: most natural surfaces, 0.9–0.99). */
export const CUSTOM_SURFACE_EMISSIVITY = 0.95

/** The site's infrared inputs with their defaults filled in, unchecked (what a form shows before a value is given). */
export function siteLongwaveDefaults(site: Site): { surfaceTemperatureK: number; surfaceEmissivity: number; layerHeightKm: number; waterColumnCm: number } {
  const type = SURFACE_TYPES.find((t) => t.id === site.surface)
  return {
    surfaceTemperatureK: site.surface_temperature_k ?? DEFAULT_SURFACE_TEMPERATURE_K,
    surfaceEmissivity: site.surface_emissivity ?? type?.emissivity ?? CUSTOM_SURFACE_EMISSIVITY,
    layerHeightKm: site.layer_height_km ?? DEFAULT_LAYER_HEIGHT_KM,
    waterColumnCm: site.water_column_cm ?? DEFAULT_WATER_COLUMN_CM
  }
}

/**
 * The surface type's emissivity by infrared band (SurfaceType.emissivityBands), where it has one and the site gives
 * no emissivity of its own (a site's own value is grey), else null.
 */
export function siteEmissivityBands(site: Site): readonly number[] | null {
  if (site.surface_emissivity !== undefined) return null
  return SURFACE_TYPES.find((t) => t.id === site.surface)?.emissivityBands ?? null
}

/** The site's infrared inputs with their defaults filled in, each checked at its field with its range and reason. */
export function siteLongwaveInputs(site: Site): { surfaceTemperatureK: number; surfaceEmissivity: number; layerHeightKm: number; waterColumnCm: number } {
  if (site.surface !== 'custom' && site.surface_emissivity === undefined) surfaceTypeById(site.surface)
  const { surfaceTemperatureK, surfaceEmissivity, layerHeightKm, waterColumnCm } = siteLongwaveDefaults(site)
  checkLongwaveInput('surface_temperature_k', surfaceTemperatureK, 'site: surface_temperature_k')
  checkLongwaveInput('surface_emissivity', surfaceEmissivity, 'site: surface_emissivity')
  checkLongwaveInput('layer_height_km', layerHeightKm, 'site: layer_height_km')
  checkLongwaveInput('water_column_cm', waterColumnCm, 'site: water_column_cm')
  return { surfaceTemperatureK, surfaceEmissivity, layerHeightKm, waterColumnCm }
}

/** The infrared computation of sampleLongwaveForcing, before its detail is written out. */
function longwaveOf(optics: SampleOptics, site: Site): { withheld: string } | { source: LongwaveOptics; inputs: ReturnType<typeof siteLongwaveInputs>; emissivityBands: readonly number[] | null; bands: { tau: number; omega: number; g: number }[]; r: ReturnType<typeof longwaveForcing> } {
  const lw = optics.longwave
  if (!lw || !lw.bands.length) return { withheld: lw?.withheld ?? 'The infrared part was not computed for these optics.' }
  const inputs = siteLongwaveInputs(site)
  const depthKm = optics.layer_depth_m / 1000
  const bands = lw.bands.map((b) => ({ tau: b.ext * 1e-6 * optics.layer_depth_m, omega: Math.min(1, Math.max(0, b.ssa)), g: Math.min(1, Math.max(-1, b.g)) }))
  const emissivityBands = siteEmissivityBands(site)
  const r = longwaveForcing({ bands, ...inputs, surfaceEmissivity: emissivityBands ?? inputs.surfaceEmissivity, layerDepthKm: depthKm, cloudFraction: site.cloud_fraction })
  return { source: lw, inputs, emissivityBands, bands, r }
}

/** The infrared part of a sample's forcing from its band optics and the site, or the reason it is left out. */
export function sampleLongwaveForcing(optics: SampleOptics, site: Site): { detail: LongwaveForcingDetail; toa: number; surface: number } | { withheld: string } {
  const c = longwaveOf(optics, site)
  if ('withheld' in c) return c
  const { source, inputs, emissivityBands, bands, r } = c
  return {
    toa: r.toaWm2,
    surface: r.surfaceWm2,
    detail: {
      surface_temperature_k: inputs.surfaceTemperatureK,
      surface_emissivity: inputs.surfaceEmissivity,
      surface_emissivity_bands: emissivityBands ? [...emissivityBands] : null,
      layer_height_km: inputs.layerHeightKm,
      layer_depth_km: r.layerTopKm - r.layerBottomKm,
      water_column_cm: inputs.waterColumnCm,
      layer_temperature_k: r.layerTemperatureK,
      clear_sky_toa_w_m2: r.clearSkyToaWm2,
      clear_sky_surface_w_m2: r.clearSkySurfaceWm2,
      bands: source.bands.map((b, i) => ({ lo_um: b.lo_um, hi_um: b.hi_um, tau: bands[i].tau, ssa: bands[i].omega, g: bands[i].g, toa_w_m2: r.bandToaWm2[i] })),
      method: LONGWAVE_METHOD
    }
  }
}

/** β(μ₀) of a row, linearly interpolated in μ₀ between the reported nodes (clamped at the ends). */
export function upscatterFunction(row: WavelengthOptics): (mu0: number) => number {
  const mu = UPSCATTER_COS_ZENITH
  const b = row.upscatter_by_cos_zenith
  return (m: number) => {
    if (m <= mu[0]) return b[0]
    if (m >= mu[mu.length - 1]) return b[b.length - 1]
    let i = 0
    while (mu[i + 1] < m) i++
    const t = (m - mu[i]) / (mu[i + 1] - mu[i])
    return b[i] + t * (b[i + 1] - b[i])
  }
}

/** The largest optical depth at 550 nm the forcing estimate takes (the range of forcingVerdict and forcingMap). */
export const MAX_FORCING_TAU = 10

/**
 * The solar bands of the study's wavelengths (sorted), kept for the next call with the same wavelengths: an
 * uncertainty run asks for those of one wavelength in every draw (their blackbody fractions were a fiftieth of a
 * draw). Read only.
 */
let lastBands: { key: string; bands: ReturnType<typeof solarBandWeights> } | null = null
function solarBandsOf(sorted: readonly WavelengthOptics[]): ReturnType<typeof solarBandWeights> {
  const centres = sorted.map((r) => r.wavelength_nm / 1000)
  const key = centres.join(',')
  if (lastBands?.key !== key) lastBands = { key, bands: solarBandWeights(centres) }
  return lastBands.bands
}

/** What every forcing figure of a sample starts from: its optics at 550 nm and the site's surface. */
function forcingSetting(optics: SampleOptics, site: Site) {
  const rows = optics.wavelengths
  const at550 = (pick: (r: WavelengthOptics) => number) => valueAt(rows, 550, pick)
  const tau = at550((r) => r.optical_depth)
  if (!(tau >= 0 && tau <= MAX_FORCING_TAU)) {
    throw new InputError('Optical depth at 550 nm', `${readableNumber(tau)} is outside ${readableRange(0, MAX_FORCING_TAU)}, where the forcing estimate holds`, "Check the modes' amounts and median diameters (with their units) and the layer: a hazy layer's optical depth is about 0.1 to 1.")
  }
  const omega = Math.min(1, Math.max(0, at550((r) => r.ssa)))
  const g = at550((r) => r.g)
  const upscatter = at550((r) => r.upscatter_fraction)
  const surfaceAlbedo = siteSurfaceAlbedo(site)
  const common = { transmittance: site.transmittance, cloudFraction: site.cloud_fraction }
  const thin = thinLayerForcing({ tau, omega, upscatter, surfaceAlbedo, ...common })
  return { rows, tau, omega, g, upscatter, surfaceAlbedo, common, thin }
}

type ForcingSetting = ReturnType<typeof forcingSetting>

/** The row at 550 nm, else the nearest (the first of two as near, in wavelength order). */
function row550Of(rows: readonly WavelengthOptics[]): WavelengthOptics {
  return rows.find((r) => r.wavelength_nm === 550) ?? [...rows].sort((a, b) => a.wavelength_nm - b.wavelength_nm).reduce((a, b) => (Math.abs(b.wavelength_nm - 550) < Math.abs(a.wavelength_nm - 550) ? b : a))
}

/** The thin-layer forcing through the site's day. */
function dailyForcing(f: ForcingSetting, site: Site) {
  return dailyMeanThinLayerForcing({
    tau: f.tau,
    omega: f.omega,
    upscatter: upscatterFunction(row550Of(f.rows)),
    surfaceAlbedo: f.surfaceAlbedo,
    ...f.common,
    latitudeDeg: site.latitude_deg,
    dayOfYear: site.day_of_year
  })
}

/** The two-stream layer at μ₀ = 0.5 with the global-mean insolation. */
function twoStreamOf(f: ForcingSetting) {
  // the same β̄ as the thin-layer form, so that the two compare like with like (twoStream.ts)
  return twoStreamForcing({
    tau: f.tau,
    omega: f.omega,
    asymmetry: Math.min(0.99, Math.max(0, f.g)),
    upscatter: f.upscatter,
    cosZenith: 0.5,
    surfaceAlbedo: f.surfaceAlbedo,
    incidentFluxWm2: SOLAR_CONSTANT_WM2 / 4,
    ...f.common
  })
}

/** The forcing figures an uncertainty draw records: sampleForcing's, to the bit, without its texts and the rest. */
export interface SampleForcingFigures {
  thin_layer_w_m2: number
  daily_mean_w_m2: number
  two_stream_toa_w_m2: number
  /** null where the infrared part is left out. */
  longwave_toa_w_m2: number | null
  net_toa_w_m2: number
}

/**
 * The figures of sampleForcing that a Monte Carlo draw keeps (the same operations on the same numbers), without
 * the verdict's and the infrared detail's texts, the spectral figure and the warnings, which a draw does not report.
 */
export function sampleForcingFigures(optics: SampleOptics, site: Site): SampleForcingFigures {
  const f = forcingSetting(optics, site)
  const lw = longwaveOf(optics, site)
  const infrared = 'withheld' in lw ? null : lw.r.toaWm2
  return {
    thin_layer_w_m2: f.thin.forcingWm2,
    daily_mean_w_m2: dailyForcing(f, site).forcingWm2,
    two_stream_toa_w_m2: twoStreamOf(f).toaWm2,
    longwave_toa_w_m2: infrared,
    net_toa_w_m2: netForcing(f.thin.forcingWm2, infrared ?? 0)
  }
}

/** The forcing estimate of a sample's layer at a site, with its verdict. */
export function sampleForcing(optics: SampleOptics, site: Site, marginWm2 = DEFAULT_VERDICT_MARGIN_WM2): SampleForcing {
  const f = forcingSetting(optics, site)
  const { rows, tau, omega, g, upscatter, surfaceAlbedo, common, thin } = f

  // Spectral: each study wavelength stands for a band of the (Planck 5772 K) solar spectrum; the
  // transmittance above the layer follows the Rayleigh optical depth of the air above it.
  const sorted = [...rows].sort((a, b) => a.wavelength_nm - b.wavelength_nm)
  const bands = solarBandsOf(sorted)
  const p = LAYER_TOP_PRESSURE_HPA
  const tauR550 = rayleighOpticalDepth(0.55, p)
  let spectral = 0
  sorted.forEach((r, i) => {
    const tr = site.transmittance * Math.exp(-(rayleighOpticalDepth(r.wavelength_nm / 1000, p) - tauR550))
    spectral += thinLayerForcing({
      tau: r.optical_depth,
      omega: Math.min(1, Math.max(0, r.ssa)),
      upscatter: r.upscatter_fraction,
      surfaceAlbedo,
      transmittance: Math.min(1, tr),
      cloudFraction: site.cloud_fraction,
      solarConstant: SOLAR_CONSTANT_WM2 * bands.fractions[i]
    }).forcingWm2
  })

  const daily = dailyForcing(f, site)
  const two = twoStreamOf(f)
  const verdict = forcingVerdict({ tau, omega, surfaceAlbedo, upscatter, ...common, marginWm2 })
  const flip = thin.flipSurfaceAlbedo
  const departure = thinLayerDepartureWarning(thin.forcingWm2, two.toaWm2, tau, verdict.marginWm2)
  const warnings = departure ? [`${departure} The verdict's sunlight part, the spectral and daily figures and the map are thin-layer figures too.`] : []
  const lw = sampleLongwaveForcing(optics, site)
  const infrared = 'withheld' in lw ? null : lw
  const net = netVerdict({ sunlightWm2: thin.forcingWm2, infraredWm2: infrared ? infrared.toa : 0, marginWm2: verdict.marginWm2 })
  return {
    tau_550: tau,
    ssa_550: omega,
    g_550: g,
    upscatter_550: upscatter,
    surface_albedo: surfaceAlbedo,
    thin_layer_w_m2: thin.forcingWm2,
    efficiency_w_m2_per_tau: thin.efficiencyWm2PerTau,
    critical_ssa: thin.omegaCritical,
    flip_surface_albedo: Number.isFinite(flip) && flip >= 0 && flip <= 1 ? flip : null,
    spectral_w_m2: spectral,
    daily_mean_w_m2: daily.forcingWm2,
    insolation_w_m2: daily.insolationWm2,
    two_stream: { toa_w_m2: two.toaWm2, surface_w_m2: two.surfaceWm2, atmosphere_w_m2: two.atmosphereWm2 },
    longwave_toa_w_m2: infrared ? infrared.toa : null,
    longwave_surface_w_m2: infrared ? infrared.surface : null,
    net_toa_w_m2: net.netWm2,
    dominant: net.dominant,
    sunlight_verdict: verdict.verdict,
    longwave: infrared ? infrared.detail : null,
    longwave_withheld: 'withheld' in lw ? lw.withheld : null,
    verdict: infrared ? net.verdict : verdict.verdict,
    explanation: infrared ? `Sunlight part: ${verdict.explanation} ${net.explanation}` : `${verdict.explanation} ${'withheld' in lw ? lw.withheld : ''}`.trim(),
    margin_w_m2: verdict.marginWm2,
    caution: verdict.caution,
    warnings
  }
}

/**
 * Forcing over surface albedo (0…1) and ω for this sample's τ and β̄ at 550 nm, as plain arrays. ω runs from 0.5
 * to 1, or from below the sample's own ω (to the next 0.05 under ω − 0.05) when it absorbs more than that, so the
 * sample always has its place on the map.
 */
export function sampleForcingMap(forcing: SampleForcing, site: Site, nSurface = 41, nOmega = 26): ForcingMapData {
  const omegaMin = Math.max(0, Math.min(0.5, Math.floor((forcing.ssa_550 - 0.05) * 20) / 20))
  const map = forcingMap({
    nSurfaceAlbedo: nSurface,
    nOmega,
    omegaMin,
    tau: forcing.tau_550,
    upscatter: Math.max(forcing.upscatter_550, 1e-6),
    transmittance: site.transmittance,
    cloudFraction: site.cloud_fraction,
    offsetWm2: forcing.longwave_toa_w_m2 ?? 0
  })
  const rows: number[][] = []
  for (let j = 0; j < nOmega; j++) rows.push(Array.from(map.forcingWm2.subarray(j * nSurface, (j + 1) * nSurface)))
  return {
    surface_albedo: Array.from(map.surfaceAlbedo),
    ssa: Array.from(map.omega),
    forcing: rows,
    zero_line: Array.from(map.zeroLine.surfaceAlbedo, (r, i) => [r, map.zeroLine.omegaCritical[i]] as [number, number]),
    net_zero_line: Array.from(map.netZeroLine.surfaceAlbedo, (r, i) => [r, map.netZeroLine.omega[i]] as [number, number]),
    sample: [forcing.surface_albedo, forcing.ssa_550]
  }
}

