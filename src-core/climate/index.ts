/**
 * Climate module: direct radiative forcing of a uniform aerosol layer, from the thin-layer screening
 * estimate (Chylek & Wong 1995) to a delta-Eddington two-stream layer over a Lambertian surface, plus
 * solar geometry, a blackbody approximation of the solar spectrum, Rayleigh optical depth, a verdict and
 * a forcing map. Inputs are plain numbers (τ, ω, g, β̄, R_s) supplied by the bulk-optics code.
 */
export {
  SOLAR_CONSTANT_WM2,
  STEFAN_BOLTZMANN_WM2K4,
  SUN_EFFECTIVE_TEMPERATURE_K,
  PLANCK_CONSTANT_JS,
  SPEED_OF_LIGHT_MS,
  BOLTZMANN_CONSTANT_JK,
  STANDARD_PRESSURE_HPA,
  DEFAULT_ATMOSPHERIC_TRANSMITTANCE,
  DEFAULT_CLOUD_FRACTION
} from './constants.ts'
export type { ThinLayerInput, ThinLayerResult } from './thinLayer.ts'
export { thinLayerForcing, criticalSingleScatteringAlbedo, signFlipSurfaceAlbedo } from './thinLayer.ts'
export type { SurfaceType } from './surfaces.ts'
export { SURFACE_TYPES, surfaceTypeById } from './surfaces.ts'
export type { SolarBandWeights, RayleighFormula } from './spectrum.ts'
export { solarSpectralIrradiance, solarFractionBelow, solarBandFractions, solarBandWeights, SOLAR_BAND_RANGE_UM, rayleighOpticalDepth } from './spectrum.ts'
export type { SunlitDayQuadrature, SlantThinLayerInput, DailyMeanForcingResult } from './insolation.ts'
export {
  solarDeclinationRad,
  earthSunDistanceFactor,
  dailyMeanInsolation,
  sunlitDayQuadrature,
  thinLayerReflectanceChange,
  dailyMeanThinLayerForcing
} from './insolation.ts'
export type {
  TwoStreamLayerInput,
  DeltaScaled,
  DirectBeamResponse,
  DiffuseResponse,
  LayerOverSurface,
  TwoStreamForcingInput,
  TwoStreamForcingResult,
  DailyTwoStreamInput,
  DailyTwoStreamResult
} from './twoStream.ts'
export {
  deltaEddingtonScaling,
  deltaEddingtonDirectBeam,
  deltaEddingtonDiffuse,
  layerOverLambertianSurface,
  twoStreamEquivalentUpscatter,
  twoStreamForcing,
  dailyMeanTwoStreamForcing
} from './twoStream.ts'
export type { ForcingVerdictWord, ForcingVerdictInput, ForcingVerdict, ForcingMapInput, ForcingMap } from './verdict.ts'
export { FORCING_CAUTION, DEFAULT_VERDICT_MARGIN_WM2, forcingVerdict, forcingMap, effectiveEmissionTemperature } from './verdict.ts'
export type { ThinLayerCheckInput, ThinLayerCheck } from './validity.ts'
export { THIN_LAYER_TRUSTED_SHARE, asymmetryFromUpscatter, thinLayerDepartureWarning, thinLayerCheck } from './validity.ts'
export { blackbodyFractionBelow, planckBandFlux, planckBandFluxes, planckSpectralFlux, C2_UM_K } from './planck.ts'
export type { ThermalLayer, ThermalStackInput, ThermalStackFluxes } from './thermalTwoStream.ts'
export { thermalTwoStream, HEMISPHERIC_MEAN_DIFFUSIVITY } from './thermalTwoStream.ts'
export type { LongwaveBand, BandParticleOptics } from './longwaveBands.ts'
export { LONGWAVE_BANDS, LONGWAVE_RANGE_UM, LONGWAVE_WEIGHT_TEMPERATURE_K, longwaveNodeWavelengthsUm, bandAverage } from './longwaveBands.ts'
export type { LongwaveLayerBand, LongwaveForcingInput, LongwaveForcingResult, LongwaveInputName } from './longwave.ts'
export {
  longwaveForcing,
  airTemperatureK,
  checkLongwaveInput,
  LONGWAVE_INPUT_RANGES,
  LONGWAVE_METHOD,
  STANDARD_LAPSE_RATE_K_PER_KM,
  TROPOPAUSE_KM,
  WATER_SCALE_HEIGHT_KM,
  PRESSURE_SCALE_HEIGHT_KM,
  DEFAULT_SURFACE_TEMPERATURE_K,
  DEFAULT_LAYER_HEIGHT_KM,
  DEFAULT_WATER_COLUMN_CM
} from './longwave.ts'
export { EMISSIVITY_SOURCE } from './surfaces.ts'
export type { NetVerdictInput, NetVerdict } from './netVerdict.ts'
export { netForcing, netVerdict } from './netVerdict.ts'
