/**
 * Materials: the component catalogue, user components, mixing rules and water uptake (κ-Köhler).
 * Wavelengths in µm, densities in g cm⁻³, RH in percent, temperatures in K.
 */
export type {
  ComplexRefractiveIndex,
  Material,
  PhaseChange,
  IndexModel,
  TableIndex,
  ConstantIndex,
  ExpressionIndex
} from './material.ts'
export { indexSourceAt, refractiveIndexAt } from './material.ts'
export { listMaterials, getMaterial } from './catalogue.ts'
export type { UserIndexSpec, UserMaterialDefinition } from './user.ts'
export { defineUserMaterial } from './user.ts'
export type { MixingRule } from './mixing.ts'
export { MIXING_RULES, mixRefractiveIndices, volumeAverageOfTwo } from './mixing.ts'
export type { WaterUptakeOptions } from './growth.ts'
export { KELVIN_TERM_CONSTANTS, growthFactor, growthFactorAt, growthSetting, type GrowthSetting, mixtureKappa, waterVolumeFraction, wetRefractiveIndex } from './growth.ts'
export { parseIndexTableCsv } from './indexTable.ts'
export type { IndexTableOptions } from './indexTable.ts'
export { NEAR_SATURATION_RH, growthSensitivityPerPercent, nearSaturationWarning } from './saturation.ts'
