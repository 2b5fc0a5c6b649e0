/**
 * The study document: its types (model.ts), schema and validation, migration of older versions, the file
 * text it is saved as, the demo study, and the reader for sizer exports.
 */
export * from './model.ts'
export { type StudyProblem, type ParseStudyResult, STUDY_WAVELENGTH_RANGE_NM, studySchema, formatJsonPath, validateStudy, parseStudy } from './schema.ts'
export { type MigrationResult, migrateStudy } from './migrate.ts'
export { serializeStudy } from './serialize.ts'
export { demoStudy } from './demo.ts'
export { type JsonSyntaxProblem, findJsonSyntaxError, lineColumnAt, looksLikeDelimitedTable } from './jsonSyntax.ts'
export {
  type SizerLayout,
  type SizerDelimiter,
  type SizerOptions,
  type SizerRecord,
  type SizerRejection,
  type SizerHeader,
  type SizerTable,
  type SizerSummary,
  type SizerReader,
  MAX_KEPT_REJECTIONS,
  createSizerReader,
  parseSizerText,
  sizerRecordToBins
} from './sizer.ts'
