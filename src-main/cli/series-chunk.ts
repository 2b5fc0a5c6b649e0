// A worker's own reading of `motebench series`'s sizer file: the main thread hands it stretches of the file's
// lines (chunks: bytes cut at line breaks, or lines as text) with the number of their first line, and the worker
// reads them with a reader of its own, computes each row and writes its CSV line (series-row.ts), so the rows'
// reading is shared among the workers rather than done on the main thread alone. The reader recognises the table
// from the file's first lines (the preamble: every line up to the one on which the main thread's reader recognised
// it), as one reader does, and reads no row of them (those the main thread read and sent as values).
import { createSizerReader, InputError, type SizerReader, type SizerReaderOptions, type SizerRejection } from '../../src-core/index.ts'
import type { BlockResult, SeriesBlockComputer } from './series-row.ts'

/** How the workers read their chunks: the main thread's reader options and the lines it recognised the table from. */
export interface ChunkReading {
  fileName: string
  sizer: Pick<SizerReaderOptions, 'diameterUnit' | 'quantity' | 'layout' | 'negatives' | 'dateOrder' | 'year'>
  onBadRow: 'skip' | 'stop'
  maxKeptRejections: number
  /** Lines 1..preamble.length of the file, as text. */
  preamble: string[]
}

/** A stretch of the file's lines: `texts` (lines as text) then `bytes` (UTF-8 lines cut at \n, no last break). */
export interface Chunk {
  firstLine: number
  texts: string[]
  bytes: Uint8Array | null
}

/** What reading a chunk added to the reader's counts, and the rows it left out (the first kept ones). */
export interface ChunkTally {
  records: number
  rejectedCount: number
  rowsLeftOut: number
  rejected: SizerRejection[]
  negativeCells: number
  negativeRows: number
}

/** A chunk's outcome: its rows' text and failures (`line` beside `index`), its tally, and the stop (--on-bad-row stop). */
export interface ChunkResult extends BlockResult {
  lines: number[]
  tally: ChunkTally
  stop?: { where: string; problem: string; fix: string }
}

/** Reads chunks into CSV text with one reader for the whole run (its counts are taken chunk by chunk). */
export class ChunkReader {
  private readonly reader: SizerReader
  private index = 0
  private lines: number[] = []
  private before = { records: 0, rejectedCount: 0, rowsLeftOut: 0, rejected: 0, negativeCells: 0, negativeRows: 0 }

  constructor(
    private readonly computer: SeriesBlockComputer,
    reading: ChunkReading
  ) {
    this.reader = createSizerReader({
      ...reading.sizer,
      fileName: reading.fileName,
      onBadRow: reading.onBadRow,
      maxKeptRejections: reading.maxKeptRejections,
      reuseBuffer: true,
      rowsFrom: reading.preamble.length + 1,
      onRecord: (r) => {
        this.computer.row(r.time, r.values, 0, this.index++)
        this.lines.push(r.line)
      }
    })
    for (let i = 0; i < reading.preamble.length; i++) this.reader.push(reading.preamble[i], i + 1)
    if (!this.reader.header || this.reader.orderPending) throw new Error('series worker: the table is not recognised from the preamble as on the main thread')
  }

  read(chunk: Chunk): ChunkResult {
    const reader = this.reader
    this.computer.startText()
    this.index = 0
    this.lines = []
    let stop: ChunkResult['stop']
    let line = chunk.firstLine
    try {
      for (const text of chunk.texts) reader.push(text, line++)
      const b = chunk.bytes
      if (b) {
        let at = 0
        for (;;) {
          let end = b.indexOf(10, at)
          if (end < 0) end = b.length
          if (!reader.pushBytes(b, at, end, line)) reader.push(Buffer.from(b.buffer, b.byteOffset + at, end - at).toString('utf8'), line)
          line++
          if (end >= b.length) break
          at = end + 1
        }
      }
    } catch (e) {
      if (!(e instanceof InputError)) throw e
      stop = { where: e.where, problem: problemText(e), fix: e.fix }
    }
    const r = this.computer.endText()
    return { ...r, lines: this.lines, tally: this.tally(), ...(stop ? { stop } : {}) }
  }

  /** The reader's counts since the last chunk. */
  private tally(): ChunkTally {
    const end = this.reader.end()
    const b = this.before
    const t: ChunkTally = {
      records: end.recordCount - b.records,
      rejectedCount: end.rejectedCount - b.rejectedCount,
      rowsLeftOut: end.rowsLeftOut - b.rowsLeftOut,
      rejected: end.rejected.slice(b.rejected),
      negativeCells: end.negativesZeroed.cells - b.negativeCells,
      negativeRows: end.negativesZeroed.rows - b.negativeRows
    }
    this.before = { records: end.recordCount, rejectedCount: end.rejectedCount, rowsLeftOut: end.rowsLeftOut, rejected: end.rejected.length, negativeCells: end.negativesZeroed.cells, negativeRows: end.negativesZeroed.rows }
    return t
  }
}

/** The problem of an InputError, from its message "where: problem. fix". */
export function problemText(e: InputError): string {
  let m = e.message
  if (m.startsWith(`${e.where}: `)) m = m.slice(e.where.length + 2)
  if (m.endsWith(`. ${e.fix}`)) m = m.slice(0, -(e.fix.length + 2))
  return m
}
