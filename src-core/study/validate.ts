/**
 * Validating a study document: `parseStudy` reads the text of a `.mote` file and reports every problem at once,
 * each with a JSON path (e.g. `samples[2].size.modes[0].gsd`), what is wrong in plain words and how to fix it.
 *
 * Two passes: the zod schema (schema.ts) checks shapes, types and each value's range; then `crossChecks`
 * (crossChecks.ts) looks at relations between values. The second pass reads the raw document defensively, so it
 * also runs when the first found problems.
 */
import { findJsonSyntaxError, looksLikeDelimitedTable } from './jsonSyntax.ts'
import { migrateStudy } from './migrate.ts'
import { STUDY_FORMAT, STUDY_VERSION, type Study } from './model.ts'
import { studySchema, type ParseStudyResult, type StudyProblem } from './schema.ts'
import { describe, issueToProblems } from './zodProblems.ts'
import { crossChecks, isNum, isObject } from './crossChecks.ts'

/**
 * Validates an already-parsed document (e.g. one being edited in the app), migrating older versions first.
 * Reports every problem at once.
 */
export function validateStudy(json: unknown): ParseStudyResult {
  if (!isObject(json)) {
    return { ok: false, problems: [{ path: 'document', message: `the file holds ${describe(json)}, not a study object`, fix: `A study file is a JSON object starting with { and containing "format": "${STUDY_FORMAT}".` }] }
  }
  if (json.format !== STUDY_FORMAT) {
    return {
      ok: false,
      problems: [
        {
          path: 'format',
          message: json.format === undefined ? 'the document has no "format" field, so it is not a Motebench study' : `the format is ${describe(json.format)}, not "${STUDY_FORMAT}"`,
          fix: `Open a study (.mote) file saved by Motebench; if this is one, add "format": "${STUDY_FORMAT}".`
        }
      ]
    }
  }
  const v = json.version
  if (!isNum(v) || !Number.isInteger(v) || v < 1) {
    return { ok: false, problems: [{ path: 'version', message: v === undefined ? 'the document has no "version" field' : `the version is ${describe(v)}, not a whole number from 1`, fix: `Add "version": ${STUDY_VERSION} if the file was written for this program.` }] }
  }
  if (v > STUDY_VERSION) {
    return {
      ok: false,
      problems: [
        {
          path: 'version',
          message: `the file has study version ${v}, but this program reads versions 1 to ${STUDY_VERSION}`,
          fix: `Open it with a newer Motebench (one that reads version ${v}), or ask for a copy saved as version ${STUDY_VERSION}.`
        }
      ]
    }
  }
  const migration = migrateStudy(json)
  const doc = migration.document
  const problems: StudyProblem[] = []
  const warnings: string[] = [...migration.warnings]
  const r = studySchema.safeParse(doc)
  if (!r.success) for (const issue of r.error.issues) problems.push(...issueToProblems(issue, doc))
  crossChecks(doc, problems, warnings)
  if (problems.length > 0) {
    for (const p of problems) {
      const old = Object.entries(migration.renamedPaths).find(([now]) => p.path === now || p.path.startsWith(`${now}[`) || p.path.startsWith(`${now}.`))
      if (old) p.message += ` (in this version ${migration.fromVersion} file: ${old[1]})`
    }
    return { ok: false, problems }
  }
  return { ok: true, study: r.data as Study, warnings }
}

/**
 * Reads a study from the text of a `.mote` file: JSON syntax (with line and column), format name, version
 * (older versions are migrated with a warning; newer ones are refused), then every value.
 */
export function parseStudy(text: string, fileName?: string): ParseStudyResult {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text
  let json: unknown
  try {
    json = JSON.parse(body)
  } catch {
    const where = findJsonSyntaxError(text)
    const file = fileName ? `${fileName} ` : ''
    if (looksLikeDelimitedTable(body)) {
      return {
        ok: false,
        problems: [
          {
            path: `${file}document`.trim(),
            message: 'this is a table of values (CSV or similar, such as a sizer export), not a Motebench study',
            fix: 'Import it as a sizer file instead (in the app: Import sizer file…; on the command line: motebench series or motebench closure --sizer); studies are .mote files saved by Motebench.'
          }
        ]
      }
    }
    if (where) {
      return { ok: false, problems: [{ path: `${file}line ${where.line} column ${where.column}`, message: `not valid JSON: ${where.message}`, fix: where.fix, line: where.line, column: where.column }] }
    }
    return { ok: false, problems: [{ path: `${file}document`.trim(), message: 'not valid JSON', fix: 'Check the file in a text editor; it may be damaged.' }] }
  }
  return validateStudy(json)
}
