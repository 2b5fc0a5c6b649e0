/**
 * Results of the bulk optics of a sample and of a whole study: the shapes the CLI, the app and the
 * tests read. Units are in the names: coefficients in Mm⁻¹, mass efficiencies in m² g⁻¹.
 */

/** Bulk optics of a sample at one wavelength. */
export interface WavelengthOptics {
  wavelength_nm: number
  /** Extinction, scattering and absorption coefficients, Mm⁻¹. */
  ext: number
  sca: number
  abs: number
  /** Single-scattering albedo σsca/σext. */
  ssa: number
  /** Asymmetry parameter of the population. */
  g: number
  /** Hemispheric backscatter fraction b = β(μ₀ = 1). */
  backscatter_fraction: number
  /** Upscatter fraction averaged over the sun's cosine, β̄ = ∫₀¹ β(μ₀) dμ₀ (Wiscombe & Grams 1976). */
  upscatter_fraction: number
  /** β(μ₀) at UPSCATTER_COS_ZENITH. */
  upscatter_by_cos_zenith: number[]
  /** Mass efficiencies, m² g⁻¹, per gram of dry particle matter. */
  mass_ext_dry: number
  mass_sca_dry: number
  mass_abs_dry: number
  /** Mass efficiencies per gram of particle matter including its water at the sample's humidity. */
  mass_ext_wet: number
  mass_sca_wet: number
  mass_abs_wet: number
  /** Ångström exponents of extinction and absorption at this wavelength, from its neighbours (localAngstromExponents). */
  angstrom_ext: number
  angstrom_abs: number
  /** Optical depth of the sample's layer. */
  optical_depth: number
  /** Air's Rayleigh scattering at sea level (Mm⁻¹), added for visual range and haze index. */
  rayleigh_sca: number
  /** Koschmieder visual range 3.912 / (b_ext + b_Rayleigh), km. */
  visual_range_km: number
  /** Haze index 10 ln((b_ext + b_Rayleigh)/10 Mm⁻¹), deciviews. */
  deciview: number
  /** Mie evaluations this wavelength took (all populations, all refinement levels). */
  mie_evaluations: number
  /**
   * Figures left out (NaN) because they have no meaning here, each with its reason (optics/metrics.ts:
   * absorptionWithheld, visibilityWithheld, deciviewWithheld).
   */
  withheld: Partial<Record<WithheldFigure, string>>
}

/** The row figures that can be withheld. */
export type WithheldFigure = 'angstrom_abs' | 'visual_range_km' | 'deciview'

/** Population phase function and polarisation at chosen angles, one wavelength. */
export interface AngularOptics {
  wavelength_nm: number
  angles_deg: number[]
  /** Normalised so that its integral over the sphere is 4π. */
  phase: number[]
  /** Degree of linear polarisation −S12/S11 of the population. */
  polarization: number[]
}

export interface AngstromExponents {
  ext: number
  sca: number
  abs: number
  /** Why `abs` is NaN, where it is withheld (too little absorption at some wavelength). */
  withheld?: { abs?: string }
}

/** Everything computed for one sample. */
export interface SampleOptics {
  name: string
  wavelengths: WavelengthOptics[]
  angular: AngularOptics[]
  /** Dry number, surface, volume and mass concentrations (cm⁻³, µm² cm⁻³, µm³ cm⁻³, µg m⁻³). */
  number_cm3: number
  surface_um2_cm3: number
  volume_um3_cm3: number
  mass_ug_m3: number
  /** The same at the sample's humidity (water included). */
  wet_volume_um3_cm3: number
  wet_mass_ug_m3: number
  /** PM by geometric (volume-equivalent) dry diameter, µg m⁻³. */
  pm1_ug_m3: number
  pm2_5_ug_m3: number
  pm10_ug_m3: number
  /** Ångström exponents fitted over all wavelengths (least squares in log–log). */
  angstrom_fit: AngstromExponents
  /** Layer depth used for the optical depth, m (for a given AOD: the equivalent uniform depth). */
  layer_depth_m: number
  /** Statements the results must carry (bin shape, approximations used). */
  notes: string[]
  /** Thermal-infrared optics in the longwave bands (optics/longwave.ts); absent where not computed (f(RH) points). */
  longwave?: LongwaveOptics
  /**
   * Figures that come from a method outside its range of validity: each says which figure, why and what to use
   * instead (optics/warnings.ts). Empty when there is nothing to say.
   */
  warnings: string[]
}

/** A sample's optics in one thermal-infrared band (band averages; coefficients in Mm⁻¹). */
export interface LongwaveBandOptics {
  lo_um: number
  hi_um: number
  ext: number
  sca: number
  abs: number
  ssa: number
  g: number
}

/** A sample's thermal-infrared optics: one entry per band of LONGWAVE_BANDS, or none with the reason. */
export interface LongwaveOptics {
  bands: LongwaveBandOptics[]
  /** Why the bands are empty (a component without infrared indices), else null. */
  withheld: string | null
}

/** The infrared part of a sample's forcing, with the site inputs it used. */
export interface LongwaveForcingDetail {
  surface_temperature_k: number
  /** The broadband emissivity (the site's, or its surface type's). */
  surface_emissivity: number
  /** The surface type's emissivity in each band, used in place of the broadband one (null: grey). */
  surface_emissivity_bands: number[] | null
  layer_height_km: number
  layer_depth_km: number
  water_column_cm: number
  /** Temperature at the layer's middle, K (lapse rate 6.5 K km⁻¹). */
  layer_temperature_k: number
  /** Clear-sky TOA and surface infrared forcing, W m⁻² (the reported figures are these × (1 − cloud fraction)). */
  clear_sky_toa_w_m2: number
  clear_sky_surface_w_m2: number
  /** Per band: edges (µm), the layer's optical depth, ω and g there, and its clear-sky TOA forcing (W m⁻²). */
  bands: { lo_um: number; hi_um: number; tau: number; ssa: number; g: number; toa_w_m2: number }[]
  method: string
}

/** The verdict words. */
export type VerdictWord = 'cools' | 'warms' | 'too close to call'

/** Direct-forcing estimate of one sample's layer at the study's site. */
export interface SampleForcing {
  /** Optical properties at 550 nm that the broadband estimate uses. */
  tau_550: number
  ssa_550: number
  g_550: number
  upscatter_550: number
  surface_albedo: number
  /** Chylek–Wong thin-layer estimate, global-mean insolation S₀/4 (W m⁻²). */
  thin_layer_w_m2: number
  efficiency_w_m2_per_tau: number
  critical_ssa: number
  /** Surface albedo at which the sign flips for this population (null if it never does in 0…1). */
  flip_surface_albedo: number | null
  /** Thin-layer estimate weighted over the solar spectrum (Planck 5772 K approximation), S₀/4. */
  spectral_w_m2: number
  /** Thin-layer estimate for the site's latitude and day, with β(μ₀) and slant paths through the day. */
  daily_mean_w_m2: number
  /** Daily-mean top-of-atmosphere insolation at the site, W m⁻². */
  insolation_w_m2: number
  /** Delta-Eddington two-stream layer (global-mean equivalent: μ₀ = 0.5, incident S₀/4), with the same β̄ as the thin-layer form. */
  two_stream: { toa_w_m2: number; surface_w_m2: number; atmosphere_w_m2: number }
  /** Thermal-infrared forcing at the top of the atmosphere and at the surface, W m⁻² (positive warms); null when withheld. */
  longwave_toa_w_m2: number | null
  longwave_surface_w_m2: number | null
  /** The sunlight figure the verdict uses (thin_layer_w_m2) plus longwave_toa_w_m2; the sunlight figure alone when the infrared part is withheld. */
  net_toa_w_m2: number
  /** Which part has the larger magnitude (sunlight when the infrared part is withheld). */
  dominant: 'sunlight' | 'infrared'
  /** The verdict on the sunlight part alone (the thin-layer figure against the margin). */
  sunlight_verdict: VerdictWord
  /** How the infrared part was made and with which inputs; null when withheld. */
  longwave: LongwaveForcingDetail | null
  /** Why the infrared part is left out, else null. */
  longwave_withheld: string | null
  /** The verdict on the net (net_toa_w_m2 against the margin). */
  verdict: VerdictWord
  /** One or two sentences with the numbers that decide the verdict. */
  explanation: string
  margin_w_m2: number
  caution: string
  /** The thin-layer figures' warning when they depart from the two-stream layer (climate/validity.ts); else empty. */
  warnings: string[]
}

/** Forcing over surface albedo × single-scattering albedo for a sample (thin-layer form). */
export interface ForcingMapData {
  surface_albedo: number[]
  ssa: number[]
  /** forcing[i][j] at ssa[i], surface_albedo[j], W m⁻². */
  forcing: number[][]
  /** The ω_crit(R_s) line as [R_s, ω] points. */
  zero_line: [number, number][]
  /** Where the net forcing (this map's sunlight part plus the sample's infrared part, the same everywhere) is zero, as [R_s, ω] points. */
  net_zero_line: [number, number][]
  /** Where this sample sits: [R_s, ω at 550 nm]. */
  sample: [number, number]
}

/** f(RH): scattering at each humidity divided by the dry scattering, at 550 nm. */
export interface HumidityGrowthCurve {
  wavelength_nm: number
  rh_percent: number[]
  f: number[]
}

export interface SampleResult {
  optics: SampleOptics
  forcing: SampleForcing
  map: ForcingMapData
  humidity: HumidityGrowthCurve
}

export interface StudyResults {
  samples: SampleResult[]
  /** Software version that produced the results. */
  version: string
}
