/**
 * Reading size-distribution exports from particle sizers (mobility sizers, optical particle counters and the like) as text tables.
 *
 * Accepted:
 *  - separators: comma, semicolon or tab (detected, or `delimiter`); cells split by papaparse (quotes allowed);
 *  - decimal point or decimal comma (detected from the cells, or `decimal`; a comma-separated file uses points);
 *  - a byte-order mark; free-text lines before the table; metadata lines `key: value` (or `key = value`) before
 *    the table, of which `units`/`diameter unit`, `quantity`, `diameters: edges|midpoints` and `time` are read;
 *  - diameter units nm or µm (um), and the quantity (dN/dlogDp, dN, dS/dlogDp, dV/dlogDp, dM/dlogDp), from the
 *    caller's options, the metadata lines or the header row (e.g. "Dp (nm)", "dN/dlogDp (cm-3)");
 *  - three layouts:
 *      'single'        one distribution, two columns: diameter, value (header row optional);
 *      'time-rows'     one row per time, one column per bin: header row `time, D1, D2, ...` (bin diameters);
 *      'time-columns'  one column per time: header row `diameter, time1, time2, ...`, first column diameters.
 *
 * Bad rows and cells (missing, text in a number cell, negative values, diameters out of order) are reported with
 * their 1-based line and column; `onBadRow: 'skip'` drops them and goes on, `'stop'` throws an InputError at the
 * first. Problems with the header itself (no table, unknown unit or quantity, bin diameters in the header that
 * are not numbers or not ascending) always throw, since nothing after them can be read.
 *
 * `createSizerReader` takes the file one line at a time, so a long 'time-rows' file can be read from a stream:
 * after the first lines (kept to recognise the layout) each row is handed to `onRecord` and forgotten.
 */
import Papa from 'papaparse/papaparse.js'
import { InputError } from '../errors.ts'
import type { BinQuantityName, BinsSpec } from './model.ts'

export type SizerLayout = 'single' | 'time-rows' | 'time-columns'
export type SizerDelimiter = ',' | ';' | '\t'

export interface SizerOptions {
  /** Used in messages ("sizer.csv line 12 column 3"). */
  fileName?: string
  /** Overrides what the file says. */
  diameterUnit?: 'nm' | 'um'
  quantity?: BinQuantityName
  layout?: SizerLayout
  /** true: the diameters are the n + 1 bin edges (the last one carries no value); default: as the file says, else midpoints. */
  edges?: boolean
  delimiter?: SizerDelimiter
  decimal?: '.' | ','
  /** 'skip' (default): report and drop bad rows or cells; 'stop': throw InputError at the first one. */
  onBadRow?: 'skip' | 'stop'
}

export interface SizerRecord {
  /** Time stamp as written in the file ('' when a single distribution has none). */
  time: string
  /** One value per bin, in the file's quantity. */
  values: number[]
  /** 1-based line of the row (time-rows), the first value row (single) or the header row (time-columns). */
  line: number
}

export interface SizerRejection {
  line: number
  column?: number
  reason: string
  fix: string
}

/** What the reader learned from the lines before the data. */
export interface SizerHeader {
  layout: SizerLayout
  diameterUnit: 'nm' | 'um'
  quantity: BinQuantityName
  /** Bin diameters in `diameterUnit`, ascending (for 'single' and 'time-columns' known only at the end). */
  diameters: number[]
  edges: boolean
  delimiter: SizerDelimiter
  decimal: '.' | ','
  /** 1-based line of the header row (0 when a single distribution has none). */
  headerLine: number
  /** Metadata lines before the table, keys in lower case. */
  metadata: Record<string, string>
}

export interface SizerTable extends SizerHeader {
  records: SizerRecord[]
  rejected: SizerRejection[]
}

export interface SizerSummary extends SizerHeader {
  recordCount: number
  /** The first MAX_KEPT_REJECTIONS rejections; `rejectedCount` counts them all. */
  rejected: SizerRejection[]
  rejectedCount: number
}

export interface SizerReader {
  /** One line of the file, without its line break. */
  push(line: string): void
  /** No more lines: reads what is left, returns the summary. Throws InputError when no table was found. */
  end(): SizerSummary
  /** Known once enough lines were seen to recognise the table. */
  readonly header: SizerHeader | undefined
}

/** Rejections kept in memory by a reader (the count goes on). */
export const MAX_KEPT_REJECTIONS = 1000
/** Lines kept to recognise the table; the header must start within the first MAX_PREAMBLE_LINES. */
const LOOKAHEAD_LINES = 40
const MAX_PREAMBLE_LINES = 1000

// ---------------------------------------------------------------------------------------------------------------
// Cells and numbers.

interface Row {
  line: number
  text: string
  cells: string[]
}

function splitCells(text: string, delimiter: string): string[] {
  if (text.trim() === '') return []
  const r = Papa.parse(text, { delimiter, newline: '\n', quoteChar: '"' })
  const cells = (r.data[0] ?? []).map((c) => c.trim())
  // Exports often end rows with a separator; trailing empty cells carry nothing.
  while (cells.length > 0 && cells[cells.length - 1] === '') cells.pop()
  return cells
}

const NUMBER_POINT = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/
const NUMBER_COMMA = /^[+-]?(\d+(,\d*)?|,\d+)([eE][+-]?\d+)?$/

/** The number in a cell, or undefined when the cell is not a plain number in this file's format. */
function toNumber(cell: string, decimal: '.' | ','): number | undefined {
  const s = cell.trim()
  if (decimal === ',' ? !NUMBER_COMMA.test(s) : !NUMBER_POINT.test(s)) return undefined
  const v = Number(decimal === ',' ? s.replace(',', '.') : s)
  return Number.isFinite(v) ? v : undefined
}

/** A diameter in a header cell: "15.1", "15.1 nm", "Dp=15.1", "d_15.1nm". */
const HEADER_DIAMETER = /^[A-Za-z_ =:]*?([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(nm|um|µm|μm)?\)?$/

function headerDiameter(cell: string, decimal: '.' | ','): number | undefined {
  const m = HEADER_DIAMETER.exec(cell.trim())
  return m ? toNumber(m[1], decimal) : undefined
}

// ---------------------------------------------------------------------------------------------------------------
// Units and quantities from text.

const UNIT_TEXT = /(?:^|[^A-Za-z])(nm|um|µm|μm|microns?|micrometers?|micrometres?|nanometers?|nanometres?)(?![A-Za-z])/i

function unitIn(text: string): 'nm' | 'um' | undefined {
  const m = UNIT_TEXT.exec(text)
  if (!m) return undefined
  const u = m[1].toLowerCase()
  return u === 'nm' || u.startsWith('nano') ? 'nm' : 'um'
}

function quantityIn(text: string): BinQuantityName | undefined {
  const m = /d\s*([NSVM])\s*\/\s*d\s*log\s*(?:10|₁₀)?\s*\(?\s*D\s*p?/i.exec(text)
  if (m) return `d${m[1].toUpperCase()}/dlogDp` as BinQuantityName
  if (/(?:^|[^A-Za-z])dN(?![A-Za-z/])/.test(text)) return 'dN'
  return undefined
}

const METADATA = /^\s*(?:#|\/\/|;)*\s*([A-Za-z][A-Za-z0-9 _()./-]{0,40}?)\s*[:=]\s*(.*?)\s*$/
const DIAMETER_LABEL = /diam|^\s*d\s*_?p\b|^\s*dp|size|^\s*d\s*[([]/i

// ---------------------------------------------------------------------------------------------------------------

interface Detected {
  header: SizerHeader
  /** Index into the buffer of the first data row. */
  dataStart: number
  /** Header cells (time-columns: time stamps per column). */
  headerCells: string[]
}

function where(fileName: string | undefined, line: number, column?: number): string {
  return `${fileName ?? 'sizer file'} line ${line}${column !== undefined ? ` column ${column}` : ''}`
}

function chooseDelimiter(rows: { text: string }[]): SizerDelimiter | undefined {
  let best: SizerDelimiter | undefined
  let bestScore = 0
  for (const d of ['\t', ';', ','] as const) {
    const counts = rows.map((r) => splitCells(r.text, d).length).filter((c) => c >= 2)
    if (counts.length === 0) continue
    const freq = new Map<number, number>()
    for (const c of counts) freq.set(c, (freq.get(c) ?? 0) + 1)
    const score = Math.max(...freq.values())
    if (score > bestScore) {
      bestScore = score
      best = d
    }
  }
  return best
}

function chooseDecimal(rows: Row[]): '.' | ',' {
  let commas = 0
  let points = 0
  for (const r of rows) {
    for (const c of r.cells) {
      if (/^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(c)) commas++
      else if (/^[+-]?\d*\.\d+([eE][+-]?\d+)?$/.test(c)) points++
    }
  }
  return commas > points ? ',' : '.'
}

function detect(buffer: { line: number; text: string }[], options: SizerOptions, complete: boolean): Detected | undefined {
  const file = options.fileName
  const nonBlank = buffer.filter((r) => r.text.trim() !== '')
  if (nonBlank.length === 0) {
    if (complete) throw new InputError(file ?? 'sizer file', 'the file is empty', 'Export the size distribution from the instrument software again.')
    return undefined
  }
  const delimiter = options.delimiter ?? chooseDelimiter(nonBlank)
  if (!delimiter) {
    if (!complete) return undefined
    throw new InputError(file ?? 'sizer file', 'no table was found: no line has two or more cells separated by a comma, semicolon or tab', 'Export the distribution as a table with one diameter and one value per row (or one bin per column), separated by commas, semicolons or tabs.')
  }
  const rows: Row[] = buffer.map((r) => ({ ...r, cells: splitCells(r.text, delimiter) }))
  const decimal: '.' | ',' = delimiter === ',' ? '.' : (options.decimal ?? chooseDecimal(rows))
  const isNum = (c: string | undefined): boolean => c !== undefined && toNumber(c, decimal) !== undefined
  const isMeta = (r: Row): boolean => METADATA.test(r.text) && !isNum(r.cells[0]) && !(r.cells.length > 2 && r.cells.slice(1).every((c) => headerDiameter(c, decimal) !== undefined))

  const counts = rows.map((r) => r.cells.length).filter((c) => c >= 2)
  const freq = new Map<number, number>()
  for (const c of counts) freq.set(c, (freq.get(c) ?? 0) + 1)
  const modal = [...freq.entries()].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0]?.[0] ?? 2

  // F: the first row that looks like part of the table.
  let f = -1
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]
    if (r.cells.length < 2 || r.cells.length < modal - 1 || isMeta(r)) continue
    const rest = r.cells.slice(1)
    const numeric = rest.filter((c) => headerDiameter(c, decimal) !== undefined).length
    if (numeric * 2 < rest.length) continue
    if (!isNum(r.cells[0]) && r.cells.length < 3 && options.layout !== 'time-rows') continue // a header of one bin: free text
    f = i
    break
  }
  if (f < 0 || (!complete && f > rows.length - 4)) {
    if (!complete) return undefined
    throw new InputError(file ?? 'sizer file', 'no table was found: no row starts with a diameter or a time stamp followed by numbers', 'Check that the file is a size distribution export (diameters and values), and that the separator is a comma, semicolon or tab.')
  }

  const firstNumeric = isNum(rows[f].cells[0])
  let previous = -1
  for (let i = f - 1; i >= 0; i--) {
    if (rows[i].cells.length === 0) continue
    if (rows[i].cells.length >= 2 && !isMeta(rows[i])) previous = i
    break
  }
  let layout: SizerLayout
  let headerIndex: number
  if (options.layout) {
    layout = options.layout
    headerIndex = layout === 'single' ? (firstNumeric ? previous : f) : firstNumeric ? previous : f
  } else if (firstNumeric) {
    headerIndex = previous
    layout = modal <= 2 ? 'single' : 'time-columns'
  } else {
    headerIndex = f
    layout = DIAMETER_LABEL.test(rows[f].cells[0]) && !/time|date/i.test(rows[f].cells[0]) ? 'time-columns' : 'time-rows'
  }
  if (layout !== 'single' && headerIndex < 0) {
    throw new InputError(
      where(file, rows[f].line),
      layout === 'time-rows' ? 'the table has no header row with the bin diameters' : 'the table has no header row with the time stamps',
      layout === 'time-rows' ? 'Add a header row: "time" followed by the bin diameters, e.g. time;15,1;16,3;...' : 'Add a header row: "diameter" followed by one time stamp per column.'
    )
  }
  const headerRow = headerIndex >= 0 ? rows[headerIndex] : undefined
  const dataStart = headerIndex >= 0 ? Math.max(headerIndex + 1, firstNumeric ? f : headerIndex + 1) : f

  // Metadata: key: value lines before the table.
  const metadata: Record<string, string> = {}
  const preambleEnd = headerIndex >= 0 ? headerIndex : f
  for (let i = 0; i < preambleEnd; i++) {
    const m = METADATA.exec(rows[i].text)
    if (m) metadata[m[1].trim().toLowerCase()] = m[2].replace(new RegExp(`[${delimiter === '\t' ? '\\t' : delimiter}\\s]+$`), '').trim()
  }
  /** The first metadata line whose key matches and whose value `read` understands. */
  const metaValue = <T>(re: RegExp, read: (v: string) => T | undefined): [string, string, T] | undefined => {
    for (const [k, v] of Object.entries(metadata)) {
      const r = re.test(k) ? read(v) : undefined
      if (r !== undefined) return [k, v, r]
    }
    return undefined
  }

  // Diameter unit.
  const headerText = headerRow ? headerRow.cells.join(' ') : ''
  const headerLine = headerRow?.line ?? 0
  let diameterUnit = options.diameterUnit
  if (!diameterUnit) {
    const meta = metaValue(/unit|^dp$|diameter|size/, unitIn)
    const fromMeta = meta?.[2]
    const fromHeader = layout === 'time-columns' ? unitIn(headerRow?.cells[0] ?? '') : unitIn(headerText)
    if (fromMeta && fromHeader && fromMeta !== fromHeader) {
      throw new InputError(where(file, headerLine), `the header row gives diameters in ${fromHeader === 'um' ? 'µm' : 'nm'} but the line "${meta![0]}: ${meta![1]}" says ${fromMeta === 'um' ? 'µm' : 'nm'}`, 'Correct whichever is wrong, or give the unit as an option (--diameter-unit nm or um).')
    }
    diameterUnit = fromMeta ?? fromHeader
    if (!diameterUnit) {
      throw new InputError(
        where(file, headerLine || rows[f].line),
        'the diameter unit (nm or µm) is not stated',
        'Add a line "units: nm" (or "units: um") above the table, write the unit in the diameter header (e.g. "Dp (nm)"), or give it as an option (--diameter-unit nm).'
      )
    }
  }

  // Quantity.
  let quantity = options.quantity
  if (!quantity) {
    const meta = metaValue(/quantity|^values?$|^type$|^data$|^weight|unit/, quantityIn)
    const fromMeta = meta?.[2]
    const fromHeader = quantityIn(headerText)
    if (fromMeta && fromHeader && fromMeta !== fromHeader) {
      throw new InputError(where(file, headerLine), `the header row says the values are ${fromHeader} but the line "${meta![0]}: ${meta![1]}" says ${fromMeta}`, 'Correct whichever is wrong, or give the quantity as an option (--quantity dN/dlogDp).')
    }
    quantity = fromMeta ?? fromHeader
    if (!quantity) {
      throw new InputError(
        where(file, headerLine || rows[f].line),
        'the file does not say what its values are (dN/dlogDp, dN, dS/dlogDp, dV/dlogDp or dM/dlogDp)',
        'Add a line "quantity: dN/dlogDp" above the table, name it in the value header, or give it as an option (--quantity dN/dlogDp).'
      )
    }
  }

  let edges = options.edges
  if (edges === undefined) {
    const meta = metaValue(/^(diameters|bins|bin diameters|diameter type|dp type)$/, (v) => (/edge|bound/i.test(v) ? true : /mid|cent/i.test(v) ? false : undefined))
    edges = meta?.[2] ?? false
  }

  // Bin diameters in a time-rows header.
  const diameters: number[] = []
  if (layout === 'time-rows' && headerRow) {
    for (let j = 1; j < headerRow.cells.length; j++) {
      const d = headerDiameter(headerRow.cells[j], decimal)
      const at = where(file, headerRow.line, j + 1)
      if (d === undefined) throw new InputError(at, `the header cell "${headerRow.cells[j]}" is not a bin diameter`, 'The header row must hold the time label, then one diameter per bin column.')
      if (d <= 0) throw new InputError(at, `the bin diameter ${d} is not positive`, 'Diameters must be greater than 0.')
      if (diameters.length > 0 && !(d > diameters[diameters.length - 1])) {
        throw new InputError(at, `the bin diameter ${d} does not exceed the previous one (${diameters[diameters.length - 1]}); bin diameters must ascend`, 'Sort the bin columns by diameter (smallest first), keeping each value under its diameter, and remove duplicate columns.')
      }
      diameters.push(d)
    }
    if (diameters.length < (edges ? 2 : 1)) throw new InputError(where(file, headerRow.line), 'the header row has no bin diameters', 'Put one diameter per bin column after the time label.')
  }
  const headerCells = headerRow ? headerRow.cells : []
  if (layout === 'time-columns' && headerRow) {
    for (let j = 1; j < headerCells.length; j++) {
      if (headerCells[j] === '') throw new InputError(where(file, headerRow.line, j + 1), 'a column has no time stamp', 'Give every value column a time stamp in the header row, or delete the empty column.')
    }
  }
  return {
    header: { layout, diameterUnit, quantity, diameters, edges, delimiter, decimal, headerLine, metadata },
    dataStart,
    headerCells
  }
}

// ---------------------------------------------------------------------------------------------------------------

interface CellProblem {
  column: number
  reason: string
  fix: string
}

function valueProblem(cell: string | undefined, column: number, binLabel: string, decimal: '.' | ','): CellProblem | number {
  if (cell === undefined || cell === '') return { column, reason: `no value for ${binLabel} (empty or missing cell)`, fix: 'Fill the cell (0 if nothing was counted).' }
  const v = toNumber(cell, decimal)
  if (v === undefined) {
    return { column, reason: `"${cell}" for ${binLabel} is not a number`, fix: `Write a plain number${decimal === ',' ? ' with a decimal comma, as in the rest of this file' : ' with a decimal point'}.` }
  }
  if (v < 0) return { column, reason: `the value ${cell} for ${binLabel} is negative`, fix: 'Size distribution values cannot be negative; replace inversion noise by 0.' }
  return v
}

/** A reader that takes a sizer file one line at a time (see the top of this file). */
export function createSizerReader(options: SizerOptions & { onRecord?: (record: SizerRecord) => void; maxKeptRejections?: number } = {}): SizerReader {
  const keep = options.maxKeptRejections ?? MAX_KEPT_REJECTIONS
  const stop = options.onBadRow === 'stop'
  const file = options.fileName
  const onRecord = options.onRecord ?? (() => {})
  let lineNo = 0
  let buffered = 0
  let buffer: { line: number; text: string }[] | undefined = []
  let det: Detected | undefined
  const rejected: SizerRejection[] = []
  let rejectedCount = 0
  let recordCount = 0

  // single and time-columns: the whole table is kept until the end.
  const singleDiameters: number[] = []
  const singleValues: number[] = []
  let singleFirstLine = 0
  let pendingTopEdge: { line: number; d: number } | undefined
  const columnValues: number[][] = []
  const badColumns = new Set<number>()

  /** Reports a bad row or cell; `dropped` says what skipping leaves out. */
  const reject = (line: number, p: { column?: number; reason: string; fix: string }, dropped = 'the row is left out'): void => {
    if (stop) throw new InputError(where(file, line, p.column), p.reason, p.fix)
    rejectedCount++
    if (rejected.length < keep) rejected.push({ line, ...(p.column !== undefined ? { column: p.column } : {}), reason: `${p.reason}; ${dropped}`, fix: p.fix })
  }

  const unit = (): string => (det!.header.diameterUnit === 'um' ? 'µm' : 'nm')

  const diameterProblem = (cell: string | undefined, previous: number | undefined): CellProblem | number => {
    const d = cell === undefined || cell === '' ? undefined : toNumber(cell, det!.header.decimal)
    if (cell === undefined || cell === '') return { column: 1, reason: 'the diameter cell is empty', fix: 'Give the bin diameter.' }
    if (d === undefined) return { column: 1, reason: `the diameter "${cell}" is not a number`, fix: 'Write the bin diameter as a plain number.' }
    if (d <= 0) return { column: 1, reason: `the diameter ${cell} is not positive`, fix: 'Diameters must be greater than 0.' }
    if (previous !== undefined && !(d > previous)) {
      return {
        column: 1,
        reason: d === previous ? `the diameter ${cell} repeats the previous row's` : `the diameter ${cell} comes after the larger ${previous} ${unit()}; diameters must ascend (unsorted bins)`,
        fix: 'Sort the rows by diameter (smallest first) and remove duplicates.'
      }
    }
    return d
  }

  const processRow = (line: number, text: string): void => {
    const h = det!.header
    const cells = splitCells(text, h.delimiter)
    if (cells.length === 0) return
    if (h.layout === 'time-rows') {
      const n = h.edges ? h.diameters.length - 1 : h.diameters.length
      const problems: CellProblem[] = []
      const values: number[] = []
      if (cells[0] === '') problems.push({ column: 1, reason: 'the time stamp is missing', fix: 'Give the row its time stamp or remove it.' })
      for (let j = 0; j < n; j++) {
        const r = valueProblem(cells[j + 1], j + 2, `the bin at ${h.diameters[j]} ${unit()}`, h.decimal)
        if (typeof r === 'number') values.push(r)
        else problems.push(r)
      }
      for (let j = n + 1; j < cells.length; j++) {
        if (cells[j] !== '') {
          problems.push({ column: j + 1, reason: `the row has a value "${cells[j]}" beyond the last bin (${n} bins in the header)`, fix: 'Remove the extra cell, or add its bin diameter to the header row.' })
          break
        }
      }
      if (problems.length > 0) {
        for (const p of problems) reject(line, p, `the ${cells[0] || 'untimed'} row is left out`)
        return
      }
      recordCount++
      onRecord({ time: cells[0], values, line })
      return
    }
    if (h.layout === 'single') {
      const prev = pendingTopEdge ? pendingTopEdge.d : singleDiameters[singleDiameters.length - 1]
      const d = diameterProblem(cells[0], prev)
      if (typeof d !== 'number') return reject(line, d)
      if (h.edges && (cells[1] === undefined || cells[1] === '')) {
        if (pendingTopEdge) reject(pendingTopEdge.line, valueProblem(undefined, 2, `the bin at ${pendingTopEdge.d} ${unit()}`, h.decimal) as CellProblem)
        pendingTopEdge = { line, d }
        return
      }
      const v = valueProblem(cells[1], 2, `the bin at ${cells[0]} ${unit()}`, h.decimal)
      if (typeof v !== 'number') return reject(line, v)
      if (cells.length > 2) return reject(line, { column: 3, reason: `unexpected extra cell "${cells[2]}" (a single distribution has two columns: diameter, value)`, fix: 'Remove the extra cells, or read the file with another layout.' })
      if (pendingTopEdge) {
        reject(pendingTopEdge.line, valueProblem(undefined, 2, `the bin at ${pendingTopEdge.d} ${unit()}`, h.decimal) as CellProblem)
        pendingTopEdge = undefined
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
    for (let j = 0; j < nCols; j++) {
      const v = valueProblem(cells[j + 1], j + 2, `the bin at ${cells[0]} ${unit()} at ${det!.headerCells[j + 1]}`, h.decimal)
      if (typeof v === 'number') row.push(v)
      else {
        row.push(0)
        badColumns.add(j)
        reject(line, v, `the ${det!.headerCells[j + 1]} column is left out`)
      }
    }
    if (pendingTopEdge) {
      reject(pendingTopEdge.line, { column: 2, reason: `no values for the bin at ${pendingTopEdge.d} ${unit()}`, fix: 'Fill the row or remove it.' }, 'this bin is left out at every time')
      pendingTopEdge = undefined
    }
    if (singleDiameters.length === 0) singleFirstLine = line
    singleDiameters.push(d)
    columnValues.push(row)
  }

  const flushBuffer = (complete: boolean): void => {
    if (!buffer) return
    const found = detect(buffer, options, complete)
    if (!found) return
    det = found
    const rest = buffer.slice(found.dataStart)
    buffer = undefined
    for (const r of rest) processRow(r.line, r.text)
  }

  return {
    get header() {
      return det?.header
    },
    push(text: string): void {
      lineNo++
      if (lineNo === 1 && text.charCodeAt(0) === 0xfeff) text = text.slice(1)
      if (buffer) {
        buffer.push({ line: lineNo, text })
        if (text.trim() !== '') buffered++
        if (buffered >= LOOKAHEAD_LINES && text.trim() !== '' && buffered % LOOKAHEAD_LINES === 0) flushBuffer(buffered >= MAX_PREAMBLE_LINES)
        return
      }
      processRow(lineNo, text)
    },
    end(): SizerSummary {
      flushBuffer(true)
      const h = det!.header
      if (h.layout === 'single') {
        if (h.edges && !pendingTopEdge && singleDiameters.length > 0) {
          reject(singleFirstLine, { reason: 'the bin diameters are edges, but no row gives the top edge alone (a diameter with an empty value)', fix: 'End the table with a row holding only the upper edge of the last bin, or read the diameters as midpoints.' }, 'no distribution is read')
        }
        const diameters = pendingTopEdge ? [...singleDiameters, pendingTopEdge.d] : singleDiameters.slice()
        h.diameters = h.edges && !pendingTopEdge ? [] : diameters
        if (h.diameters.length > 0 && singleValues.length > 0) {
          recordCount++
          onRecord({ time: Object.entries(h.metadata).find(([k]) => /^(time|date|start|start time|sampled)$/.test(k))?.[1] ?? '', values: singleValues.slice(), line: singleFirstLine })
        }
      } else if (h.layout === 'time-columns') {
        h.diameters = pendingTopEdge ? [...singleDiameters, pendingTopEdge.d] : singleDiameters.slice()
        if (h.edges && !pendingTopEdge) {
          reject(singleFirstLine, { reason: 'the bin diameters are edges, but no row gives the top edge alone', fix: 'End the table with a row holding only the upper edge of the last bin, or read the diameters as midpoints.' }, 'no distribution is read')
          h.diameters = []
        }
        const nCols = det!.headerCells.length - 1
        for (let j = 0; j < nCols && h.diameters.length > 0; j++) {
          if (badColumns.has(j)) continue
          recordCount++
          onRecord({ time: det!.headerCells[j + 1], values: columnValues.map((r) => r[j]), line: h.headerLine })
        }
      }
      return { ...h, recordCount, rejected: rejected.slice(), rejectedCount }
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
  const { recordCount: _c, rejectedCount: _r, ...rest } = summary
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
