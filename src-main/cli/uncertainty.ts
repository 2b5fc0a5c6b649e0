// motebench uncertainty: Monte Carlo propagation of a sample's input uncertainties to its 550 nm optics and forcing,
// split over worker threads.
import { readFile } from 'node:fs/promises'
import { availableParallelism } from 'node:os'
import { basename } from 'node:path'
import type { Worker } from 'node:worker_threads'
import {
  centralFigures,
  computeDraws,
  earlyStopPoint,
  OpticsWorkspace,
  InputError,
  mergeDrawBlocks,
  parseStudy,
  planUncertainty,
  stoppingStandardError,
  summarizeDraws,
  truncateBlock,
  UNCERTAINTY_CHECK_EVERY,
  UNCERTAINTY_FIGURES,
  type DrawBlock,
  type Study,
  type UncertaintyResult,
  type UncertaintyRunOptions,
  type UncertaintyStatus
} from '../../src-core/index.ts'
import { formatNumber, printJson, printTable, readArgs, readNumber, UsageError } from './common.ts'
import { startCliWorker } from './workers/start.ts'

export const uncertaintyHelp = `motebench uncertainty FILE.mote --sample NAME: Monte Carlo uncertainty of a sample's 550 nm optics and forcing
  FILE.mote             a study whose "uncertainty" settings list the sample's uncertain inputs:
                          "uncertainty": { "samples": { "NAME": { "inputs": [ ... ] } }, "site": { "inputs": [ ... ] } }
                        each input: { "quantity": n | k | median | gsd | amount | density | kappa | rh | layer |
                          surface_albedo | cloud_fraction | transmittance, "material": id (n, k), "mode": 0-based index or
                          name (median, gsd, amount), "apply": factor | add | set,
                          "distribution": { "kind": "normal", "mean", "sd" } | { "kind": "lognormal", "median", "gsd" } |
                          { "kind": "uniform", "lo", "hi" }, "bounds": { "lo", "hi", "method": resample | clamp } }
  --sample NAME         the sample to run
  --draws N             most draws (default: the study's "draws", else 1000)
  --seed S              seed of the random numbers (default: the study's "seed", else 1); a run repeats exactly
  --lhs                 Latin hypercube sampling (every stratum drawn once; no early stop)
  --precision P         stop once the standard error of P(warm) is below P (default 0.01; 0: never early)
  --min-draws N         draws before the early stop is considered (default 200)
  --workers N           worker threads besides the main thread, which computes too (default: cores − 1, at
                        most 7; 0: main thread only). Results do not depend on N.
  --json                JSON output (every figure's histogram included)
Reports, for extinction, scattering, absorption, ω, g, β̄, τ and the forcing at 550 nm: the plain value, median,
5–95 % range, mean and sd; P(warm) = P(forcing > 0) with its binomial standard error; and the inputs ranked by
|Spearman rank correlation| with the thin-layer forcing. Progress goes to standard error on a terminal; Ctrl-C
stops the run and reports the draws made so far (exit status 130).`

export interface ParallelOptions {
  /** Worker threads besides this thread (which computes draws too); 0 runs in this thread only. */
  workers: number
  /** Called after each block with the draws done so far (in order from draw 0) and P(warm) among them. */
  onProgress?: (p: { done: number; total: number; warm: number; standardError: number }) => void
  /** Resolves (or is already resolved) when the run should stop: the draws made so far are reported. */
  cancel?: Promise<void>
}

const FORCING = UNCERTAINTY_FIGURES.findIndex((f) => f.key === 'forcing')

/** Starts one uncertainty worker thread (built JavaScript when the command line is built; see workers/start.ts). */
export function startUncertaintyWorker(workerData: unknown): Worker {
  return startCliWorker('uncertainty-worker', workerData)
}

/** Contiguous draws from 0 among the received blocks. */
function prefixOf(blocks: DrawBlock[], nIn: number): DrawBlock {
  const sorted = [...blocks].sort((a, b) => a.start - b.start)
  const take: DrawBlock[] = []
  let next = 0
  for (const b of sorted) {
    if (b.start !== next) break
    take.push(b)
    next += b.count
  }
  return mergeDrawBlocks(take, nIn)
}

/** Draws per block handed to a thread. */
const BLOCK_DRAWS = 25

/**
 * An uncertainty run split over threads: this thread and `workers` worker threads take blocks of
 * BLOCK_DRAWS draws in order as they become free (this thread starts at once; a worker joins when it has
 * loaded, which takes a second or more). The early stop is judged on the draws from 0 in order at fixed
 * checkpoints, so the result is the same for any number of workers (and the same as `runUncertainty`).
 */
export async function runUncertaintyInWorkers(study: Study, sampleName: string, options: UncertaintyRunOptions, parallel: ParallelOptions): Promise<UncertaintyResult> {
  const plan = planUncertainty(study, sampleName, options)
  const nIn = plan.inputs.length
  const chunks: [number, number][] = []
  for (let s = 0; s < plan.draws; s += BLOCK_DRAWS) chunks.push([s, Math.min(plan.draws, s + BLOCK_DRAWS)])
  const nWorkers = Math.max(0, Math.min(parallel.workers, chunks.length - 1))
  const blocks: DrawBlock[] = []
  let status: UncertaintyStatus = 'completed'
  let stopAt: number | null = null

  const progress = (prefix: DrawBlock) => {
    if (!parallel.onProgress) return
    let warm = 0
    for (let i = 0; i < prefix.count; i++) if (prefix.outputs[i * UNCERTAINTY_FIGURES.length + FORCING] > 0) warm++
    parallel.onProgress({ done: prefix.count, total: plan.draws, warm: prefix.count ? warm / prefix.count : NaN, standardError: prefix.count ? stoppingStandardError(warm, prefix.count) : NaN })
  }
  /** After a block arrives: true when the run has what it needs. */
  const judge = (): boolean => {
    const prefix = prefixOf(blocks, nIn)
    progress(prefix)
    const stop = earlyStopPoint(plan, prefix)
    if (stop !== null) {
      stopAt = stop
      status = 'precision reached'
      return true
    }
    return prefix.count >= plan.draws
  }

  await new Promise<void>((resolve, reject) => {
    let nextChunk = 0
    let finished = false
    const workers: Worker[] = []
    const finish = (err?: unknown) => {
      if (finished) return
      finished = true
      for (const w of workers) void w.terminate()
      if (err) reject(err)
      else resolve()
    }
    parallel.cancel?.then(() => finish())
    const give = (w: Worker) => {
      if (finished || nextChunk >= chunks.length) return
      const [start, end] = chunks[nextChunk++]
      w.postMessage({ type: 'draws', start, end })
    }
    for (let k = 0; k < nWorkers; k++) {
      const w = startUncertaintyWorker({ study, sampleName, options })
      workers.push(w)
      w.on('message', (m: { type: string; start: number; count: number; inputs: Float64Array; outputs: Float64Array; input?: boolean; where?: string; fix?: string; message?: string }) => {
        if (finished) return
        if (m.type === 'ready') give(w)
        else if (m.type === 'block') {
          blocks.push({ start: m.start, count: m.count, inputs: m.inputs, outputs: m.outputs })
          if (judge()) finish()
          else give(w)
        } else if (m.type === 'error') {
          if (m.input) {
            const e = new InputError(m.where ?? 'uncertainty', 'a draw failed', m.fix ?? '')
            e.message = m.message ?? e.message
            finish(e)
          } else finish(new Error(`uncertainty worker: ${m.message}`))
        }
      })
      w.on('error', (e) => finish(e))
      w.on('exit', (code) => {
        if (!finished && code !== 0) finish(new Error(`uncertainty worker stopped with exit code ${code}`))
      })
    }
    // This thread works too, one block at a time, yielding between blocks for messages and Ctrl-C.
    const ws = new OpticsWorkspace()
    const own = async () => {
      while (!finished && nextChunk < chunks.length) {
        const [start, end] = chunks[nextChunk++]
        blocks.push(computeDraws(plan, start, end, ws))
        if (judge()) return finish()
        await new Promise((r) => setImmediate(r))
      }
      // Out of blocks to start: the workers finish theirs (judge() ends the run with the last one).
      if (!finished && blocks.reduce((n, b) => n + b.count, 0) >= plan.draws) finish()
    }
    own().catch(finish)
  })
  let prefix = prefixOf(blocks, nIn)
  if (stopAt !== null) prefix = truncateBlock(prefix, stopAt, nIn)
  else if (prefix.count < plan.draws) status = 'cancelled'
  if (prefix.count === 0) throw new InputError('uncertainty', 'the run was stopped before any draw was made', 'Run it again and let it make at least one draw.')
  return summarizeDraws(plan, prefix, status, centralFigures(plan))
}

export async function runUncertaintyCommand(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs(
    'uncertainty',
    argv,
    {
      sample: { type: 'string' },
      draws: { type: 'string' },
      seed: { type: 'string' },
      lhs: { type: 'boolean', default: false },
      precision: { type: 'string' },
      'min-draws': { type: 'string' },
      workers: { type: 'string' },
      json: { type: 'boolean', default: false }
    },
    true
  )
  if (positionals.length !== 1) throw new UsageError('uncertainty: give one study file, for example "motebench uncertainty demo.mote --sample \'Winter wood smoke\'"')
  if (values.sample === undefined) throw new UsageError('uncertainty: --sample is required, for example --sample "Winter wood smoke"')
  const whole = (text: string | undefined, flag: string, lo: number) => {
    if (text === undefined) return undefined
    const v = readNumber(text, flag)
    if (!Number.isInteger(v) || v < lo) throw new UsageError(`${flag}: "${text}" is not a whole number of at least ${lo}`)
    return v
  }
  const file = positionals[0]
  const parsed = parseStudy(await readFile(file, 'utf8'), basename(file))
  if (!parsed.ok) {
    const p = parsed.problems[0]
    throw new InputError(`${file}: ${p.path}`, `${p.message}${parsed.problems.length > 1 ? ` (and ${parsed.problems.length - 1} more problems; see "motebench check ${file}")` : ''}`, p.fix)
  }
  const options: UncertaintyRunOptions = {
    draws: whole(values.draws, '--draws', 1),
    seed: whole(values.seed, '--seed', 0),
    sampling: values.lhs ? 'latin-hypercube' : undefined,
    precision: values.precision === undefined ? undefined : readNumber(values.precision, '--precision'),
    minDraws: whole(values['min-draws'], '--min-draws', 1)
  }
  const workers = whole(values.workers, '--workers', 0) ?? Math.min(7, availableParallelism() - 1)
  const tty = process.stderr.isTTY
  let interrupted = false
  let onInterrupt: () => void = () => {}
  const cancel = new Promise<void>((resolve) => {
    onInterrupt = () => {
      interrupted = true
      resolve()
    }
  })
  process.once('SIGINT', onInterrupt)
  let result: UncertaintyResult
  try {
    result = await runUncertaintyInWorkers(parsed.study, values.sample, options, {
      workers,
      cancel,
      onProgress: tty
        ? (p) => process.stderr.write(`\r  ${p.done}/${p.total} draws, P(warm) ${formatNumber(p.warm)} ± ${formatNumber(p.standardError)}   `)
        : undefined
    })
  } finally {
    process.removeListener('SIGINT', onInterrupt)
    if (tty) process.stderr.write('\r\x1b[K')
  }
  if (values.json) printJson(result)
  else printUncertainty(result)
  return interrupted ? 130 : 0
}

function printUncertainty(r: UncertaintyResult): void {
  const out = process.stdout
  out.write(`${r.sample}: ${r.draws} draws (${r.sampling === 'latin-hypercube' ? 'Latin hypercube' : 'random'} sampling, seed ${r.seed}), ${r.status}\n\n`)
  const rows: (string | number)[][] = [['figure at 550 nm', 'plain', 'median', '5 %', '95 %', 'mean', 'sd', 'unit']]
  for (const f of r.figures) rows.push([f.key, f.central, f.median, f.p05, f.p95, f.mean, f.sd, f.unit])
  printTable(rows)
  out.write(`\nP(warm) = P(thin-layer forcing > 0) = ${formatNumber(r.warming.probability)} ± ${formatNumber(r.warming.standard_error)} (binomial standard error, ${r.warming.positives} of ${r.warming.count} draws)\n`)
  out.write(`\n${r.sensitivity.method}:\n`)
  const sens: (string | number)[][] = [['input', 'ρ']]
  for (const s of r.sensitivity.ranking) sens.push([s.label, s.rho === null ? 'no spread' : s.rho])
  printTable(sens)
  for (const n of r.notes) out.write(`note: ${n}\n`)
}
