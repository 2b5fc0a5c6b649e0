// The arguments of `motebench uncertainty` and its number of worker threads: a light module (no src-core
// optics), which main.ts also reads to start the worker threads while the command's own code loads.
import { availableParallelism } from 'node:os'
import { readArgs, readNumber, UsageError } from './common.ts'
import { startEarly } from './workers/early.ts'

export const UNCERTAINTY_ARGS = {
  sample: { type: 'string' },
  draws: { type: 'string' },
  seed: { type: 'string' },
  lhs: { type: 'boolean', default: false },
  precision: { type: 'string' },
  'min-draws': { type: 'string' },
  workers: { type: 'string' },
  json: { type: 'boolean', default: false },
  shard: { type: 'string' },
  out: { type: 'string' },
  'save-draws': { type: 'string' },
  'from-draws': { type: 'string' }
} as const

/** A whole number of at least `lo` typed for `flag` (undefined when not given). */
export function wholeArg(text: string | undefined, flag: string, lo: number): number | undefined {
  if (text === undefined) return undefined
  const v = readNumber(text, flag)
  if (!Number.isInteger(v) || v < lo) throw new UsageError(`${flag}: "${text}" is not a whole number of at least ${lo}`)
  return v
}

/** Worker threads besides the main thread: --workers, else one per spare core (at most 7). */
export function uncertaintyWorkerCount(workers: string | undefined): number {
  return wholeArg(workers, '--workers', 0) ?? Math.min(7, availableParallelism() - 1)
}

/**
 * Called by main.ts before the command's code loads: starts the worker threads a run that draws will take
 * (workers/early.ts). Arguments it cannot read start none (the command then reports them).
 */
export function startUncertaintyWorkersEarly(argv: string[]): void {
  try {
    const { values, positionals } = readArgs('uncertainty', argv, UNCERTAINTY_ARGS, true)
    if (values['from-draws'] !== undefined || positionals.length !== 1 || values.sample === undefined) return
    startEarly('uncertainty-worker', uncertaintyWorkerCount(values.workers))
  } catch {
    // the command reads the arguments again and says what is wrong
  }
}
