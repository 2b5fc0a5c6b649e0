/**
 * Motebench's own file layout for optical instruments beside a sizer (scattering, hemispheric backscattering
 * and absorption coefficients over time). It is ours, not any instrument's export:
 *
 *   # Any comment line starts with "#"; "# key: value" lines are kept as metadata.
 *   # units: Mm-1
 *   time,scattering 450 nm,scattering 550 nm,backscattering 450 nm,backscattering 550 nm
 *   2026-06-01T08:00:30Z,41.2,30.5,5.1,4.2
 *
 * - Comment lines (#) and blank lines may stand anywhere; the first other line is the header.
 * - Cells are separated by commas, semicolons or tabs (the one the header uses); "." is the decimal point;
 *   cells may be quoted (papaparse splits a line with a quote; one without is split at the delimiter).
 * - The first column is the time stamp (its header starts with "time"); every other header cell is
 *   "QUANTITY WAVELENGTH nm", QUANTITY one of scattering, backscattering (hemispheric, 90°–180°), absorption,
 *   optionally followed by the unit in brackets: "scattering 450 nm [Mm-1]"; or, once, the sample's relative
 *   humidity in % ("RH", "RH (%)", "sample RH": humidity.ts), whose cells outside 0–100 % are left out with their
 *   reason while the row's coefficients are kept.
 * - The unit, Mm⁻¹ (written Mm-1, Mm^-1, Mm⁻¹ or 1/Mm), is stated in each header cell or once in a
 *   "# units: Mm-1" line; a file that states none, or another unit, is refused (convert it first).
 * - An empty cell, NaN or NA means no data for that quantity at that time (never counted as 0). Small
 *   negative values (instrument noise in clean air) are kept as they are, so that averages stay unbiased.
 * - Time stamps: ISO 8601 (2026-06-01T10:05:00Z or 2026-06-01 10:05, read by `readInstrumentTime`), or a
 *   day/month/year or month/day/year date with a time of day (01/06/2026 10:05, read by the sizer reader's
 *   readDateTime). The order is the one a "# date format: dd/mm/yyyy" line (or the time header cell) states, or
 *   the one the first date with a part above 12 shows; rows wait (at most MAX_HELD_ROWS) until one does, and a
 *   file whose dates never settle it is refused, never guessed. All of a file's stamps have a zone or none
 *   has, and they ascend.
 * - A data row whose time cannot be read, or with a cell that is not a number, or with more cells than the
 *   header, is left out and reported (file, line, column, reason, fix; the first MAX_KEPT_OPTICAL_REJECTIONS
 *   kept, all counted). Header problems, a change of zone form and times out of order stop the reading.
 */
import Papa from 'papaparse/papaparse.js'
import { InputError } from '../errors.ts'
import { readNumber } from './cells.ts'
import { humidityProblem, humidityValue, isHumidityHeader, MISSING_CELL } from './humidity.ts'
import { MAX_HELD_ROWS } from './reader.ts'
import { DATE_ORDER_NAMES, dateParts, orderEvidence, readClock, readDateTime, statedOrder, type DateOrder } from './time.ts'
import { parseTimeStamp, plainStampMs, type TimeStamp } from './timebase.ts'

export type OpticalQuantity = 'scattering' | 'backscattering' | 'absorption'
export const OPTICAL_QUANTITIES: readonly OpticalQuantity[] = ['scattering', 'backscattering', 'absorption']

/** One measured quantity at one wavelength: a column of the file (1-based). */
export interface OpticalChannel {
  quantity: OpticalQuantity
  wavelengthNm: number
  column: number
}

export interface OpticalHeader {
  fileName: string
  channels: OpticalChannel[]
  headerLine: number
  delimiter: string
  /** "# key: value" lines (keys in lower case). */
  metadata: Record<string, string>
  /** The column (1-based) of the sample's relative humidity in %, when a header cell names one (humidity.ts). */
  humidityColumn?: number
  /** Its header cell. */
  humidityName?: string
}

/** One row: its time (ms, and whether it had a zone) and one value per channel (NaN: no data). */
export interface OpticalRecord {
  line: number
  time: string
  ms: number
  zoned: boolean
  values: Float64Array
  /** With a humidity column: the row's relative humidity, % (NaN: none, or left out). */
  rh?: number
}

/** A data row left out of the reading: where, why and how to fix it. */
export interface OpticalRejection {
  line: number
  column: number
  reason: string
  fix: string
}

export const MAX_KEPT_OPTICAL_REJECTIONS = 1000

/** The one place an optical file's time cell is parsed (ISO 8601 only). */
export function readInstrumentTime(cell: string): TimeStamp | undefined {
  return parseTimeStamp(cell)
}

const HEADER_CELL = /^(scattering|backscattering|absorption)\s+(\d+(?:\.\d+)?)\s*nm\s*(?:[[(]\s*([^\])]*?)\s*[\])])?$/i
const UNIT = /^(mm-1|mm\^-1|mm⁻¹|1\/mm|mm\^\(-1\))$/i
const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/

/** A character that trimming leaves in place (printable ASCII; not a space, a tab, a byte-order mark). */
const plainEnd = (c: number): boolean => c > 32 && c < 127

function splitCells(text: string, delimiter: string): string[] {
  // a line without a quote is what papaparse would make of it split at the delimiter (about 10 times faster per row)
  const raw = text.includes('"') ? (Papa.parse(text, { delimiter, newline: '\n', quoteChar: '"' }).data[0] ?? []) : text.split(delimiter)
  const cells = raw.map((c) => c.trim())
  while (cells.length > 1 && cells[cells.length - 1] === '') cells.pop()
  return cells
}

export interface OpticalReaderOptions {
  fileName: string
  /** The quantities this file may hold (e.g. scattering and backscattering for a nephelometer's file). */
  allowed: readonly OpticalQuantity[]
  /** What the file is called in messages about a quantity it should not hold, e.g. "--absorption". */
  allowedWhere?: string
  onRecord: (record: OpticalRecord) => void
  /** false: every row through the general path (`readRow`), as before the plain rows' own path (tests compare the two). */
  plainRows?: boolean
}

export interface OpticalReader {
  push(line: string): void
  /**
   * The header, the number of rows read and the rows left out (the first MAX_KEPT_OPTICAL_REJECTIONS, and their
   * count); throws when the file had no header or no row that could be read.
   */
  end(): OpticalHeader & { recordCount: number; rejected: OpticalRejection[]; rejectedCount: number; humidityRejected: OpticalRejection[]; humidityRejectedCount: number }
  readonly header: OpticalHeader | undefined
}

/** A line-by-line reader of the layout above: memory does not grow with the number of rows. */
export function createOpticalReader(options: OpticalReaderOptions): OpticalReader {
  const file = options.fileName
  const metadata: Record<string, string> = {}
  let header: OpticalHeader | undefined
  let lineNo = 0
  let count = 0
  let zoned: boolean | undefined
  let lastMs = -Infinity
  /** The order of day/month/year dates: stated, or detected (orderFrom says where); rows wait while unknown. */
  let order: DateOrder | undefined
  let orderFrom = ''
  const held: { text: string; line: number }[] = []
  const rejected: OpticalRejection[] = []
  let rejectedCount = 0
  const humidityRejected: OpticalRejection[] = []
  let humidityRejectedCount = 0
  /** A row's humidity cell: its value from 0 to 100 %, else NaN, a cell outside that listed with its reason. */
  const humidityCell = (cell: string, line: number, column: number): number => {
    const v = NUMBER.test(cell) ? Number(cell) : NaN
    const p = humidityProblem(cell, v)
    if (p) {
      humidityRejectedCount++
      if (humidityRejected.length < MAX_KEPT_OPTICAL_REJECTIONS) humidityRejected.push({ line, column, ...p })
    }
    return humidityValue(cell, v)
  }
  let width = 0
  const reject = (line: number, column: number, reason: string, fix: string): void => {
    rejectedCount++
    if (rejected.length < MAX_KEPT_OPTICAL_REJECTIONS) rejected.push({ line, column, reason: `${reason}; the row is left out`, fix })
  }

  const at = (line: number, column?: number) => `${file} line ${line}${column !== undefined ? ` column ${column}` : ''}`

  const readHeader = (text: string, line: number) => {
    const delimiter = text.includes('\t') ? '\t' : text.includes(';') ? ';' : ','
    const cells = splitCells(text, delimiter)
    if (!/^time\b/i.test(cells[0] ?? '')) {
      throw new InputError(at(line, 1), `the header's first cell is "${cells[0] ?? ''}", not the time column`, 'Start the header with "time", then one column per quantity and wavelength, e.g. time,scattering 550 nm,absorption 660 nm.')
    }
    let unitMissing = false
    const fileUnit = metadata.units ?? metadata.unit
    if (fileUnit !== undefined && !UNIT.test(fileUnit.replace(/\s+/g, ''))) {
      throw new InputError(`${file}: units`, `the coefficients are in "${fileUnit}", not Mm⁻¹`, 'Convert the coefficients to Mm⁻¹ (1 Mm⁻¹ = 10⁻⁶ m⁻¹) and write "# units: Mm-1".')
    }
    const channels: OpticalChannel[] = []
    let humidityColumn: number | undefined
    for (let c = 1; c < cells.length; c++) {
      if (isHumidityHeader(cells[c])) {
        if (humidityColumn !== undefined) throw new InputError(at(line, c + 1), `"${cells[c]}" is a second humidity column (the first is column ${humidityColumn})`, 'Keep one relative-humidity column (the sample\'s, in %).')
        humidityColumn = c + 1
        continue
      }
      const m = HEADER_CELL.exec(cells[c])
      if (!m) {
        throw new InputError(at(line, c + 1), `the header cell "${cells[c]}" is not a quantity and a wavelength`, 'Write each column as QUANTITY WAVELENGTH nm with QUANTITY scattering, backscattering or absorption, e.g. "scattering 550 nm".')
      }
      const quantity = m[1].toLowerCase() as OpticalQuantity
      const wavelengthNm = Number(m[2])
      if (!options.allowed.includes(quantity)) {
        throw new InputError(at(line, c + 1), `the column "${cells[c]}" holds ${quantity}, which this file (${options.allowedWhere ?? 'this option'}) does not take`, `Give ${options.allowed.join(' or ')} columns here, and ${quantity} in its own file.`)
      }
      if (!(wavelengthNm >= 200 && wavelengthNm <= 40000)) throw new InputError(at(line, c + 1), `the wavelength ${wavelengthNm} nm is outside 200 to 40000 nm`, 'Give the wavelength in nm, e.g. "scattering 550 nm".')
      if (m[3] !== undefined) {
        if (!UNIT.test(m[3].replace(/\s+/g, ''))) throw new InputError(at(line, c + 1), `the unit "${m[3]}" is not Mm⁻¹`, 'Convert the column to Mm⁻¹ (1 Mm⁻¹ = 10⁻⁶ m⁻¹) and write [Mm-1].')
      } else if (fileUnit === undefined) unitMissing = true
      if (channels.some((x) => x.quantity === quantity && x.wavelengthNm === wavelengthNm)) {
        throw new InputError(at(line, c + 1), `${quantity} at ${wavelengthNm} nm has a second column`, 'Keep one column per quantity and wavelength.')
      }
      channels.push({ quantity, wavelengthNm, column: c + 1 })
    }
    if (channels.length === 0) throw new InputError(at(line), 'the header names no quantity', 'Add columns such as "scattering 550 nm" after the time column.')
    if (unitMissing) throw new InputError(at(line), 'the unit of the coefficients is not stated', 'Add a line "# units: Mm-1" above the header, or write the unit in each header cell: "scattering 550 nm [Mm-1]".')
    header = { fileName: file, channels, headerLine: line, delimiter, metadata, ...(humidityColumn !== undefined ? { humidityColumn, humidityName: cells[humidityColumn - 1] } : {}) }
    width = cells.length
    const stated = Object.entries(metadata).map(([k, v]) => (/date|format|order/.test(k) ? statedOrder(v) : undefined)).find((o) => o) ?? statedOrder(cells[0])
    if (stated) {
      order = stated
      orderFrom = 'as the file states'
    }
  }

  /** A row's time: ISO 8601, or a date in the file's order; undefined when it cannot be read. */
  const rowTime = (cell: string): (TimeStamp & { iso: string }) | undefined => {
    if (/^\d{4}/.test(cell)) {
      const t = parseTimeStamp(cell)
      return t && { ...t, iso: cell }
    }
    const p = dateParts(cell)
    if (!p || !order) return undefined
    const t = readDateTime(cell, undefined, order, undefined)
    return t && { ms: t.ms, zoned: p.rest !== '' && readClock(p.rest).zone !== undefined, iso: t.iso }
  }

  const orderUnknown = () => {
    const first = held[0]
    return new InputError(
      at(first.line, 1),
      `the dates ("${splitCells(first.text, header!.delimiter)[0]}", ...) could be day/month/year or month/day/year: no date in the ${held.length} rows read${held.length > MAX_HELD_ROWS ? ' so far' : ''} has a part above 12`,
      'State the order in a line above the header, "# date format: dd/mm/yyyy" (or mm/dd/yyyy), or write the times in ISO 8601 (2026-06-01T10:05:00Z).'
    )
  }

  const readRow = (text: string, line: number) => {
    const h = header!
    const cells = splitCells(text, h.delimiter)
    if (order === undefined) {
      const p = dateParts(cells[0] ?? '')
      if (p && p.aDigits !== 4) {
        const e = orderEvidence(p)
        if (e === undefined) {
          held.push({ text, line })
          if (held.length > MAX_HELD_ROWS) throw orderUnknown()
          return
        }
        // only a real date settles the order (13/13/2026 or 31/02/2026 is a bad time, left out below)
        if (e !== 'conflict' && readDateTime(cells[0], undefined, e, undefined)) {
          order = e
          orderFrom = `detected from line ${line}: ${cells[0]}`
          for (const r of held.splice(0)) readRow(r.text, r.line)
        }
      }
    }
    if (cells.length > width) {
      return reject(line, width + 1, `the row has ${cells.length} cells, the header ${width}`, 'Give each row a time and one value per header column (an empty cell for no data).')
    }
    const t = rowTime(cells[0])
    if (!t) {
      const what = order && order !== 'ymd' && !/^\d{4}/.test(cells[0]) ? `a date and time in ${DATE_ORDER_NAMES[order]} order (${orderFrom})` : 'a time stamp'
      return reject(line, 1, cells[0] === '' ? 'the time is missing' : `"${cells[0]}" is not ${what}`, 'Write times as 2026-06-01T10:05:00Z or 2026-06-01 10:05 (ISO 8601, with or without a zone), or as 01/06/2026 10:05 in the file\'s date order.')
    }
    const values = new Float64Array(h.channels.length)
    for (let j = 0; j < h.channels.length; j++) {
      const ch = h.channels[j]
      const cell = cells[ch.column - 1] ?? ''
      if (MISSING_CELL.test(cell)) values[j] = NaN
      else if (NUMBER.test(cell)) values[j] = Number(cell)
      else return reject(line, ch.column, `"${cell}" (${ch.quantity} ${ch.wavelengthNm} nm) is not a number`, 'Give the coefficient in Mm⁻¹ with "." as the decimal point, or leave the cell empty for no data.')
    }
    const rh = h.humidityColumn === undefined ? undefined : humidityCell(cells[h.humidityColumn - 1] ?? '', line, h.humidityColumn)
    if (zoned === undefined) zoned = t.zoned
    else if (zoned !== t.zoned) throw new InputError(at(line, 1), `the time stamp "${cells[0]}" ${t.zoned ? 'has a zone' : 'has no zone'} unlike the file's first one`, 'Give every time stamp of the file the same form (all with a zone such as Z or +01:00, or all without).')
    if (!(t.ms > lastMs)) throw new InputError(at(line, 1), `the time ${cells[0]} does not follow the row before it`, 'Sort the rows by time and remove repeated times.')
    lastMs = t.ms
    count++
    options.onRecord(rh === undefined ? { line, time: t.iso, ms: t.ms, zoned: t.zoned, values } : { line, time: t.iso, ms: t.ms, zoned: t.zoned, values, rh })
  }

  /**
   * A plain data row read from its characters (cell boundaries by indexOf, numbers by readNumber), without the
   * array of cell strings and the regular expressions of `readRow`. It takes only rows that `readRow` would keep
   * as they are: no quote, no space or other character that trimming would remove around a cell or the line, an
   * ISO 8601 time, every value a plain number or empty, no more cells than the header, the zone form and order
   * kept, no rows held for a date order. Anything else (it changes nothing then) goes to `readRow`, which reads
   * it, leaves it out or stops the reading with its words. The same record as `readRow` makes (test/field/optical-fast.test.ts).
   */
  const plainRow = (text: string, line: number): boolean => {
    const h = header!
    const len = text.length
    if (len === 0 || held.length > 0 || !plainEnd(text.charCodeAt(0)) || !plainEnd(text.charCodeAt(len - 1)) || text.charCodeAt(0) === 35) return false
    if (text.indexOf('"') >= 0) return false
    const d = h.delimiter
    let n = 0
    let start = 0
    for (;;) {
      let end = text.indexOf(d, start)
      const last = end < 0
      if (last) end = len
      if (end > start && (!plainEnd(text.charCodeAt(start)) || !plainEnd(text.charCodeAt(end - 1)))) return false
      if (n >= starts.length) return false
      starts[n] = start
      ends[n] = end
      n++
      if (last) break
      start = end + 1
    }
    while (n > 1 && starts[n - 1] === ends[n - 1]) n--
    if (n > width) return false
    const t0 = starts[0]
    const t1 = ends[0]
    if (t1 - t0 < 4) return false
    for (let i = t0; i < t0 + 4; i++) {
      const c = text.charCodeAt(i)
      if (c < 48 || c > 57) return false
    }
    let ms = plainStampMs(text, t0, t1)
    let tz = t1 - t0 === 20
    if (ms !== ms) {
      const t = parseTimeStamp(text.slice(t0, t1))
      if (!t) return false
      ms = t.ms
      tz = t.zoned
    }
    if ((zoned !== undefined && zoned !== tz) || !(ms > lastMs)) return false
    const chs = h.channels
    // the values are views of one block of rows (no buffer of their own per row)
    if (blockAt + chs.length > block.length) {
      block = new Float64Array(4096 * Math.max(1, chs.length))
      blockAt = 0
    }
    const values = block.subarray(blockAt, blockAt + chs.length)
    for (let j = 0; j < chs.length; j++) {
      const k = chs[j].column - 1
      if (k >= n || starts[k] === ends[k]) values[j] = NaN
      else {
        const v = readNumber(text, starts[k], ends[k], false)
        if (v !== v) return false
        values[j] = v
      }
    }
    const hk = h.humidityColumn === undefined ? -1 : h.humidityColumn - 1
    const rh = hk < 0 ? undefined : humidityCell(hk < n ? text.slice(starts[hk], ends[hk]) : '', line, hk + 1)
    if (zoned === undefined) zoned = tz
    lastMs = ms
    count++
    blockAt += chs.length
    const time = text.slice(t0, t1)
    options.onRecord(rh === undefined ? { line, time, ms, zoned: tz, values } : { line, time, ms, zoned: tz, values, rh })
    return true
  }
  let block = new Float64Array(0)
  let blockAt = 0
  const plain = options.plainRows !== false
  const starts = new Int32Array(256)
  const ends = new Int32Array(256)

  return {
    get header() {
      return header
    },
    push(text: string) {
      lineNo++
      if (header && plain && plainRow(text, lineNo)) return
      const trimmed = text.replace(/^\uFEFF/, '').trim()
      if (trimmed === '') return
      if (trimmed.startsWith('#')) {
        const m = /^#\s*([^:]+?)\s*:\s*(.*)$/.exec(trimmed)
        if (m && !header) metadata[m[1].toLowerCase()] = m[2].trim()
        return
      }
      if (!header) readHeader(trimmed, lineNo)
      else readRow(trimmed, lineNo)
    },
    end() {
      if (held.length > 0) throw orderUnknown()
      if (!header) throw new InputError(file, 'no header line was found', 'Start the table with a header such as: time,scattering 550 nm (comment lines start with #).')
      if (count === 0 && rejectedCount > 0) {
        const r = rejected[0]
        throw new InputError(at(r.line, r.column), `no row could be read (${rejectedCount} left out; the first: ${r.reason})`, r.fix)
      }
      if (count === 0) throw new InputError(`${file} line ${header.headerLine}`, 'the file has a header but no rows', 'Give one row per time after the header.')
      return { ...header, recordCount: count, rejected: rejected.slice().sort((a, b) => a.line - b.line), rejectedCount, humidityRejected: humidityRejected.slice().sort((a, b) => a.line - b.line), humidityRejectedCount }
    }
  }
}

/** Reads a whole text (tests, the app). */
export function parseOpticalText(
  text: string,
  options: Omit<OpticalReaderOptions, 'onRecord'>
): { header: OpticalHeader; records: OpticalRecord[]; rejected: OpticalRejection[]; rejectedCount: number; humidityRejected: OpticalRejection[]; humidityRejectedCount: number } {
  const records: OpticalRecord[] = []
  const reader = createOpticalReader({ ...options, onRecord: (r) => records.push(r) })
  if (text.indexOf('\r') < 0) {
    // no carriage return: the lines text.split('\n') would give, found by indexOf without an array of them all
    for (let at = 0; ; ) {
      const end = text.indexOf('\n', at)
      if (end < 0) {
        reader.push(text.slice(at))
        break
      }
      reader.push(text.slice(at, end))
      at = end + 1
    }
  } else for (const line of text.split(/\r?\n/)) reader.push(line)
  const { recordCount: _n, rejected, rejectedCount, humidityRejected, humidityRejectedCount, ...header } = reader.end()
  return { header, records, rejected, rejectedCount, humidityRejected, humidityRejectedCount }
}
