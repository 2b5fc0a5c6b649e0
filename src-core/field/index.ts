/**
 * Field data: reading instrument exports as they come (sizer tables with their time, units and extra columns).
 */
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
export { type DateOrder, type ParsedTime, DATE_ORDER_NAMES, readDateTime, readClock, readDayOfYear, readEpochSeconds, epochNamed, isoText } from './time.ts'
export { readNumber, parseNumber } from './cells.ts'
export { type AveragedRecords, averageRecords } from './average.ts'
