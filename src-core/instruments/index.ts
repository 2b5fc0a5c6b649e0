/**
 * Instrument corrections: nephelometer angular truncation (from the population's own phase function) and
 * optical-particle-counter re-binning from the calibration index (PSL) to the sample's index.
 */
export { truncationQuadrature, truncationFromPhase, truncationCorrectionForPhase, nephelometerTruncation } from './nephelometer.ts'
export type { AngularResponse, NephelometerGeometry, TruncationQuadrature, TruncationCorrection, NephelometerOptions } from './nephelometer.ts'
export { PSL_INDEX, OpcResponder, opcResponseCurve, rebinOpcEdges, CURVE_POINTS } from './opc.ts'
export type { OpcGeometry, RebinnedEdge, RebinnedBin, RebinResult, RebinOptions, OpcResponseCurves } from './opc.ts'
