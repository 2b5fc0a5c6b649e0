/**
 * Reading size-distribution exports from particle sizers (mobility sizers, optical counters and the like) as
 * text tables, as instruments commonly write them.
 *
 * Accepted:
 *  - separators comma, semicolon or tab (detected, or `delimiter`); quoted cells; a decimal point or a decimal
 *    comma (detected, or `decimal`; a comma-separated file uses points); a byte-order mark;
 *  - free-text and metadata lines (`key: value`, `key = value`, also behind '#') before the table, of which the
 *    unit, quantity, `diameters: edges|midpoints`, year, time zone, date format and epoch are read; blank lines
 *    and '#' comment lines anywhere;
 *  - three layouts:
 *      'single'        one distribution, two columns: diameter, value (header row optional);
 *      'time-rows'     one row per time: the bin columns are the run of header cells that hold diameters
 *                      ("10.2", "10.2 nm", "Dp=10.2nm", "0.0102 µm"); columns before and after them are the time
 *                      (one column, or a date and a time column; see time.ts for the forms) or are ignored and
 *                      listed (sample number, temperature, flow, totals, statistics); a units row may follow
 *                      the header;
 *      'time-columns'  one column per time: header row `diameter, time1, time2, ...`, first column diameters;
 *  - the diameter unit wherever the file states it (metadata, a "Dp [nm]" or "Diameter (µm)" label, header
 *    cells, units row; all must agree), else inferred only when the diameters leave no doubt (plan.ts), and
 *    said so in `notes`; otherwise a SizerChoiceNeeded error (the option or the app's choice settles it).
 *
 * Bad rows and cells (missing, text in a number cell, a bad time, negative values, diameters out of order) are
 * reported with their 1-based line and column; `onBadRow: 'skip'` leaves them out and goes on, `'stop'` throws
 * an InputError at the first. `negatives: 'zero'` sets negative values to 0 instead, and counts them.
 *
 * `createSizerReader` takes the file one line at a time and hands each time-rows record on as it is read, so
 * memory stays flat however long the file. A line may be offered as bytes (`pushBytes`): a plain row is then read
 * without making a string of it (byte-cells.ts), anything else is left to `push`. Only while the order of numeric dates (03/04/2024) is still unknown
 * are rows held back, until a date settles it (at most MAX_HELD_ROWS).
 */
import { InputError } from '../errors.ts'
import type { BinsSpec } from '../study/model.ts'
import { ByteCells } from './byte-cells.ts'
import { CellSplitter, type Cells } from './cells.ts'
import { detect, type Detected } from './header.ts'
import { inferDiameterUnit, RowTime } from './plan.ts'
import { humidityProblem, humidityValue } from './humidity.ts'
import { SizerChoiceNeeded, toNumber, unitName, where } from './text.ts'
import { readDateTime } from './time.ts'
import type { SizerHeader, SizerOptions, SizerReader, SizerReaderOptions, SizerRecord, SizerRejection, SizerSummary, SizerTable } from './types.ts'

/** Rejections kept in memory by a reader (the count goes on). */
export const MAX_KEPT_REJECTIONS = 1000
/** Rows held back at most while the date order is still unknown. */
export const MAX_HELD_ROWS = 100_000
/** Lines kept to recognise the table; the header must start within the first MAX_PREAMBLE_LINES. */
const LOOKAHEAD_LINES = 40
const MAX_PREAMBLE_LINES = 1000

interface CellProblem {
  column: number
  reason: string
  fix: string
}

const NEGATIVE_FIX = 'Size distribution values cannot be negative; replace inversion noise by 0 (--negatives zero, or the negatives choice of the import).'

function numberProblem(cell: string, column: number, binLabel: string, decimal: '.' | ','): CellProblem {
  if (cell === '') return { column, reason: `no value for ${binLabel} (empty or missing cell)`, fix: 'Fill the cell (0 if nothing was counted).' }
  return { column, reason: `"${cell}" for ${binLabel} is not a number`, fix: `Write a plain number${decimal === ',' ? ' with a decimal comma, as in the rest of this file' : ' with a decimal point'}.` }
}

/** A reader that takes a sizer file one line at a time (see the top of this file). */
export function createSizerReader(options: SizerReaderOptions = {}): SizerReader {
  const keep = options.maxKeptRejections ?? MAX_KEPT_REJECTIONS
  const stop = options.onBadRow === 'stop'
  const zero = options.negatives === 'zero'
  const file = options.fileName
  const onRecord = options.onRecord ?? (() => {})
  const rowsFrom = options.rowsFrom ?? 0
  let lineNo = 0
  let buffered = 0
  let buffer: { line: number; text: string }[] | undefined = []
  let det: Detected | undefined
  let time: RowTime | undefined
  let splitter: CellSplitter | undefined
  let byteCells: ByteCells | undefined
  let held: { line: number; text: string }[] | undefined
  const rejected: SizerRejection[] = []
  let rejectedCount = 0
  let rowsLeftOut = 0
  let lastRejectedLine = -1
  let recordCount = 0
  let zeroCells = 0
  let zeroRows = 0
  let firstTime = ''
  let lastTime = ''
  let shared: number[] | undefined
  const humidityRejected: SizerRejection[] = []
  let humidityRejectedCount = 0
  let humidityRows = 0

  // single and time-columns: the whole table is kept until the end.
  const singleDiameters: number[] = []
  const singleValues: number[] = []
  let singleFirstLine = 0
  let pendingTopEdge: { line: number; d: number } | undefined
  const columnValues: number[][] = []
  const badColumns = new Set<number>()
  let pendingNegatives = 0

  /** Reports a bad row or cell; `dropped` says what skipping leaves out. */
  const reject = (line: number, p: { column?: number; reason: string; fix: string }, dropped = 'the row is left out'): void => {
    if (stop) throw new InputError(where(file, line, p.column), p.reason, p.fix)
    rejectedCount++
    if (line !== lastRejectedLine) rowsLeftOut++
    lastRejectedLine = line
    if (rejected.length < keep) rejected.push({ line, ...(p.column !== undefined ? { column: p.column } : {}), reason: `${p.reason}; ${dropped}`, fix: p.fix })
  }

  const emit = (r: SizerRecord): void => {
    recordCount++
    if (!firstTime) firstTime = r.time
    lastTime = r.time
    onRecord(r)
  }

  const unit = (): string => unitName(det!.header.diameterUnit)

  /** A value cell of single and time-columns tables: the number (negatives per the option), or the problem. */
  const valueOf = (cell: string | undefined, column: number, binLabel: string): CellProblem | number => {
    const h = det!.header
    const v = toNumber(cell ?? '', h.decimal)
    if (v === undefined) return numberProblem(cell ?? '', column, binLabel, h.decimal)
    if (v < 0) {
      if (!zero) return { column, reason: `the value ${cell} for ${binLabel} is negative`, fix: NEGATIVE_FIX }
      pendingNegatives++
      return 0
    }
    return v
  }

  const diameterProblem = (cell: string | undefined, previous: number | undefined): CellProblem | number => {
    const d = cell === undefined || cell === '' ? undefined : toNumber(cell, det!.header.decimal)
    if (cell === undefined || cell === '') return { column: 1, reason: 'the diameter cell is empty', fix: 'Give the bin diameter.' }
    if (d === undefined) return { column: 1, reason: `the diameter "${cell}" is not a number`, fix: 'Write the bin diameter as a plain number.' }
    if (d <= 0) return { column: 1, reason: `the diameter ${cell} is not positive`, fix: 'Diameters must be greater than 0.' }
    if (previous !== undefined && !(d > previous)) {
      return {
        column: 1,
        reason: d === previous ? `the diameter ${cell} repeats the previous row's` : `the diameter ${cell} comes after the larger ${previous}${det!.unitPending ? '' : ` ${unit()}`}; diameters must ascend (unsorted bins)`,
        fix: 'Sort the rows by diameter (smallest first) and remove duplicates.'
      }
    }
    return d
  }

  const timeRow = (line: number, s: Cells): void => {
    const h = det!.header
    const n = h.edges ? h.diameters.length - 1 : h.diameters.length
    const first = h.firstBinColumn - 1
    const comma = h.decimal === ','
    // a packed array (new Array(n).fill(0) stays holey, which Float64Array.set copies about twice as slowly)
    const values = options.reuseBuffer ? (shared ??= Array.from({ length: n }, () => 0)) : new Array<number>(n)
    let problems: CellProblem[] | undefined
    let negatives = 0
    const t = time!.read(s)
    if ('reason' in t) problems = [t]
    s.numbersInto(values, first, n, comma)
    for (let j = 0; j < n; j++) {
      const v = values[j]
      if (v >= 0) continue
      if (v < 0 && zero) {
        values[j] = 0
        negatives++
      } else {
        const cell = s.cell(first + j)
        ;(problems ??= []).push(v < 0 ? { column: first + j + 1, reason: `the value ${cell} for the bin at ${h.diameters[j]} ${unit()} is negative`, fix: NEGATIVE_FIX } : numberProblem(cell, first + j + 1, `the bin at ${h.diameters[j]} ${unit()}`, h.decimal))
      }
    }
    // a value beyond the header's columns (or in the top-edge column) has no bin
    const extraFrom = h.edges ? first + n : det!.headerCells.length
    for (let k = extraFrom; k < s.count; k++) {
      if (k >= det!.headerCells.length || (h.edges && k === first + n)) {
        if (!s.isEmpty(k)) {
          ;(problems ??= []).push({ column: k + 1, reason: `the row has a value "${s.cell(k)}" beyond the last bin (${n} bins in the header)`, fix: 'Remove the extra cell, or add its bin diameter to the header row.' })
          break
        }
      }
    }
    if (problems || 'reason' in t) {
      problems ??= []
      const label = 'reason' in t ? s.cell(time!.plan.dateCol) || 'untimed' : t.iso || 'untimed'
      for (const p of problems) reject(line, p, `the ${label} row is left out`)
      return
    }
    if (negatives > 0) {
      zeroCells += negatives
      zeroRows++
    }
    if (h.humidityColumn) {
      const k = h.humidityColumn.column - 1
      const cell = s.cell(k)
      const v = s.number(k, comma)
      const p = humidityProblem(cell, v)
      if (p) {
        humidityRejectedCount++
        if (humidityRejected.length < keep) humidityRejected.push({ line, column: k + 1, ...p })
      }
      const rh = humidityValue(cell, v)
      if (rh === rh) humidityRows++
      return emit({ time: t.iso, timeMs: t.ms, values, line, rh })
    }
    emit({ time: t.iso, timeMs: t.ms, values, line })
  }

  const processRow = (line: number, text: string): void => {
    if (line < rowsFrom) return
    const h = det!.header
    const s = splitter!
    if (s.split(text) === 0) return
    const c0 = s.text.charCodeAt(s.starts[0])
    if (c0 === 35 && !(s.count > 1 && s.starts[0] + 1 === s.ends[0])) return // '#' comment
    if (h.layout === 'time-rows') {
      if (held) {
        if (!time!.evidence(s, line)) {
          held.push({ line, text })
          if (held.length > MAX_HELD_ROWS) throw orderUnknown()
          return
        }
        const rows = held
        held = undefined
        orderSettled()
        for (const r of rows) processRow(r.line, r.text)
        s.split(text)
      }
      return timeRow(line, s)
    }
    const cells = s.all()
    if (h.layout === 'single') {
      const prev = pendingTopEdge ? pendingTopEdge.d : singleDiameters[singleDiameters.length - 1]
      const d = diameterProblem(cells[0], prev)
      if (typeof d !== 'number') return reject(line, d)
      if (h.edges && (cells[1] === undefined || cells[1] === '')) {
        if (pendingTopEdge) reject(pendingTopEdge.line, numberProblem('', 2, `the bin at ${pendingTopEdge.d}`, h.decimal))
        pendingTopEdge = { line, d }
        return
      }
      pendingNegatives = 0
      const v = valueOf(cells[1], 2, `the bin at ${cells[0]}${det!.unitPending ? '' : ` ${unit()}`}`)
      if (typeof v !== 'number') return reject(line, v)
      if (cells.length > 2) return reject(line, { column: 3, reason: `unexpected extra cell "${cells[2]}" (a single distribution has two columns: diameter, value)`, fix: 'Remove the extra cells, or read the file with another layout.' })
      if (pendingTopEdge) {
        reject(pendingTopEdge.line, numberProblem('', 2, `the bin at ${pendingTopEdge.d}`, h.decimal))
        pendingTopEdge = undefined
      }
      if (pendingNegatives) {
        zeroCells++
        zeroRows++
      }
      if (singleDiameters.length === 0) singleFirstLine = line
      singleDiameters.push(d)
      singleValues.push(v)
      return
    }
    // time-columns: a row is a bin; a bad diameter drops the row, a bad value drops that time's column.
    const nCols = det!.headerCells.length - 1
    const prev = pendingTopEdge ? pendingTopEdge.d : singleDiameters[singleDiameters.length - 1]
    const d = diameterProblem(cells[0], prev)
    if (typeof d !== 'number') return reject(line, d, 'this bin is left out at every time')
    if (cells.length > nCols + 1) return reject(line, { column: nCols + 2, reason: `the row has a value "${cells[nCols + 1]}" beyond the last time column`, fix: 'Remove the extra cell, or give its column a time stamp in the header row.' }, 'this bin is left out at every time')
    if (h.edges && cells.length === 1) {
      pendingTopEdge = { line, d }
      return
    }
    const row: number[] = []
    pendingNegatives = 0
    for (let j = 0; j < nCols; j++) {
      const v = valueOf(cells[j + 1], j + 2, `the bin at ${cells[0]}${det!.unitPending ? '' : ` ${unit()}`} at ${det!.headerCells[j + 1]}`)
      if (typeof v === 'number') row.push(v)
      else {
        row.push(0)
        badColumns.add(j)
        reject(line, v, `the ${det!.headerCells[j + 1]} column is left out`)
      }
    }
    if (pendingNegatives) {
      zeroCells += pendingNegatives
      zeroRows++
    }
    if (pendingTopEdge) {
      reject(pendingTopEdge.line, { column: 2, reason: `no values for the bin at ${pendingTopEdge.d}`, fix: 'Fill the row or remove it.' }, 'this bin is left out at every time')
      pendingTopEdge = undefined
    }
    if (singleDiameters.length === 0) singleFirstLine = line
    singleDiameters.push(d)
    columnValues.push(row)
  }

  /** The date order is known (detected from a row, or immaterial): the header says it. */
  const orderSettled = (): void => {
    const h = det!.header
    const o = time!.plan.order!
    h.dateOrder = o
    const name = o === 'dmy' ? 'day/month/year' : o === 'mdy' ? 'month/day/year' : 'year-month-day'
    h.timeFormat = h.timeFormat.replace(/^dates in/, `dates in ${name} order${time!.detectedAt ? ` (detected: ${time!.detectedAt})` : ''} in`)
  }

  const orderUnknown = (): InputError => {
    const first = held![0]
    splitter!.split(first.text)
    const col = time!.plan.dateCol
    return new SizerChoiceNeeded(
      where(file, first.line, col + 1),
      `the dates ("${splitter!.cell(col)}", ...) could be day/month/year or month/day/year: no date in the ${held!.length} rows read${held!.length > MAX_HELD_ROWS ? ' so far' : ''} has a day above 12`,
      'Choose the date order (--date-order dmy or mdy, or the date order choice of the import), or add a line "date format: dd/mm/yyyy" above the table',
      'dateOrder'
    )
  }

  const flushBuffer = (complete: boolean): void => {
    if (!buffer) return
    const found = detect(buffer, options, complete)
    if (!found) return
    det = found
    splitter = new CellSplitter(found.header.delimiter)
    if (found.header.layout === 'time-rows') {
      time = new RowTime(found.time)
      if (time.needsOrder) held = []
      else if (time.plan.order && found.header.timeFormat.startsWith('dates in')) orderSettled()
    }
    const rest = buffer.slice(found.dataStart)
    buffer = undefined
    for (const r of rest) processRow(r.line, r.text)
  }

  /** single and time-columns with no unit stated: from the diameters, or the refusal. */
  const settleUnit = (diameters: number[]): void => {
    if (!det!.unitPending) return
    const inferred = inferDiameterUnit(diameters)
    if (!inferred) {
      throw new SizerChoiceNeeded(
        where(file, det!.header.headerLine || singleFirstLine),
        'the diameter unit (nm or µm) is not stated' + (diameters.length ? `, and the diameters (${diameters[0]} to ${diameters[diameters.length - 1]}, ${diameters.length} bins) leave it in doubt` : ''),
        'Add a line "units: nm" (or "units: um") above the table, write the unit in the diameter header (e.g. "Dp (nm)"), or choose it (--diameter-unit nm, or the unit choice of the import)',
        'diameterUnit'
      )
    }
    det!.header.diameterUnit = inferred.unit
    det!.header.unitSource = inferred.note
    det!.header.notes.push(inferred.note)
    det!.unitPending = false
  }

  return {
    get header() {
      return det?.header
    },
    get orderPending() {
      return held !== undefined
    },
    push(text: string, at?: number): void {
      lineNo = at ?? lineNo + 1
      if (lineNo === 1 && text.charCodeAt(0) === 0xfeff) text = text.slice(1)
      if (buffer) {
        buffer.push({ line: lineNo, text })
        if (text.trim() !== '') buffered++
        if (buffered >= LOOKAHEAD_LINES && text.trim() !== '' && buffered % LOOKAHEAD_LINES === 0) flushBuffer(buffered >= MAX_PREAMBLE_LINES)
        return
      }
      processRow(lineNo, text)
    },
    pushBytes(bytes: Uint8Array, start: number, end: number, at?: number): boolean {
      // only a row of a recognised one-row-per-time table whose date order is known, and a plain line
      if (buffer || held || det!.header.layout !== 'time-rows') return false
      const cells = (byteCells ??= new ByteCells(det!.header.delimiter, det!.header.decimal === ','))
      const n = cells.split(bytes, start, end)
      if (n < 0) return false
      lineNo = at ?? lineNo + 1
      if (lineNo < rowsFrom || n === 0) return true
      if (cells.firstByte(0) === 35 && !(n > 1 && cells.starts[0] + 1 === cells.ends[0])) return true // '#' comment
      timeRow(lineNo, cells)
      return true
    },
    end(): SizerSummary {
      flushBuffer(true)
      const h = det!.header
      if (held && held.length > 0) {
        // every date read so far fits both orders: the same date either way only when day equals month
        let symmetric = true
        for (const r of held) {
          splitter!.split(r.text)
          const m = /^(\d{1,2})[-/.](\d{1,2})[-/.]/.exec(splitter!.cell(time!.plan.dateCol))
          if (m && m[1] !== m[2]) symmetric = false
        }
        if (!symmetric) throw orderUnknown()
        const rows = held
        held = undefined
        time!.plan.order = 'dmy'
        for (const r of rows) processRow(r.line, r.text)
        orderSettled()
      }
      if (h.layout === 'single') {
        if (h.edges && !pendingTopEdge && singleDiameters.length > 0) {
          reject(singleFirstLine, { reason: 'the bin diameters are edges, but no row gives the top edge alone (a diameter with an empty value)', fix: 'End the table with a row holding only the upper edge of the last bin, or read the diameters as midpoints.' }, 'no distribution is read')
        }
        const diameters = pendingTopEdge ? [...singleDiameters, pendingTopEdge.d] : singleDiameters.slice()
        h.diameters = h.edges && !pendingTopEdge ? [] : diameters
        settleUnit(diameters)
        if (h.diameters.length > 0 && singleValues.length > 0) {
          const t = Object.entries(h.metadata).find(([k]) => /^(time|date|start|start time|sampled)$/.test(k))?.[1] ?? ''
          const iso = readDateTime(t, undefined, 'ymd', undefined)
          emit({ time: iso ? iso.iso : t, timeMs: iso ? iso.ms : NaN, values: singleValues.slice(), line: singleFirstLine })
        }
      } else if (h.layout === 'time-columns') {
        h.diameters = pendingTopEdge ? [...singleDiameters, pendingTopEdge.d] : singleDiameters.slice()
        settleUnit(h.diameters)
        if (h.edges && !pendingTopEdge) {
          reject(singleFirstLine, { reason: 'the bin diameters are edges, but no row gives the top edge alone', fix: 'End the table with a row holding only the upper edge of the last bin, or read the diameters as midpoints.' }, 'no distribution is read')
          h.diameters = []
        }
        const nCols = det!.headerCells.length - 1
        // column times as ISO 8601 when every one is a year-first date; else labels as written
        const times = det!.headerCells.slice(1).map((c) => readDateTime(c, undefined, 'ymd', undefined))
        const dated = times.every((x) => x)
        for (let j = 0; j < nCols && h.diameters.length > 0; j++) {
          if (badColumns.has(j)) continue
          emit({ time: dated ? times[j]!.iso : det!.headerCells[j + 1], timeMs: dated ? times[j]!.ms : NaN, values: columnValues.map((r) => r[j]), line: h.headerLine })
        }
      }
      return { ...h, recordCount, rejected: rejected.slice(), rejectedCount, rowsLeftOut, negativesZeroed: { cells: zeroCells, rows: zeroRows }, humidityRejected: humidityRejected.slice(), humidityRejectedCount, humidityRows, firstTime, lastTime }
    }
  }
}

/** Reads a whole sizer file held in memory. Throws InputError for header problems, and for bad rows with onBadRow 'stop'. */
export function parseSizerText(text: string, options: SizerOptions = {}): SizerTable {
  const records: SizerRecord[] = []
  const reader = createSizerReader({ ...options, onRecord: (r) => records.push(r), maxKeptRejections: Infinity })
  const lines = text.split(/\r\n|\n|\r/)
  if (lines.length > 1 && lines[lines.length - 1] === '') lines.pop()
  for (const line of lines) reader.push(line)
  const summary = reader.end()
  const { recordCount: _c, rejectedCount: _r, firstTime: _f, lastTime: _l, humidityRejectedCount: _h, humidityRows: _hr, ...rest } = summary
  return { ...rest, records }
}

/** One record of a sizer table as the bins of a study sample. */
export function sizerRecordToBins(table: SizerHeader, record: SizerRecord, source?: string): BinsSpec {
  return {
    diameters: table.diameters.slice(),
    diameter_unit: table.diameterUnit,
    edges: table.edges,
    quantity: table.quantity,
    values: record.values.slice(),
    ...(source !== undefined || record.time !== '' ? { source: [source, record.time].filter((s) => s).join(', ') } : {})
  }
}
