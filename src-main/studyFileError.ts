// The error a study file that does not hold a valid study gives: in its own module so that the command line's
// error handling (cli/common.ts) does not load the study reader (and its schema) for commands that read no study.
import type { StudyProblem } from '../src-core/index.ts'

/** The study file does not hold a valid study. */
export class StudyFileError extends Error {
  readonly path: string
  readonly problems: StudyProblem[]

  constructor(path: string, problems: StudyProblem[]) {
    super(`${path}: ${problems.length} problem${problems.length === 1 ? '' : 's'}: ${problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`)
    this.name = 'StudyFileError'
    this.path = path
    this.problems = problems
  }
}
