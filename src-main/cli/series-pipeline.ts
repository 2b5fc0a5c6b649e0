// The series pipeline: the sizer file's lines read by createSizerReader, so memory does not grow with the number
// of rows. Rows are packed in blocks (BLOCK_ROWS distributions in one Float64Array) and each block goes to a worker
// thread, which integrates the bins' kernels once (or reads those an earlier run kept: kernel-cache.ts) and turns
// the block into CSV text (series-row.ts). Blocks come back out of order and are written in input order, in chunks
// of about a megabyte. At most a few blocks per worker are read ahead of the last block written: then reading waits
// (backpressure). The command (series.ts) gives it the lines, the setup and the output.
import type { Worker } from 'node:worker_threads'
import { binCount, createSizerReader, InputError, type SizerHeader, type SizerOptions, type SizerRejection } from '../../src-core/index.ts'
import { csvCell } from './common.ts'
import { seriesColumns, type BinLayout, type SeriesSetup } from './series-row.ts'
import type { FromWorker, ToWorker } from './workers/series-worker.ts'
import { startCliWorker } from './workers/start.ts'
import { takeEarly } from './workers/early.ts'
import type { SeriesExtra } from './series-optical.ts'
import type { ByteLines } from './file-lines.ts'
import type { KernelSource } from './kernel-cache.ts'

/**
 * Rows per block sent to a worker, blocks a worker may hold, blocks read ahead of the writer (at least; 8,192
 * rows, about 7 MB of values at 100 bins: enough for the reading to go on while the workers integrate the bins'
 * kernels, 0.1–0.3 s, rather than wait for them), and text gathered before it is written.
 */
const BLOCK_ROWS = 256
const BLOCKS_PER_WORKER = 3
const BLOCKS_AHEAD = 32
const WRITE_CHARS = 1 << 20
/** Reasons kept for the summary (the counts go on). */
const KEPT_REASONS = 1000

export interface SeriesOutput {
  /** Writes a chunk; resolves when it may be followed by more (backpressure). */
  write(text: string): Promise<void>
}

export interface SeriesRunOptions extends SeriesSetup {
  /**
   * The sizer file's lines (without line breaks), one at a time or in batches (of strings, or of a chunk's lines
   * as bytes: fileLinesFromBytes, read before the next batch is asked for, since their chunk's buffer may be filled
   * again then: fileChunks); the iterator is taken synchronously when the run starts.
   */
  lines: AsyncIterable<string | readonly string[] | ByteLines> & {
    /** From the next batch on, line `line` and those after it (false: this source cannot skip): skippingFileLines. */
    skipTo?(line: number): boolean
  }
  fileName: string
  sizer?: Pick<SizerOptions, 'diameterUnit' | 'quantity' | 'layout' | 'negatives' | 'dateOrder' | 'year'>
  onBadRow: 'skip' | 'stop'
  workers: number
  output: SeriesOutput
  /** Called after rows are written, with the number written so far. */
  onProgress?: (written: number) => void
  /** Called every few hundred milliseconds while the pipeline runs (e.g. to sample memory). */
  onTick?: () => void
  /** A shard: only the rows on these lines (1-based, inclusive), after this line written first. */
  shard?: { firstLine: number; lastLine: number; line: string }
  /** Extra cells after each row's figures (measured optical instruments beside the sizer; series-optical.ts). */
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
  /** With --negatives zero: the cells set to 0 and the rows that had any. */
  negativesZeroed: { cells: number; rows: number }
  workers: number
  tolerance: number
  /** Where each worker's bins' kernels came from (integrated, or read from the cache of an earlier run). */
  kernels: KernelSource[]
  seconds: number
  /** A shard: the lines before its own that were skipped unread (the table known from the file's first lines). */
  linesSkipped: number
}

/** Splits an InputError message "where: problem. fix" back into its problem. */
function problemOf(r: { where: string; message: string; fix: string }): string {
  let m = r.message
  if (r.where && m.startsWith(`${r.where}: `)) m = m.slice(r.where.length + 2)
  if (r.fix && m.endsWith(`. ${r.fix}`)) m = m.slice(0, -(r.fix.length + 2))
  return r.where ? `${r.where}: ${m}` : m
}

/** A block of rows on its way to a worker: time stamps, values packed row after row, and the rows' lines. */
interface Block {
  id: number
  times: string[]
  lines: number[]
  values: Float64Array
  /** With `extra`: each row's extra cells, computed on the main thread when the row is read. */
  extras?: Float64Array[]
}

/**
 * A block's CSV text with each written row's extra cells appended (rows are one line each, in order, without the
 * failed ones); the failures' offsets are moved to match. Calls `written` for every row of the text.
 */
function appendExtras(r: { text: string; failures: { index: number; at: number }[] }, extras: Float64Array[], written: (cells: Float64Array) => void): { text: string; at: number[] } {
  const rows = r.text.split('\n')
  rows.pop() // after the last line break
  const failed = new Set(r.failures.map((f) => f.index))
  let out = ''
  let row = 0
  const at: number[] = []
  let f = 0
  for (let i = 0; i < extras.length; i++) {
    if (failed.has(i)) {
      at[f++] = out.length
      continue
    }
    if (row >= rows.length) break
    out += rows[row++] + ',' + Array.from(extras[i], csvCell).join(',') + '\n'
    written(extras[i])
  }
  return { text: out, at }
}

/** Runs the series machinery: reads `lines`, computes in worker threads, writes CSV rows in input order. */
export async function runSeriesPipeline(o: SeriesRunOptions): Promise<SeriesSummary> {
  // Take the iterator before anything awaits, so a readline source buffers from its first line.
  const lineIterator = o.lines[Symbol.asyncIterator]()
  const source: AsyncIterable<string | readonly string[] | ByteLines> = { [Symbol.asyncIterator]: () => lineIterator }
  const started = performance.now()
  const setup: SeriesSetup = { sample: o.sample, userMaterials: o.userMaterials, wavelengthsNm: o.wavelengthsNm, tolerance: o.tolerance }
  const workers: { worker: Worker; inFlight: number }[] = []
  const window = Math.max(BLOCKS_AHEAD, (BLOCKS_PER_WORKER + 1) * o.workers)
  const queue: Block[] = []
  /** Line numbers of the blocks sent and not yet written, by block. */
  const blockLines = new Map<number, number[]>()
  const blockExtras = new Map<number, Float64Array[]>()
  const done = new Map<number, Extract<FromWorker, { type: 'block' }>>()
  let bins = 0
  let layoutForExtra: BinLayout | undefined
  let current: Block | undefined
  let nextId = 0
  let nextWrite = 0
  let written = 0
  let text = ''
  let failure: Error | undefined
  let wake: (() => void) | undefined
  let writing: Promise<void> = Promise.resolve()
  let unwrittenChars = 0
  const opticsSkips: SkippedRow[] = []
  const kernels: KernelSource[] = []
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

  /** Sends queued blocks to the workers with room, the least busy first. */
  const pump = (): void => {
    while (queue.length > 0 && !failure) {
      let best: (typeof workers)[number] | undefined
      for (const w of workers) if (w.inFlight < BLOCKS_PER_WORKER && (!best || w.inFlight < best.inFlight)) best = w
      if (!best) return
      const b = queue.shift()!
      best.inFlight++
      blockLines.set(b.id, b.lines)
      if (b.extras) blockExtras.set(b.id, b.extras)
      best.worker.postMessage({ type: 'block', id: b.id, times: b.times, values: b.values, bins } satisfies ToWorker, [b.values.buffer as ArrayBuffer])
    }
  }

  const send = (b: Block): void => {
    queue.push(b)
    pump()
  }

  // The CSV header goes out with the first rows (or at the end of a file whose rows were all left out), so a
  // file that cannot be read leaves no output at all.
  let pendingHeader = ''
  const write = (chunk: string): void => {
    if (pendingHeader) {
      chunk = pendingHeader + chunk
      pendingHeader = ''
    }
    unwrittenChars += chunk.length
    writing = writing.then(async () => {
      await o.output.write(chunk)
      unwrittenChars -= chunk.length
      notify()
    })
    writing.catch(fail)
  }

  /** Takes every finished block that is next in input order; writes once a megabyte of text is gathered. */
  const flush = (): void => {
    while (done.has(nextWrite) && !failure) {
      let r = done.get(nextWrite)!
      const lines = blockLines.get(nextWrite)!
      const extras = blockExtras.get(nextWrite)
      done.delete(nextWrite)
      blockLines.delete(nextWrite)
      blockExtras.delete(nextWrite)
      nextWrite++
      if (extras) {
        // the failures' offsets move with the extra cells; rows after a stopping failure are not counted as written
        const stopAt = o.onBadRow === 'stop' || r.failures.some((f) => f.internal) ? (r.failures[0]?.index ?? Infinity) : Infinity
        const x = appendExtras(r, extras.slice(0, Math.min(extras.length, stopAt)), o.extra!.written)
        r = { ...r, text: x.text, failures: r.failures.map((f, k) => ({ ...f, at: x.at[k] ?? x.text.length })) }
      }
      for (let k = 0; k < r.failures.length; k++) {
        const f = r.failures[k]
        const line = lines[f.index]
        if (f.internal || o.onBadRow === 'stop') {
          // the rows before this one are written, then the run stops
          text += r.text.slice(0, f.at)
          written += f.index - k
          if (text) write(text)
          text = ''
          if (f.internal) fail(new Error(`the optics of line ${line} failed: ${f.message}`))
          else fail(new InputError(`${o.fileName} line ${line}`, `the distribution of this row cannot be used (${problemOf(f)})`, f.fix))
          return
        }
        opticsSkipCount++
        if (opticsSkips.length < KEPT_REASONS) opticsSkips.push({ line, reason: `the distribution cannot be used (${problemOf(f)}); the row is left out`, fix: f.fix })
      }
      text += r.text
      written += r.written
    }
    if (text.length >= WRITE_CHARS) {
      write(text)
      text = ''
      o.onProgress?.(written)
    }
  }

  const onMessage = (w: (typeof workers)[number], m: FromWorker): void => {
    if (m.type === 'ready') return
    if (m.type === 'kernels') {
      kernels.push(m.source)
      return
    }
    w.inFlight--
    done.set(m.id, m)
    flush()
    pump()
    notify()
  }

  // workers started by main.ts while this command loaded (workers/early.ts), then any more asked for
  const early = takeEarly('series-worker', o.workers)
  for (let i = 0; i < o.workers; i++) {
    const worker = early[i] ?? startCliWorker('series-worker', undefined)
    worker.postMessage({ type: 'setup', setup } satisfies ToWorker)
    const entry = { worker, inFlight: 0 }
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
    // the values are copied into the block (and the extra cells made from them) before the next row is read
    reuseBuffer: true,
    onRecord: (record) => {
      if (o.shard && (record.line < o.shard.firstLine || record.line > o.shard.lastLine)) return
      shardRecords++
      if (bins === 0) {
        if (o.shard && reader.header!.layout !== 'time-rows') throw new InputError(o.fileName, 'the file has one column per time, so it cannot be split by lines', 'Run it without --shard (or export one row per time).')
        const h = reader.header!
        const layout: BinLayout = { diameters: h.diameters.slice(), diameter_unit: h.diameterUnit, edges: h.edges, quantity: h.quantity }
        for (const w of workers) w.worker.postMessage({ type: 'layout', layout } satisfies ToWorker)
        bins = binCount(h)
        layoutForExtra = layout
      }
      if (!current) current = { id: nextId++, times: [], lines: [], values: new Float64Array(BLOCK_ROWS * bins), extras: o.extra ? [] : undefined }
      current.extras?.push(o.extra!.cells(record.time, record.values, layoutForExtra!))
      current.values.set(record.values, current.times.length * bins)
      current.times.push(record.time)
      current.lines.push(record.line)
      if (current.times.length === BLOCK_ROWS) {
        send(current)
        current = undefined
      }
    }
  })

  let lineNo = 0
  let shardRecords = 0
  let linesSkipped = 0
  const tick = o.onTick ? setInterval(o.onTick, 200) : undefined
  try {
    const comments = o.extra ? o.extra.headerComments.map((c) => `# ${c}\n`).join('') : ''
    pendingHeader = (o.shard?.line ?? '') + comments + [...seriesColumns(o.wavelengthsNm), ...(o.extra?.columns ?? [])].map(csvCell).join(',') + '\n'
    const take = (line: string): void => {
      lineNo++
      // a shard: lines before its part are blank once the header is known; after its part the reading stops
      if (o.shard && lineNo < o.shard.firstLine && reader.header) line = ''
      reader.push(line, lineNo)
    }
    const last = o.shard?.lastLine ?? Infinity
    /** A line as bytes: read from them when the reader can (a plain row), else decoded. */
    const takeBytes = (bytes: Buffer, start: number, end: number): void => {
      lineNo++
      if (o.shard && lineNo < o.shard.firstLine && reader.header) reader.push('', lineNo)
      else if (!reader.pushBytes(bytes, start, end, lineNo)) reader.push(bytes.toString('utf8', start, end), lineNo)
    }
    /** Sends the block being filled, cut to its rows, and waits until every block sent is computed and taken. */
    const finishBlocks = async (): Promise<void> => {
      if (current) {
        const n = current.times.length
        if (n > 0) send({ ...current, values: current.values.slice(0, n * bins) })
        current = undefined
      }
      while (!failure && nextWrite < nextId) await changed()
    }
    try {
      for await (const item of source) {
        if (typeof item === 'string') take(item)
        else if ('bytes' in item) {
          for (let i = 0; i < item.starts.length && (lineNo < last || !reader.header); i++) takeBytes(item.bytes, item.starts[i], item.ends[i])
        } else for (const line of item) if (lineNo < last || !reader.header) take(line)
        if (lineNo >= last && reader.header) break
        // a shard whose lines are still ahead: once the table is known (one row per time), jump to its first line
        if (o.shard && lineNo < o.shard.firstLine - 1 && reader.header?.layout === 'time-rows' && o.lines.skipTo?.(o.shard.firstLine)) {
          linesSkipped += o.shard.firstLine - 1 - lineNo
          lineNo = o.shard.firstLine - 1
        }
        while (!failure && (nextId - nextWrite >= window || unwrittenChars > 4 * WRITE_CHARS)) await changed()
        if (failure) throw failure
      }
    } catch (e) {
      // --on-bad-row stop, a bad row met by the reader: the rows before it are written, as when the optics refuse a
      // row (flush above), whatever the workers had finished by then; an earlier row the optics refuse comes first
      if (o.onBadRow === 'stop' && e instanceof InputError && !failure) {
        await finishBlocks()
        if (!failure && text) write(text)
        text = ''
        await writing.catch(() => undefined)
        if (failure) throw failure
      }
      throw e
    }
    const end = reader.end()
    if (end.recordCount === 0 && end.rejectedCount === 0 && !o.shard) {
      throw new InputError(o.fileName, 'the file has a header but no distributions', 'Export at least one time step (one row per time, one column per bin).')
    }
    await finishBlocks()
    if (failure) throw failure
    if (text || pendingHeader) write(text)
    text = ''
    o.onProgress?.(written)
    await writing
    if (failure) throw failure

    const h = end
    let readerSkipped: number
    if (h.layout === 'time-rows') {
      // a shard: the rows left out on its own lines (of those the reader kept the reasons for)
      readerSkipped = o.shard ? new Set(end.rejected.filter((r) => r.line >= o.shard!.firstLine && r.line <= o.shard!.lastLine).map((r) => r.line)).size : end.rowsLeftOut
    } else {
      readerSkipped = new Set(end.rejected.map((r) => r.line)).size
    }
    const mine = (r: { line: number }) => !o.shard || (r.line >= o.shard.firstLine && r.line <= o.shard.lastLine)
    const skipped: SkippedRow[] = [...end.rejected.filter(mine).map((r: SizerRejection) => ({ ...r })), ...opticsSkips].sort((a, b) => a.line - b.line || (a.column ?? 0) - (b.column ?? 0))
    const { recordCount: _r, rejected: _j, rejectedCount: _c, ...header } = end
    return {
      header,
      distributionsRead: (o.shard ? shardRecords : end.recordCount) + readerSkipped,
      rowsWritten: written,
      rowsSkippedByReader: readerSkipped,
      rowsSkippedByOptics: opticsSkipCount,
      skipped: skipped.slice(0, KEPT_REASONS),
      negativesZeroed: end.negativesZeroed,
      workers: o.workers,
      tolerance: o.tolerance,
      kernels,
      seconds: (performance.now() - started) / 1000,
      linesSkipped
    }
  } finally {
    if (tick) clearInterval(tick)
    await Promise.all(workers.map((w) => (w.worker.removeAllListeners('exit'), w.worker.terminate())))
  }
}

