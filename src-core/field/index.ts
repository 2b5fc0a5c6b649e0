/**
 * Field data: several sizers merged into one size distribution in volume-equivalent diameter (DeCarlo et al.
 * 2004 conversions, a stated overlap rule, an optional density fit after Khlystov et al. 2004), and the time
 * base that averages instruments on their own clocks onto common steps; reading instrument exports as they
 * come (sizer tables with their time, units and extra columns); and the optical instruments beside the
 * sizers (measured scattering, backscattering and absorption in our own file layout, averaged onto the sizer rows
 * and compared with the computed coefficients, with the truncation correction and per-row closure).
 */
export {
  type SizerKind,
  type ConversionSettings,
  type ConvertedEdges,
  SIZER_KINDS,
  mobilityDiameter,
  volumeDiameterFromMobility,
  volumeEquivalentEdges,
  fromVolumeEquivalent
} from './diameters.ts'
export {
  type TimeStamp,
  type TimeBase,
  parseTimeStamp,
  formatTimeStamp,
  parseDuration,
  formatDuration,
  typicalInterval,
  regularTimeBase,
  stampTimeBase,
  stepOf,
  TimeAverager
} from './timebase.ts'
export {
  type SizerInput,
  type MergeSettings,
  type PlannedSizer,
  type MergePlan,
  type DensityFit,
  OVERLAP_RULE,
  planMerge,
  sizerValueInBin,
  mergeStep,
  fitDensity
} from './merge.ts'
export { type MergedFileInfo, mergedMidpointsNm, mergedFileHead, mergedFileRow } from './output.ts'
export type {
  SizerLayout,
  SizerDelimiter,
  SizerOptions,
  SizerReaderOptions,
  SizerRecord,
  SizerRejection,
  SizerColumn,
  TimeRole,
  SizerHeader,
  SizerTable,
  SizerSummary,
  SizerReader
} from './types.ts'
export { MAX_KEPT_REJECTIONS, MAX_HELD_ROWS, createSizerReader, parseSizerText, sizerRecordToBins } from './reader.ts'
export { SizerChoiceNeeded, type SizerChoice } from './text.ts'
export { inferDiameterUnit } from './plan.ts'
export { type DateOrder, type ParsedTime, DATE_ORDER_NAMES, readDateTime, readPlainIso, readClock, readDayOfYear, readEpochSeconds, epochNamed, isoText } from './time.ts'
export { readNumber, parseCellNumber } from './cells.ts'
export { type AveragedRecords, averageRecords } from './average.ts'
export {
  type OpticalQuantity,
  type OpticalChannel,
  type OpticalHeader,
  type OpticalRecord,
  type OpticalRejection,
  MAX_KEPT_OPTICAL_REJECTIONS,
  type OpticalReaderOptions,
  type OpticalReader,
  OPTICAL_QUANTITIES,
  readInstrumentTime,
  createOpticalReader,
  parseOpticalText
} from './optical-file.ts'
export {
  type MeasuredChannel,
  type ComparisonPlan,
  type InstrumentKernels,
  DEFAULT_NEPHELOMETER_ANGLES,
  ASSUMED_ABSORPTION_ANGSTROM,
  MeasuredAlignment,
  planWavelengths,
  instrumentWavelengths,
  instrumentKernels,
  instrumentKernelsInputs,
  instrumentKernelsLength,
  packInstrumentKernels,
  comparisonColumns,
  absorptionAt,
  RowComparer
} from './optical.ts'
export { type RatioSummary, percentileSorted, RatioCollector, comparisonNotes } from './optical-summary.ts'
export {
  type CampaignFileKind,
  type CampaignFileRef,
  type CampaignSettings,
  type CampaignProblem,
  CAMPAIGN_FILE_KINDS,
  CAMPAIGN_KIND_WORDS,
  isSizerKind,
  campaignSettingsSchema,
  campaignProblems,
  folderOf,
  relativeFilePath,
  resolveFilePath,
  rebaseCampaignPaths,
  textFingerprint,
  sampledFingerprint,
  wholeTextFingerprint,
  fileChange,
  FINGERPRINT_SPAN,
  WHOLE_FINGERPRINT
} from './campaign-settings.ts'
export {
  type CampaignInput,
  type CampaignFileSummary,
  type LeftOutRow,
  type ReadInstrument,
  type ReadSizer,
  type SizerPart,
  type LineCut,
  readCampaignSizer,
  readCampaignInstrument,
  readSizerBytes,
  readSizerPart,
  sizerCut,
  partsJoin,
  finishSizer
} from './campaign-read.ts'
export { type PackedInstrument, type PackedSizerPart, packedBuffers, packInstrument, packSizerPart, unpackInstrument, unpackSizerPart } from './campaign-pack.ts'
export {
  type CampaignRecord,
  type CampaignBuild,
  type CampaignFiles,
  type ReadAhead,
  readingForAnotherRecord,
  figureColumns,
  buildCampaignRecord,
  checkCampaign,
  readCampaignFiles,
  addCampaignFile,
  campaignRecord,
  chartWavelengthsNm,
  completeRecord,
  recordComplete
} from './campaign.ts'
export {
  RECORD_SERIES,
  type RecordSeriesName,
  type RecordSeries,
  type RecordColumns,
  recordColumns,
  type StretchSample,
  recordSeries,
  rowsIn,
  stretchSample,
  recordCell,
  recordCsv
} from './campaign-use.ts'
export { isHumidityHeader, humidityProblem, humidityOnRows, recordedHumidity, HumidityTally, humidityComparisonNote, type SampleHumidity } from './humidity.ts'
