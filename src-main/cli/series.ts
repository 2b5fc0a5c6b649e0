// motebench series SIZER --study FILE --sample NAME: one row of optics per time step of a sizer time series.
//
// The sizer file is read line by line (node:readline) into createSizerReader, so memory does not grow with the
// number of rows. Each distribution goes to a worker thread (computeSampleOptics with the sample's composition,
// humidity and layer and the row's bins); results come back out of order and are written in input order. At most
// WINDOW rows are read ahead of the last row written: when the window is full, reading waits (backpressure).
import { createReadStream } from 'node:fs'
import { open, rename, stat, unlink, type FileHandle } from 'node:fs/promises'
import { availableParallelism } from 'node:os'
import { basename } from 'node:path'
import { createInterface } from 'node:readline'
import { Worker } from 'node:worker_threads'
import {
  BIN_QUANTITIES,
  createSizerReader,
  dryIndicesAt,
  InputError,
  resolveComposition,
  studyMaterials,
  type BinQuantityName,
  type SizerHeader,
  type SizerOptions,
  type SizerRejection
} from '../../src-core/index.ts'
import { loadStudyFile } from '../files.ts'
import { csvCell, EXIT_OK, EXIT_SKIPPED, findSample, readArgs, readInteger, readTolerance, readWavelengthsNm, UsageError } from './common.ts'
import { computeRow, SeriesRowComputer, seriesColumns, type BinLayout, type SeriesSetup } from './series-row.ts'
import { prepareSeriesOptical, SERIES_OPTICAL_OPTIONS, seriesOpticalHelp, type SeriesExtra } from './series-optical.ts'
import type { FromWorker, RowResult, ToWorker } from './workers/series-worker.ts'

export const seriesHelp = `motebench series SIZER --study FILE.mote --sample NAME: optics of every distribution of a sizer time series
  SIZER                 sizer export with one row per time and one column per bin (.csv, .tsv or .txt)
  --study FILE          study whose sample gives composition, humidity and layer
  --sample NAME         that sample (its size distribution is replaced by each row's bins)
  --wavelengths LIST    e.g. 450,550,700 (nm) or 0.45,0.55um (default: the study's wavelengths)
  --out FILE            write the CSV to FILE (it appears only when complete) instead of standard output
  --on-bad-row P        skip (default: leave bad rows out, list them, exit status 1) or stop (at the first, exit 2)
  --workers N           worker threads beside the main thread, which computes rows too (default: one fewer
                        than the processors, at least 1: ${Math.max(1, availableParallelism() - 1)} here)
  --tolerance T         relative accuracy of each bin's size integration (default 1e-4); the bins are
                        integrated once and every row is a weighted sum of them
  --diameter-unit U     nm or um, when the file does not say
  --quantity Q          ${BIN_QUANTITIES.join(', ')}, when the file does not say
${seriesOpticalHelp}
Output: CSV with time, then per wavelength ext, sca, abs (Mm⁻¹), ssa, g, then dry number (cm⁻³), volume
(µm³ cm⁻³) and mass (µg m⁻³). A summary goes to standard error; a progress bar too when it is a terminal.
Exit status 0, 1 when rows were skipped, 2 for bad input.`

/** Rows sent to one worker at a time, and rows read ahead of the last written per worker. */
/** Rows per message to a worker, rows a worker may hold, and rows read ahead of the writer per worker. */
const BATCH = 16
const IN_FLIGHT_PER_WORKER = 2 * BATCH
const WINDOW_PER_WORKER = 8 * BATCH
/** Reasons kept for the summary (the counts go on). */
const KEPT_REASONS = 1000

export interface SeriesOutput {
  /** Writes a chunk; resolves when it may be followed by more (backpressure). */
  write(text: string): Promise<void>
}

export interface SeriesRunOptions extends SeriesSetup {
  /** The sizer file's lines (without line breaks); the iterator is taken synchronously when the run starts. */
  lines: AsyncIterable<string>
  fileName: string
  sizer?: Pick<SizerOptions, 'diameterUnit' | 'quantity' | 'layout'>
  onBadRow: 'skip' | 'stop'
  workers: number
  output: SeriesOutput
  /** Called after rows are written, with the number written so far. */
  onProgress?: (written: number) => void
  /** Called every few hundred milliseconds while the pipeline runs (e.g. to sample memory). */
  onTick?: () => void
  /** Extra cells after each row's figures (measured optical instruments beside the sizer). */
  extra?: SeriesExtra
}

export interface SkippedRow {
  line: number
  column?: number
  reason: string
  fix: string
}

export interface SeriesSummary {
  header: SizerHeader
  distributionsRead: number
  rowsWritten: number
  /** Rows of the file left out by the reader (bad cells), and distributions the optics could not use. */
  rowsSkippedByReader: number
  rowsSkippedByOptics: number
  /** First KEPT_REASONS reasons, by line. */
  skipped: SkippedRow[]
  workers: number
  tolerance: number
  seconds: number
}

interface RowMeta {
  time: string
  line: number
  extra?: Float64Array
}

/** Splits an InputError message "where: problem. fix" back into its problem. */
function problemOf(r: { where: string; message: string; fix: string }): string {
  let m = r.message
  if (r.where && m.startsWith(`${r.where}: `)) m = m.slice(r.where.length + 2)
  if (r.fix && m.endsWith(`. ${r.fix}`)) m = m.slice(0, -(r.fix.length + 2))
  return r.where ? `${r.where}: ${m}` : m
}

/** Runs the series machinery: reads `lines`, computes in worker threads, writes CSV rows in input order. */
export async function runSeriesPipeline(o: SeriesRunOptions): Promise<SeriesSummary> {
  // Take the iterator before anything awaits, so a readline source buffers from its first line.
  const lineIterator = o.lines[Symbol.asyncIterator]()
  const source: AsyncIterable<string> = { [Symbol.asyncIterator]: () => lineIterator }
  const started = performance.now()
  const setup: SeriesSetup = { sample: o.sample, userMaterials: o.userMaterials, wavelengthsNm: o.wavelengthsNm, tolerance: o.tolerance }
  const workers: { worker: Worker; inFlight: number; ready: boolean }[] = []
  const window = WINDOW_PER_WORKER * o.workers
  // The main thread computes a row itself whenever every worker is full; worker threads take a few seconds to
  // load, and until then it does all the work.
  const local = new SeriesRowComputer(setup)
  let localBins: BinLayout | undefined
  const queue: { seq: number; values: number[] }[] = []
  const meta = new Map<number, RowMeta>()
  const done = new Map<number, RowResult>()
  let nextSeq = 0
  let nextWrite = 0
  let written = 0
  let failure: Error | undefined
  let wake: (() => void) | undefined
  let writing: Promise<void> = Promise.resolve()
  let unwrittenChars = 0
  let binsSent = false
  const opticsSkips: SkippedRow[] = []
  let opticsSkipCount = 0

  const notify = (): void => {
    const w = wake
    wake = undefined
    w?.()
  }
  const changed = (): Promise<void> => new Promise((resolve) => (wake = resolve))
  const fail = (e: Error): void => {
    if (!failure) failure = e
    notify()
  }

  const pump = (): void => {
    while (queue.length > 0 && !failure) {
      let best: (typeof workers)[number] | undefined
      for (const w of workers) {
        const room = (w.ready ? IN_FLIGHT_PER_WORKER : BATCH) - w.inFlight
        if (room >= Math.min(BATCH, queue.length) && (!best || w.inFlight < best.inFlight)) best = w
      }
      if (best) {
        const rows = queue.splice(0, BATCH)
        best.inFlight += rows.length
        best.worker.postMessage({ type: 'rows', rows } satisfies ToWorker)
      } else {
        // every worker is full (or still loading): the main thread takes the row
        const row = queue.shift()!
        done.set(row.seq, computeRow(local, localBins, row.seq, row.values))
        flush()
      }
    }
  }

  /** Writes every finished row that is next in input order. */
  const flush = (): void => {
    let text = ''
    while (done.has(nextWrite)) {
      const r = done.get(nextWrite)!
      const m = meta.get(nextWrite)!
      done.delete(nextWrite)
      meta.delete(nextWrite)
      nextWrite++
      if (r.ok) {
        text += csvCell(m.time) + ',' + r.cells.map(csvCell).join(',') + (m.extra ? ',' + Array.from(m.extra, csvCell).join(',') : '') + '\n'
        if (m.extra) o.extra!.written(m.extra)
        written++
      } else if (r.internal) {
        fail(new Error(`the optics of line ${m.line} failed: ${r.message}`))
        return
      } else if (o.onBadRow === 'stop') {
        fail(new InputError(`${o.fileName} line ${m.line}`, `the distribution of this row cannot be used (${problemOf(r)})`, r.fix))
        return
      } else {
        opticsSkipCount++
        if (opticsSkips.length < KEPT_REASONS) opticsSkips.push({ line: m.line, reason: `the distribution cannot be used (${problemOf(r)}); the row is left out`, fix: r.fix })
      }
    }
    if (text) {
      unwrittenChars += text.length
      writing = writing.then(async () => {
        await o.output.write(text)
        unwrittenChars -= text.length
        notify()
      })
      writing.catch(fail)
      o.onProgress?.(written)
    }
  }

  const onMessage = (w: (typeof workers)[number], m: FromWorker): void => {
    w.ready = true
    w.inFlight -= m.results.length
    for (const r of m.results) done.set(r.seq, r)
    flush()
    pump()
    notify()
  }

  for (let i = 0; i < o.workers; i++) {
    const worker = new Worker(new URL('./workers/series-bootstrap.mjs', import.meta.url), { workerData: setup })
    const entry = { worker, inFlight: 0, ready: false }
    worker.on('message', (m: FromWorker) => onMessage(entry, m))
    worker.on('error', (e) => fail(new Error(`a worker thread failed: ${e.message}`)))
    worker.on('exit', (code) => {
      if (code !== 0) fail(new Error(`a worker thread stopped (exit code ${code})`))
    })
    workers.push(entry)
  }

  const reader = createSizerReader({
    ...o.sizer,
    fileName: o.fileName,
    onBadRow: o.onBadRow,
    maxKeptRejections: KEPT_REASONS,
    onRecord: (record) => {
      if (!binsSent) {
        const h = reader.header!
        const bins: BinLayout = { diameters: h.diameters.slice(), diameter_unit: h.diameterUnit, edges: h.edges, quantity: h.quantity }
        for (const w of workers) w.worker.postMessage({ type: 'bins', bins } satisfies ToWorker)
        localBins = bins
        binsSent = true
      }
      const seq = nextSeq++
      meta.set(seq, { time: record.time, line: record.line, extra: o.extra?.cells(record.time, record.values, localBins!) })
      queue.push({ seq, values: record.values })
      pump()
    }
  })

  // Non-blank line numbers seen early, to count the data rows after the header once it is known.
  const earlyNonBlank: number[] = []
  let nonBlank = 0
  let lineNo = 0
  const tick = o.onTick ? setInterval(o.onTick, 200) : undefined
  try {
    const comments = o.extra ? o.extra.headerComments.map((c) => `# ${c}\n`).join('') : ''
    await o.output.write(comments + [...seriesColumns(o.wavelengthsNm), ...(o.extra?.columns ?? [])].map(csvCell).join(',') + '\n')
    for await (const line of source) {
      lineNo++
      if (line.trim() !== '') {
        nonBlank++
        if (earlyNonBlank.length < 5000) earlyNonBlank.push(lineNo)
      }
      reader.push(line)
      while (!failure && (nextSeq - nextWrite >= window || unwrittenChars > 1 << 20)) await changed()
      if (failure) throw failure
    }
    const end = reader.end()
    if (end.recordCount === 0 && end.rejectedCount === 0) {
      throw new InputError(o.fileName, 'the file has a header but no distributions', 'Export at least one time step (one row per time, one column per bin).')
    }
    while (!failure && nextWrite < nextSeq) await changed()
    if (failure) throw failure
    await writing
    if (failure) throw failure

    const h = end
    let readerSkipped: number
    if (h.layout === 'time-rows') {
      const beforeData = earlyNonBlank.filter((l) => l <= h.headerLine).length
      readerSkipped = Math.max(0, nonBlank - beforeData - end.recordCount)
    } else {
      readerSkipped = new Set(end.rejected.map((r) => r.line)).size
    }
    const skipped: SkippedRow[] = [...end.rejected.map((r: SizerRejection) => ({ ...r })), ...opticsSkips].sort((a, b) => a.line - b.line || (a.column ?? 0) - (b.column ?? 0))
    const { recordCount: _r, rejected: _j, rejectedCount: _c, ...header } = end
    return {
      header,
      distributionsRead: end.recordCount + readerSkipped,
      rowsWritten: written,
      rowsSkippedByReader: readerSkipped,
      rowsSkippedByOptics: opticsSkipCount,
      skipped: skipped.slice(0, KEPT_REASONS),
      workers: o.workers,
      tolerance: o.tolerance,
      seconds: (performance.now() - started) / 1000
    }
  } finally {
    if (tick) clearInterval(tick)
    await Promise.all(workers.map((w) => (w.worker.removeAllListeners('exit'), w.worker.terminate())))
  }
}

/** Output to a file: written to FILE.tmp-PID, renamed to FILE when complete, removed otherwise. */
async function fileOutput(path: string) {
  const tmp = `${path}.tmp-${process.pid}`
  let handle: FileHandle
  try {
    handle = await open(tmp, 'w')
  } catch (e) {
    throw new UsageError(`series: cannot write ${path}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'its folder does not exist' : (e as Error).message}`)
  }
  let closed = false
  const close = async () => {
    if (!closed) {
      closed = true
      await handle.close()
    }
  }
  const onSignal = () => {
    // interrupted: leave no partial file behind
    void unlink(tmp).finally(() => process.exit(130))
  }
  process.once('SIGINT', onSignal)
  process.once('SIGTERM', onSignal)
  const detach = () => {
    process.off('SIGINT', onSignal)
    process.off('SIGTERM', onSignal)
  }
  return {
    output: { write: async (text: string) => void (await handle.write(text)) } satisfies SeriesOutput,
    async commit() {
      await handle.sync()
      await close()
      await rename(tmp, path)
      detach()
    },
    async discard() {
      await close().catch(() => {})
      await unlink(tmp).catch(() => {})
      detach()
    }
  }
}

const stdoutOutput: SeriesOutput = {
  write: (text) =>
    new Promise((resolve, reject) => {
      const ok = process.stdout.write(text, (e) => (e ? reject(e) : undefined))
      if (ok) resolve()
      else process.stdout.once('drain', () => resolve())
    })
}

/** A progress bar on standard error: the share of the file read, and the rows written (only on a terminal). */
function progressBar(total: number, bytesRead: () => number) {
  let written = 0
  const render = () => {
    const f = total > 0 ? Math.min(1, bytesRead() / total) : 0
    const width = 30
    const full = Math.round(f * width)
    process.stderr.write(`\r[${'#'.repeat(full)}${'.'.repeat(width - full)}] ${(f * 100).toFixed(0).padStart(3)}% read, ${written} rows written`)
  }
  const timer = setInterval(render, 250)
  timer.unref()
  return {
    update(n: number) {
      written = n
    },
    clear() {
      clearInterval(timer)
      process.stderr.write('\r\x1b[K')
    }
  }
}

function summaryText(file: string, s: SeriesSummary, out: string | undefined, wavelengths: number): string {
  const skipped = s.rowsSkippedByReader + s.rowsSkippedByOptics
  const lines = [
    `series: ${file}: ${s.distributionsRead} row${s.distributionsRead === 1 ? '' : 's'} read, ${s.rowsWritten} written${out ? ` to ${out}` : ''}, ${skipped} skipped` +
      (skipped > 0 ? ` (${s.rowsSkippedByReader} with bad cells, ${s.rowsSkippedByOptics} whose distribution the optics could not use)` : ''),
    `  ${s.header.diameters.length - (s.header.edges ? 1 : 0)} bins (${s.header.quantity}), ${wavelengths} wavelength${wavelengths === 1 ? '' : 's'}; size-integration tolerance ${s.tolerance} (relative); ${s.workers} worker${s.workers === 1 ? '' : 's'}; ${s.seconds.toFixed(1)} s`
  ]
  const show = s.skipped.slice(0, 20)
  for (const r of show) lines.push(`  line ${r.line}${r.column !== undefined ? ` column ${r.column}` : ''}: ${r.reason}${r.fix ? `\n    fix: ${r.fix}` : ''}`)
  if (s.skipped.length > show.length) lines.push(`  ... and ${s.skipped.length - show.length} more reasons not shown`)
  return lines.join('\n') + '\n'
}

export async function runSeries(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs(
    'series',
    argv,
    {
      study: { type: 'string' },
      sample: { type: 'string' },
      wavelengths: { type: 'string' },
      out: { type: 'string' },
      'on-bad-row': { type: 'string' },
      workers: { type: 'string' },
      tolerance: { type: 'string' },
      'diameter-unit': { type: 'string' },
      quantity: { type: 'string' },
      ...SERIES_OPTICAL_OPTIONS
    },
    true
  )
  if (positionals.length !== 1) throw new UsageError('series: give one sizer file, for example "motebench series sizer.csv --study demo.mote --sample NAME"')
  const file = positionals[0]
  if (values.study === undefined) throw new UsageError('series: --study is required, for example --study demo.mote (the sample gives composition, humidity and layer)')
  if (values.sample === undefined) throw new UsageError('series: --sample is required: the name of a sample of the study')
  const policy = values['on-bad-row'] ?? 'skip'
  if (policy !== 'skip' && policy !== 'stop') throw new UsageError(`series: --on-bad-row "${policy}" is not skip or stop`)
  const workers = readInteger(values.workers, '--workers', 1, 64, Math.max(1, availableParallelism() - 1))
  const tolerance = readTolerance(values.tolerance, 1e-4)
  const sizer: SeriesRunOptions['sizer'] = {}
  if (values['diameter-unit'] !== undefined) {
    const u = values['diameter-unit'].replace(/[µμ]m/, 'um')
    if (u !== 'nm' && u !== 'um') throw new UsageError(`series: --diameter-unit "${values['diameter-unit']}" is not nm or um`)
    sizer.diameterUnit = u
  }
  if (values.quantity !== undefined) {
    if (!(BIN_QUANTITIES as readonly string[]).includes(values.quantity)) throw new UsageError(`series: --quantity "${values.quantity}" is not one of ${BIN_QUANTITIES.join(', ')}`)
    sizer.quantity = values.quantity as BinQuantityName
  }

  const { study } = await loadStudyFile(values.study)
  const { sample } = findSample(study, values.sample, 'series')
  let wavelengthsNm = values.wavelengths !== undefined ? readWavelengthsNm(values.wavelengths) : study.wavelengths_nm.slice()
  const userMaterials = study.user_materials ?? []
  // Measured optical instruments beside the sizer: read and aligned to the sizer rows before the run; the
  // figures are computed at their wavelengths too.
  const optical = await prepareSeriesOptical(values, { sizerPath: file, sizer, sample, userMaterials, tolerance })
  if (optical) wavelengthsNm = [...new Set([...wavelengthsNm, ...optical.wavelengthsNm])].sort((a, b) => a - b)
  // Check the composition at every wavelength here, so a bad one is one clear message rather than one per row.
  const own = studyMaterials({ user_materials: userMaterials, wavelengths_nm: wavelengthsNm })
  const kind = resolveComposition(sample.composition, own, `sample "${sample.name}"`)
  for (const w of wavelengthsNm) dryIndicesAt(kind, w / 1000)

  const size = (await stat(file)).size
  const target = values.out !== undefined ? await fileOutput(values.out) : undefined
  // No await between opening the lines and iterating them (runSeriesPipeline takes the iterator at once):
  // readline emits lines as soon as the file is read, and lines emitted before the iterator exists are lost.
  const stream = createReadStream(file, { encoding: 'utf8' })
  const lines = createInterface({ input: stream, crlfDelay: Infinity })
  const bar = process.stderr.isTTY ? progressBar(size, () => stream.bytesRead) : undefined
  let summary: SeriesSummary
  try {
    summary = await runSeriesPipeline({
      sample,
      userMaterials,
      wavelengthsNm,
      tolerance,
      lines,
      fileName: basename(file),
      sizer,
      onBadRow: policy,
      workers,
      output: target ? target.output : stdoutOutput,
      extra: optical?.extra,
      onProgress: bar ? (n) => bar.update(n) : undefined
    })
    await target?.commit()
  } catch (e) {
    await target?.discard()
    throw e
  } finally {
    bar?.clear()
    lines.close()
    stream.destroy()
  }
  process.stderr.write(summaryText(file, summary, values.out, wavelengthsNm.length) + (optical ? optical.extra.summary().join('\n') + '\n' : ''))
  return summary.rowsSkippedByReader + summary.rowsSkippedByOptics > 0 ? EXIT_SKIPPED : EXIT_OK
}
