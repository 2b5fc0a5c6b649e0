// Types of the sizer-file reader (see reader.ts).
import type { BinQuantityName } from '../study/model.ts'
import type { Delimiter } from './cells.ts'
import type { DateOrder } from './time.ts'

export type SizerLayout = 'single' | 'time-rows' | 'time-columns'
export type SizerDelimiter = Delimiter
export type { DateOrder }

export interface SizerOptions {
  /** Used in messages ("sizer.csv line 12 column 3"). */
  fileName?: string
  /** Override what the file says (or supply what it does not). */
  diameterUnit?: 'nm' | 'um'
  quantity?: BinQuantityName
  layout?: SizerLayout
  /** true: the diameters are the n + 1 bin edges (the last one carries no value); default: as the file says, else midpoints. */
  edges?: boolean
  delimiter?: SizerDelimiter
  decimal?: '.' | ','
  /** 'skip' (default): report and drop bad rows or cells; 'stop': throw InputError at the first one. */
  onBadRow?: 'skip' | 'stop'
  /** Negative values: 'drop' (default) leaves the row out with the reason; 'zero' sets them to 0 and counts them. */
  negatives?: 'drop' | 'zero'
  /** Order of numeric dates; default: as the file states it, else detected from the whole column. */
  dateOrder?: DateOrder
  /** Year of decimal day-of-year times, when the file does not give it. */
  year?: number
}

export interface SizerRecord {
  /** ISO 8601 time of the row; a label as written when the file's time column holds no readable time; '' when none. */
  time: string
  /** Milliseconds since 1970-01-01 (UTC, or the file's own clock when it states no zone); NaN when not a time. */
  timeMs: number
  /** One value per bin, in the file's quantity (a fresh array, unless the reader was made with reuseBuffer). */
  values: number[]
  /** 1-based line of the row (time-rows), the first value row (single) or the header row (time-columns). */
  line: number
  /** With a humidity column (`humidityColumn`): the row's relative humidity, %, NaN when none or left out. */
  rh?: number
}

export interface SizerRejection {
  line: number
  column?: number
  reason: string
  fix: string
}

/** A column of the table that is not a bin. */
export interface SizerColumn {
  /** 1-based. */
  column: number
  /** Its header cell. */
  name: string
}

export type TimeRole = 'date and time' | 'date' | 'time of day' | 'day of year' | 'seconds since epoch' | 'label'

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
  /** 1-based line of a units row under the header (0 when none). */
  unitsLine: number
  /** Metadata lines before the table, keys in lower case. */
  metadata: Record<string, string>
  /** time-rows: 1-based column of the first bin. */
  firstBinColumn: number
  /** The columns that give the time (time-rows), with what each holds. */
  timeColumns: (SizerColumn & { role: TimeRole })[]
  /** How times are read, in words ("ISO 8601", "day/month/year (detected: line 40 has 13/01/2024)", ...); '' when no time. */
  timeFormat: string
  /** The order of numeric dates used, when the times have dates in a day/month order. */
  dateOrder?: DateOrder
  /** Columns before and after the bins that are not read (sample number, temperature, totals, ...). */
  ignoredColumns: SizerColumn[]
  /** time-rows: the column of the sample's relative humidity in %, when a header names one (humidity.ts). */
  humidityColumn?: SizerColumn
  /** Where the diameter unit comes from ("option", "metadata line 3", "header cells", "inferred: ..."). */
  unitSource: string
  /** What was inferred or decided without the file saying it, for the reading summary. */
  notes: string[]
}

export interface SizerTable extends SizerHeader {
  records: SizerRecord[]
  rejected: SizerRejection[]
  /** Rows (time-rows and single) left out because of bad cells. */
  rowsLeftOut: number
  negativesZeroed: { cells: number; rows: number }
  /** Humidity cells left out (outside 0–100 %, not a number); their rows are kept. */
  humidityRejected: SizerRejection[]
}

export interface SizerSummary extends SizerHeader {
  recordCount: number
  /** The first kept rejections; `rejectedCount` counts them all. */
  rejected: SizerRejection[]
  rejectedCount: number
  /** Rows left out because of bad cells (a row with three bad cells counts once). */
  rowsLeftOut: number
  /** With negatives 'zero': cells set to 0, and rows that had at least one. */
  negativesZeroed: { cells: number; rows: number }
  /** Humidity cells left out (outside 0–100 %, not a number; their rows are kept): the first kept, and the count. */
  humidityRejected: SizerRejection[]
  humidityRejectedCount: number
  /** Rows with a humidity value. */
  humidityRows: number
  /** Times of the first and last records read ('' when none). */
  firstTime: string
  lastTime: string
}

export interface SizerReader {
  /** One line of the file, without its line break; `lineNo` numbers it (and the lines after it) when lines were skipped. */
  push(line: string, lineNo?: number): void
  /**
   * The same for a line given as bytes of UTF-8 text, bytes[start, end), read without making a string of it (a row
   * of a recognised one-row-per-time table). False when it is not taken (the table is not recognised yet, another
   * layout, the date order still unknown, a quote or a byte beyond ASCII): push the line as text then.
   */
  pushBytes(bytes: Uint8Array, start: number, end: number, lineNo?: number): boolean
  /** No more lines: reads what is left, returns the summary. Throws InputError when no table was found. */
  end(): SizerSummary
  /** Known once enough lines were seen to recognise the table. */
  readonly header: SizerHeader | undefined
  /** True while rows are held back because the date order is not known yet. */
  readonly orderPending: boolean
}

export interface SizerReaderOptions extends SizerOptions {
  onRecord?: (record: SizerRecord) => void
  /** Rejections kept in memory (the count goes on); default MAX_KEPT_REJECTIONS. */
  maxKeptRejections?: number
  /** Hand every record the same `values` array, overwritten by the next row (the callee copies what it keeps). */
  reuseBuffer?: boolean
  /**
   * Read no row on a line before this one (a later part of a file: the table is recognised from the file's first
   * lines as a whole reader recognises it, then the part's lines are pushed with their numbers).
   */
  rowsFrom?: number
}
