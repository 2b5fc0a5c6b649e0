/**
 * Size distributions: lognormal modes (Hatch–Choate), measured bins, mass below a size cut
 * (PM1/PM2.5/PM10 by geometric or aerodynamic diameter) and the diameter range for integration.
 * Units: diameters µm, number cm⁻³, surface µm² cm⁻³, volume µm³ cm⁻³, mass µg m⁻³, density g cm⁻³.
 */
export { erf, erfc, standardNormalBelow, twoSidedNormalQuantile } from './erf.ts'
export {
  type LognormalMode,
  MAX_GSD,
  modeLabel,
  checkMode,
  modeFromNumber,
  modeFromVolume,
  modeFromMass,
  moment,
  numberConcentration,
  surfaceConcentration,
  volumeConcentration,
  massConcentration,
  momentMedianDiameter,
  surfaceMedianDiameter,
  volumeMedianDiameter,
  toVolumeForm,
  dNdlnD,
  dNdlnDOfLnD,
  dNdlogD
} from './lognormal.ts'
export {
  BIN_SHAPE,
  type SizeBins,
  DIAMETER_UNITS,
  type DiameterUnit,
  BIN_QUANTITIES,
  type BinQuantity,
  type MeasuredBins,
  binPowerIntegral,
  edgesFromMidpoints,
  binsFromMeasurement,
  checkSizeBins,
  binValues,
  binMoment,
  binNumberConcentration,
  binSurfaceConcentration,
  binVolumeConcentration,
  binMassConcentration
} from './bins.ts'
export {
  MEAN_FREE_PATH_AIR_UM,
  UNIT_DENSITY,
  type AerodynamicOptions,
  cunninghamSlipCorrection,
  aerodynamicDiameter,
  volumeDiameterFromAerodynamic
} from './aerodynamic.ts'
export {
  type CutDiameter,
  type CutOptions,
  type BinCutOptions,
  type MassBelowCut,
  type ParticulateMatter,
  massBelowCut,
  particulateMatter,
  massBelowCutBins,
  particulateMatterBins
} from './pm.ts'
export { integrationRange } from './grid.ts'
