// motebench uncertainty: Monte Carlo propagation of a sample's input uncertainties to its 550 nm optics and forcing,
// split over worker threads.
import { readFile, rename, unlink, writeFile } from 'node:fs/promises'
import { basename } from 'node:path'
import type { Worker } from 'node:worker_threads'
import {
  centralFigures,
  completePlan,
  computeDraws,
  earlyStopPoint,
  drawWorkspace,
  InputError,
  mergeDrawBlocks,
  parseStudy,
  planUncertainty,
  stoppingStandardError,
  summarizeDraws,
  truncateBlock,
  UNCERTAINTY_FIGURES,
  UNCERTAINTY_VERDICT_FIGURE,
  type DrawBlock,
  type Study,
  type UncertaintyResult,
  type UncertaintyRunOptions,
  type UncertaintyPlan,
  type UncertaintyStatus
} from '../../src-core/index.ts'
import { formatNumber, printJson, printTable, readArgs, readNumber, UsageError } from './common.ts'
import { readShard, runFingerprint, shardLine, shardRange } from './shard.ts'
import { UNCERTAINTY_ARGS, uncertaintyWorkerCount, wholeArg } from './uncertainty-args.ts'
import { drawsHead, drawsRows, readDraws } from './uncertainty-draws.ts'
import { takeEarly } from './workers/early.ts'
import { startCliWorker } from './workers/start.ts'
import type { ToUncertaintyWorker } from './workers/uncertainty-worker.ts'

export const uncertaintyHelp = `motebench uncertainty FILE.mote --sample NAME: Monte Carlo uncertainty of a sample's 550 nm optics and forcing
  FILE.mote             a study whose "uncertainty" settings list the sample's uncertain inputs:
                          "uncertainty": { "samples": { "NAME": { "inputs": [ ... ] } }, "site": { "inputs": [ ... ] } }
                        each input: { "quantity": n | k | median | gsd | amount | density | kappa | rh | layer |
                          surface_albedo | cloud_fraction | transmittance | surface_temperature (K) |
                          surface_emissivity | layer_height (km) | water_column (cm) | spread (measured bins kept with
                          their spread, e.g. a stretch of a station record: apply add, normal 0, 1 draws every bin
                          within it), "material": id (n, k), "mode": 0-based index or name (median, gsd, amount),
                          "spread_scale": standard-error (default) | standard-deviation (spread),
                          "apply": factor | add | set,
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
  --save-draws FILE     also write every draw (its input variates and figures, CSV in full precision) to FILE
  --from-draws FILE     report from a draws file (--save-draws, or the shards put together by "motebench join")
                        instead of drawing; give the same study and options as the run that drew them
  --shard K/N           draw only the K-th of N contiguous parts of the draws (the same draws as in the whole
                        run) and write them as a draws file (--out FILE, else standard output) after a shard
                        line; needs --precision 0 or --lhs (no early stop)
  --out FILE            with --shard: the part's draws file (it appears only when complete)
Reports, for extinction, scattering, absorption, ω, g, β̄, τ and the forcing at 550 nm: the plain value, median,
5–95 % range, mean and sd; P(warm) = P(net forcing > 0) with its binomial standard error; and the inputs ranked by
|Spearman rank correlation| with the net forcing (the thin-layer sunlight figure plus the infrared one). Progress goes to standard error on a terminal; Ctrl-C
stops the run and reports the draws made so far (exit status 130).`

export interface ParallelOptions {
  /** Worker threads besides this thread (which computes draws too); 0 runs in this thread only. */
  workers: number
  /** Called after each block with the draws done so far (in order from draw 0) and P(warm) among them. */
  onProgress?: (p: { done: number; total: number; warm: number; standardError: number }) => void
  /** Resolves (or is already resolved) when the run should stop: the draws made so far are reported. */
  cancel?: Promise<void>
}

const FORCING = UNCERTAINTY_FIGURES.findIndex((f) => f.key === UNCERTAINTY_VERDICT_FIGURE)

/** Starts one uncertainty worker thread (built JavaScript when the command line is built; see workers/start.ts). */
export function startUncertaintyWorker(): Worker {
  return startCliWorker('uncertainty-worker', undefined)
}

/** Contiguous draws from `from` among the received blocks. */
function prefixOf(blocks: DrawBlock[], nIn: number, from = 0): DrawBlock {
  const sorted = [...blocks].sort((a, b) => a.start - b.start)
  const take: DrawBlock[] = []
  let next = from
  for (const b of sorted) {
    if (b.start !== next) break
    take.push(b)
    next += b.count
  }
  return mergeDrawBlocks(take, nIn)
}

/** Draws per block handed to a thread, and the fewest in the last blocks (see drawBlocks). */
const BLOCK_DRAWS = 25
const LAST_BLOCK_DRAWS = 4

/**
 * The blocks of draws [from, to) for `threads` threads: BLOCK_DRAWS each, smaller towards the end (a quarter of
 * what is left per thread, at least LAST_BLOCK_DRAWS), so that the threads finish close together (a whole block
 * at the end left the other thread idle for up to 25 draws).
 */
export function drawBlocks(from: number, to: number, threads: number): [number, number][] {
  const blocks: [number, number][] = []
  for (let s = from; s < to; ) {
    const size = Math.max(LAST_BLOCK_DRAWS, Math.min(BLOCK_DRAWS, Math.ceil((to - s) / (4 * threads))))
    const e = Math.min(to, s + size)
    blocks.push([s, e])
    s = e
  }
  return blocks
}

/**
 * An uncertainty run split over threads: this thread and `workers` worker threads take blocks of draws
 * (drawBlocks) in order as they become free, through a shared counter (this thread starts at once; a worker joins
 * when it has loaded and planned: started by main.ts while this thread loads the command, it is ready about when
 * this thread's plan is). The early stop is judged on the draws from 0 in order at fixed
 * checkpoints, so the result is the same for any number of workers (and the same as `runUncertainty`).
 */
export async function runUncertaintyInWorkers(study: Study, sampleName: string, options: UncertaintyRunOptions, parallel: ParallelOptions): Promise<UncertaintyResult> {
  const plan = planUncertainty(study, sampleName, options)
  const { block, status } = await drawInWorkers(plan, study, sampleName, options, parallel)
  return summarizeDraws(plan, block, status, centralFigures(plan))
}

/**
 * The draws [from, to) of a plan (default: all, with the early stop), made by this thread and the workers; draw i
 * is the same whatever the range and the number of workers (each draw's random numbers come from the seed and i).
 */
export async function drawInWorkers(plan: UncertaintyPlan, study: Study, sampleName: string, options: UncertaintyRunOptions, parallel: ParallelOptions, range: [number, number] = [0, plan.draws]): Promise<{ block: DrawBlock; status: UncertaintyStatus }> {
  const nIn = plan.inputs.length
  const [from, to] = range
  const chunks = drawBlocks(from, to, 1 + Math.max(0, parallel.workers))
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
  // The draws in order from the first are put together after each block only where something looks at them.
  const watch = parallel.onProgress !== undefined || (plan.sampling !== 'latin-hypercube' && plan.precision > 0 && from === 0)
  let received = 0
  /** After a block arrives: true when the run has what it needs. */
  const judge = (): boolean => {
    received += blocks[blocks.length - 1].count
    if (!watch) return received >= to - from
    const prefix = prefixOf(blocks, nIn, from)
    progress(prefix)
    const stop = earlyStopPoint(plan, prefix)
    if (stop !== null) {
      stopAt = stop
      status = 'precision reached'
      return true
    }
    return prefix.count >= to - from
  }

  // The blocks, taken in order by whichever thread is free: this one and the workers each take the next through a
  // shared counter (a worker does not wait for this thread, which reads messages only between its own blocks).
  const blockEnds = new Int32Array(2 * chunks.length)
  chunks.forEach(([s, e], b) => blockEnds.set([s, e], 2 * b))
  const next = new Int32Array(new SharedArrayBuffer(4))
  const arrived = new Int32Array(new SharedArrayBuffer(4))
  const take = (): [number, number] | null => {
    const b = Atomics.add(next, 0, 1)
    return b < chunks.length ? chunks[b] : null
  }
  await new Promise<void>((resolve, reject) => {
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
    // the workers main.ts started while the command loaded (workers/early.ts), then new ones
    let early: Worker[]
    try {
      early = takeEarly('uncertainty-worker', nWorkers)
    } catch (e) {
      finish(e)
      return
    }
    for (let k = 0; k < nWorkers; k++) {
      const w = early[k] ?? startUncertaintyWorker()
      workers.push(w)
      w.on('message', (m: { type: string; start: number; count: number; inputs: Float64Array; outputs: Float64Array; input?: boolean; where?: string; fix?: string; message?: string }) => {
        if (finished) return
        if (m.type === 'block') {
          blocks.push({ start: m.start, count: m.count, inputs: m.inputs, outputs: m.outputs })
          if (judge()) finish()
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
      w.postMessage({ type: 'plan', study, sampleName, options, nominal: plan.nominal, blocks: blockEnds, next, arrived } satisfies ToUncertaintyWorker)
    }
    // A plan made without the unperturbed sample's optics (planUncertainty's 'later'): they are computed here while
    // the workers draw (their draws' forcing waits for them), then sent.
    if (!plan.nominal) {
      try {
        completePlan(plan)
      } catch (e) {
        finish(e)
        return
      }
      for (const w of workers) w.postMessage({ type: 'nominal', nominal: plan.nominal! } satisfies ToUncertaintyWorker)
      Atomics.store(arrived, 0, 1)
      Atomics.notify(arrived, 0)
    }
    // This thread works too, one block at a time, yielding between blocks for messages and Ctrl-C.
    const ws = drawWorkspace()
    const own = async () => {
      for (let c = take(); !finished && c; c = take()) {
        blocks.push(computeDraws(plan, c[0], c[1], ws))
        if (judge()) return finish()
        await new Promise((r) => setImmediate(r))
      }
      // Out of blocks to start: the workers finish theirs (judge() ends the run with the last one).
      if (!finished && blocks.reduce((n, b) => n + b.count, 0) >= to - from) finish()
    }
    own().catch(finish)
  })
  let prefix = prefixOf(blocks, nIn, from)
  if (stopAt !== null) prefix = truncateBlock(prefix, stopAt, nIn)
  else if (prefix.count < to - from) status = 'cancelled'
  if (prefix.count === 0 && to > from) throw new InputError('uncertainty', 'the run was stopped before any draw was made', 'Run it again and let it make at least one draw.')
  return { block: prefix, status }
}

export async function runUncertaintyCommand(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs('uncertainty', argv, UNCERTAINTY_ARGS, true)
  if (positionals.length !== 1) throw new UsageError('uncertainty: give one study file, for example "motebench uncertainty demo.mote --sample \'Winter wood smoke\'"')
  if (values.sample === undefined) throw new UsageError('uncertainty: --sample is required, for example --sample "Winter wood smoke"')
  const whole = wholeArg
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
  const workers = uncertaintyWorkerCount(values.workers)
  const shard = readShard(values.shard, 'uncertainty')
  if (values.out !== undefined && !shard) throw new UsageError('uncertainty: --out is for the draws of a --shard K/N; the report goes to standard output (--save-draws FILE keeps every draw)')
  const sharded = shard !== undefined || values['save-draws'] !== undefined || values['from-draws'] !== undefined
  // the unperturbed sample's optics are left to drawInWorkers, which computes them while the workers start drawing
  const plan = planUncertainty(parsed.study, values.sample, options, 'later')
  // the run's fingerprint: the study's contents and every option that changes a draw or the report
  const fingerprint = sharded ? await runFingerprint('uncertainty', [file], { sample: values.sample, ...options }) : ''
  if (values['from-draws'] !== undefined) {
    if (shard) throw new UsageError('uncertainty: give --from-draws or --shard, not both')
    const block = await readDraws(values['from-draws'], plan, values.sample, fingerprint)
    const status: UncertaintyStatus = block.count === plan.draws ? 'completed' : earlyStopPoint(plan, block) === block.count ? 'precision reached' : 'cancelled'
    const result = summarizeDraws(plan, block, status, centralFigures(plan))
    if (values.json) printJson(result)
    else printUncertainty(result)
    return 0
  }
  if (shard && plan.sampling === 'random' && plan.precision > 0) {
    throw new UsageError('uncertainty: --shard needs --precision 0 (or --lhs): the early stop judges the draws in order from the first, which one part of them cannot')
  }
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
  let drawn: Awaited<ReturnType<typeof drawInWorkers>>
  const range = shard ? shardRange(plan.draws, shard) : undefined
  try {
    const parallel: ParallelOptions = {
      workers,
      cancel,
      onProgress: tty
        ? (p) => process.stderr.write(`\r  ${p.done}/${range ? range[1] - range[0] : p.total} draws, P(warm) ${formatNumber(p.warm)} ± ${formatNumber(p.standardError)}   `)
        : undefined
    }
    drawn = await drawInWorkers(plan, parsed.study, values.sample, options, parallel, range)
  } finally {
    process.removeListener('SIGINT', onInterrupt)
    if (tty) process.stderr.write('\r\x1b[K')
  }
  const head = sharded ? drawsHead(plan, values.sample, fingerprint) : ''
  if (shard) {
    if (interrupted) return 130 // a part of a shard is no shard: nothing written
    const text = shardLine('uncertainty', shard, fingerprint, 2) + head + drawsRows(drawn.block, plan.inputs.length)
    if (values.out !== undefined) await writeWhole(values.out, text)
    else process.stdout.write(text)
    process.stderr.write(`uncertainty: draws ${range![0]} to ${range![1] - 1} of ${plan.draws} (shard ${shard.k}/${shard.n})${values.out !== undefined ? ` written to ${values.out}` : ''}\n`)
    return 0
  }
  if (values['save-draws'] !== undefined) await writeWhole(values['save-draws'], head + drawsRows(drawn.block, plan.inputs.length))
  const result = summarizeDraws(plan, drawn.block, drawn.status, centralFigures(plan))
  if (values.json) printJson(result)
  else printUncertainty(result)
  return interrupted ? 130 : 0
}

/** Writes a file whole: to FILE.tmp-PID, then renamed. */
async function writeWhole(path: string, text: string): Promise<void> {
  const tmp = `${path}.tmp-${process.pid}`
  try {
    await writeFile(tmp, text)
    await rename(tmp, path)
  } catch (e) {
    await unlink(tmp).catch(() => {})
    throw new UsageError(`uncertainty: cannot write ${path}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'its folder does not exist' : (e as Error).message}`)
  }
}

function printUncertainty(r: UncertaintyResult): void {
  const out = process.stdout
  out.write(`${r.sample}: ${r.draws} draws (${r.sampling === 'latin-hypercube' ? 'Latin hypercube' : 'random'} sampling, seed ${r.seed}), ${r.status}\n\n`)
  const rows: (string | number)[][] = [['figure at 550 nm', 'plain', 'median', '5 %', '95 %', 'mean', 'sd', 'unit']]
  for (const f of r.figures) rows.push([f.key, f.central, f.median, f.p05, f.p95, f.mean, f.sd, f.unit])
  printTable(rows)
  out.write(`\nP(warm) = P(net forcing > 0, sunlight + infrared) = ${formatNumber(r.warming.probability)} ± ${formatNumber(r.warming.standard_error)} (binomial standard error, ${r.warming.positives} of ${r.warming.count} draws)\n`)
  out.write(`\n${r.sensitivity.method}:\n`)
  const sens: (string | number)[][] = [['input', 'ρ']]
  for (const s of r.sensitivity.ranking) sens.push([s.label, s.rho === null ? 'no spread' : s.rho])
  printTable(sens)
  for (const n of r.notes) out.write(`note: ${n}\n`)
}
