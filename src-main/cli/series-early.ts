// What main.ts reads of `motebench series`'s arguments before the command's code loads: the number of worker
// threads, to start them at once (workers/early.ts), so that they load their modules while this thread loads the
// command's, reads the study and the file's first rows. A light module: only what main.ts loads anyway.
import { availableParallelism } from 'node:os'
import { parseArgs } from 'node:util'
import { readInteger } from './common.ts'
import { startEarly } from './workers/early.ts'

/** Worker threads of a series run: --workers, else one fewer than the processors (at least 1). */
export function seriesWorkerCount(workers: string | undefined): number {
  return readInteger(workers, '--workers', 1, 64, Math.max(1, availableParallelism() - 1))
}

/** Starts the series run's worker threads; arguments it cannot read start none (the command reports them). */
export function startSeriesWorkersEarly(argv: string[]): void {
  try {
    const { values } = parseArgs({ args: argv, options: { workers: { type: 'string' } }, strict: false, allowPositionals: true })
    const workers = values.workers
    if (workers !== undefined && typeof workers !== 'string') return
    startEarly('series-worker', seriesWorkerCount(workers))
  } catch {
    // the command reads the arguments again and says what is wrong
  }
}
