/**
 * Uncertainty propagation: seeded draws of uncertain inputs through a sample's optics at 550 nm and its
 * forcing, their statistics, P(warm) and a Spearman sensitivity ranking. Designed to split over workers.
 */
export { Xoshiro128, mix32, normalCdf, normalQuantile, randomPermutation } from './random.ts'
export {
  quantileSorted,
  histogramBinCount,
  histogramOf,
  summarizeValues,
  probabilityPositive,
  stoppingStandardError,
  ranksOf,
  pearsonCorrelation,
  spearmanRankCorrelation
} from './stats.ts'
export type { Histogram, FigureSummary, ProbabilityEstimate } from './stats.ts'
export { UNCERTAIN_QUANTITIES, SITE_QUANTITIES, UNCERTAINTY_WAVELENGTH_NM, uncertaintySettingsSchema } from './settings.ts'
export type { UncertainDistribution, UncertainBounds, UncertainQuantity, UncertainInput, UncertaintySampleSettings, UncertaintySettings } from './settings.ts'
export { variateQuantile } from './inputs.ts'
export {
  UNCERTAINTY_TOLERANCE,
  UNCERTAINTY_CHECK_EVERY,
  UNCERTAINTY_FIGURES,
  UNCERTAINTY_VERDICT_FIGURE,
  readUncertaintySettings,
  planUncertainty,
  completePlan,
  drawUniforms,
  computeDraws,
  drawWorkspace,
  UNCERTAINTY_NODE_LIMIT,
  mergeDrawBlocks,
  drawColumn,
  earlyStopPoint
} from './propagate.ts'
export type { UncertaintyFigureKey, UncertaintyRunOptions, ResolvedInput, DrawState, UncertaintyPlan, DrawBlock } from './propagate.ts'
export { truncateBlock, centralFigures, summarizeDraws, runUncertainty } from './results.ts'
export type { UncertaintyStatus, UncertaintyFigureResult, UncertaintyInputResult, SensitivityEntry, UncertaintyResult, UncertaintyProgress } from './results.ts'
