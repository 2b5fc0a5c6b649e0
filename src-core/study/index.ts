/**
 * The study document: its types (model.ts), schema and validation, migration of older versions, the file
 * text it is saved as, the demo study. (The reader for sizer exports is in src-core/field.)
 */
export * from './model.ts'
export { type StudyProblem, type ParseStudyResult, STUDY_WAVELENGTH_RANGE_NM, MAX_MEDIAN_UM, studySchema } from './schema.ts'
export { formatJsonPath } from './zodProblems.ts'
export { validateStudy, parseStudy } from './validate.ts'
export { type MigrationResult, migrateStudy } from './migrate.ts'
export { serializeStudy } from './serialize.ts'
export { demoStudy } from './demo.ts'
export { type JsonSyntaxProblem, findJsonSyntaxError, lineColumnAt, looksLikeDelimitedTable } from './jsonSyntax.ts'
