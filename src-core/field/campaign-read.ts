/**
 * Reading a campaign's files from their texts: each file on its own, so one that cannot be read is refused with
 * its reading summary and the fix while the others stay usable. Sizers go through the sizer reader, measured
 * coefficients through the optical-file reader; nothing here is a second copy of either.
 */
import { InputError } from '../errors.ts'
import { binsFromMeasurement, edgesFromMidpoints } from '../sizes/index.ts'
import { CAMPAIGN_KIND_WORDS, isSizerKind, type CampaignFileKind } from './campaign-settings.ts'
import { parseOpticalText, type OpticalHeader, type OpticalRecord } from './optical-file.ts'
import { formatDuration, parseTimeStamp, typicalInterval } from './timebase.ts'
import { createSizerReader } from './reader.ts'
import type { SizerHeader, SizerRejection, SizerSummary } from './types.ts'

/**
 * The lines of text[from, to) one at a time, split as the file readers split them (\r\n, \n or a lone \r; no empty
 * last line after a final break), without an array of every line. `take` returning false stops the reading.
 */
export function eachLine(text: string, from: number, to: number, take: (line: string) => boolean | void): void {
  let at = from
  const r = text.indexOf('\r', from)
  if (r < 0 || r >= to) {
    // no carriage return: indexOf finds the breaks (much quicker than a loop over the characters)
    while (at < to) {
      let end = text.indexOf('\n', at)
      if (end < 0 || end > to) end = to
      if (take(text.slice(at, end)) === false) return
      at = end + 1
    }
    return
  }
  while (at < to) {
    let end = at
    while (end < to) {
      const c = text.charCodeAt(end)
      if (c === 10 || c === 13) break
      end++
    }
    if (take(text.slice(at, end)) === false) return
    if (end < to && text.charCodeAt(end) === 13 && end + 1 < to && text.charCodeAt(end + 1) === 10) end++
    at = end + 1
  }
}

/** A file's text as the app or the CLI read it. */
export interface CampaignInput {
  kind: CampaignFileKind
  /** File name, for messages ("valley-mobility.csv line 12 column 3"). */
  name: string
  text: string
}

/** One reason a row was left out, located. */
export interface LeftOutRow {
  line: number
  column?: number
  reason: string
  fix: string
}

/** What reading a file gave: shown beside the file when it is added, and kept with the record. */
export interface CampaignFileSummary {
  kind: CampaignFileKind
  name: string
  /** false: refused (see `error`); the rest of the campaign goes on without it. */
  ok: boolean
  error?: { where: string; problem: string; fix: string }
  /** Rows read and kept. */
  rows: number
  /** Sizers: bins; instruments: channels ("scattering 550 nm"). */
  bins: number
  channels: string[]
  firstTime: string
  lastTime: string
  /** The typical spacing of the rows, in words ("5 min"); '' with fewer than two rows. */
  interval: string
  /** Columns not read (sample number, totals, ...), by header name. */
  ignoredColumns: string[]
  /** Rows left out, how many, and the first MAX_LISTED reasons. */
  leftOut: number
  reasons: LeftOutRow[]
  /** What the reader decided without the file saying it. */
  notes: string[]
  /** The sample's relative humidity recorded in the file (humidity.ts): its column, the rows with a value, and the cells left out (outside 0–100 % or not a number; their rows are kept) with the first MAX_LISTED reasons. */
  humidity?: { column: string; rows: number; leftOut: number; reasons: LeftOutRow[] }
}

const MAX_LISTED = 20

/** A sizer file read whole: its header, and its kept rows packed (times, time texts, values row after row). */
export interface ReadSizer {
  summary: CampaignFileSummary
  table: SizerHeader
  rows: number
  bins: number
  /** rows × bins, in the file's quantity. */
  values: Float64Array
  timeText: string[]
  timesMs: Float64Array
  zoned: boolean
  /** Native edges (µm) and the factor that turns a value into dN/dlog d (native diameter). */
  edgesUm: Float64Array
  factor: Float64Array
  /** With a humidity column: each kept row's relative humidity, % (NaN: none). */
  rh?: Float64Array
}

export interface ReadInstrument {
  summary: CampaignFileSummary
  header: OpticalHeader
  records: OpticalRecord[]
}

function humiditySummary(column: string, rh: ArrayLike<number>, leftOut: number, reasons: readonly LeftOutRow[]): NonNullable<CampaignFileSummary['humidity']> {
  let rows = 0
  for (let i = 0; i < rh.length; i++) if (rh[i] === rh[i]) rows++
  return { column, rows, leftOut, reasons: reasons.slice(0, MAX_LISTED).map((x) => ({ ...x })) }
}

function refused(kind: CampaignFileKind, name: string, e: InputError): CampaignFileSummary {
  let problem = e.message
  if (e.where && problem.startsWith(`${e.where}: `)) problem = problem.slice(e.where.length + 2)
  if (e.fix && problem.endsWith(` ${e.fix}`)) problem = problem.slice(0, -(e.fix.length + 1))
  return { kind, name, ok: false, error: { where: e.where, problem, fix: e.fix }, rows: 0, bins: 0, channels: [], firstTime: '', lastTime: '', interval: '', ignoredColumns: [], leftOut: 0, reasons: [], notes: [] }
}

/**
 * Reads a sizer file; an InputError comes back as a refused summary, never thrown. `read`: its lines as
 * `readSizerPart(input)` read them already (the app's worker reads a file while it waits for the record's settings).
 */
export function readCampaignSizer(input: CampaignInput, density?: number, read?: SizerPart): ReadSizer | { summary: CampaignFileSummary } {
  try {
    return finishSizer(input, [read ?? readSizerPart(input)], density)
  } catch (e) {
    if (e instanceof InputError) return { summary: refused(input.kind, input.name, e) }
    throw e
  }
}

/**
 * A stretch of a sizer file's lines as read (`readSizerPart`): its kept rows packed, the rows it left out, and its
 * reader's summary. Parts read one after the other give, merged by `finishSizer`, what one reader gives.
 */
export interface SizerPart {
  rows: number
  bins: number
  /** rows × bins, in the file's quantity. */
  values: Float64Array
  timesMs: Float64Array
  timeText: string[]
  /** With a humidity column: each kept row's relative humidity, % (NaN: none). */
  rh?: Float64Array
  /** The zone form of the part's first kept row (undefined: none kept). */
  zoned?: boolean
  /** Rows left out here because of their time stamp (the reader's own are in `end.rejected`). */
  timeReasons: LeftOutRow[]
  end: SizerSummary
}

/** Where a later part starts: its first character, and that line's number (1-based). */
export interface LineCut {
  from: number
  line: number
}

/**
 * A sizer reader and what it keeps of a part's rows (readSizerPart, readSizerBytes): rows whose time is not an ISO
 * 8601 stamp, or whose zone form differs from the first's, are left out here; the kept rows' values are packed into
 * one growing Float64Array (no array per row). `took(n)`: n more characters (or bytes) of the part's `size` read.
 */
function partReader(name: string, size: number, cut?: LineCut) {
  const timeReasons: LeftOutRow[] = []
  const times: number[] = []
  const timeText: string[] = []
  const rh: number[] = []
  let values = new Float64Array(0)
  let bins = 0
  let zoned: boolean | undefined
  let lastLine = 0
  let read = 0
  const reader = createSizerReader({
    fileName: name,
    reuseBuffer: true,
    maxKeptRejections: Infinity,
    ...(cut ? { rowsFrom: cut.line } : {}),
    onRecord: (r) => {
      const t = parseTimeStamp(r.time)
      if (!t) return void timeReasons.push({ line: r.line, column: 1, reason: `"${r.time}" is not an ISO 8601 time stamp; the row is left out`, fix: 'Write times as 2026-06-01T10:05:00Z or 2026-06-01 10:05.' })
      if (zoned !== undefined && t.zoned !== zoned) return void timeReasons.push({ line: r.line, column: 1, reason: `the time "${r.time}" ${t.zoned ? 'has a zone' : 'has no zone'} unlike the file's first; the row is left out`, fix: 'Give every time stamp of the file the same form.' })
      if (times.length > 0 && !(t.ms > times[times.length - 1])) throw new InputError(`${name} line ${r.line} column 1`, `the time ${r.time} does not follow the row before it (line ${lastLine})`, 'Sort the rows by time and remove repeated times.')
      zoned = t.zoned
      bins = r.values.length
      const k = times.length
      if ((k + 1) * bins > values.length) {
        // room for 4096 rows first, then for the rows the rest of the part holds if they are as long as those read
        // so far (and a twentieth more): one copy in most files, not one per doubling
        const rowsLeft = k === 0 ? 4096 : Math.max(Math.ceil(k / 8), Math.ceil((1.05 * (size - read) * k) / Math.max(1, read)) + 16)
        const grown = new Float64Array((k + rowsLeft) * bins)
        grown.set(values)
        values = grown
      }
      const v = r.values
      const at = k * bins
      for (let j = 0; j < bins; j++) values[at + j] = v[j]
      times.push(t.ms)
      timeText.push(r.time)
      if (r.rh !== undefined) rh.push(r.rh)
      lastLine = r.line
    }
  })
  return {
    reader,
    took: (n: number) => void (read += n),
    part(): SizerPart {
      const end = reader.end()
      const rows = times.length
      return { rows, bins, values: values.subarray(0, rows * bins), timesMs: Float64Array.from(times), timeText, ...(end.humidityColumn ? { rh: Float64Array.from(rh) } : {}), ...(zoned !== undefined ? { zoned } : {}), timeReasons, end }
    }
  }
}

/**
 * Reads the sizer file's lines from `cut` (all of them by default) to `to`. A part after the first recognises
 * the table from the file's first lines, as one reader does, and reads no row before its cut. Throws InputError.
 */
export function readSizerPart(input: CampaignInput, cut?: LineCut, to = input.text.length): SizerPart {
  const { name, text } = input
  const from = cut?.from ?? 0
  const { reader, took, part } = partReader(name, to - from, cut)
  if (cut) {
    // the table as the file's first lines give it (no row of them is read), then the part's own lines
    eachLine(text, 0, cut.from, (line) => {
      reader.push(line)
      return reader.header === undefined
    })
    if (!reader.header) throw new Error(`readSizerPart: the table of ${name} is not recognised before line ${cut.line}`)
    let first = true
    eachLine(text, cut.from, to, (line) => {
      took(line.length + 1)
      if (first) reader.push(line, cut.line)
      else reader.push(line)
      first = false
    })
  } else
    eachLine(text, 0, to, (line) => {
      took(line.length + 1)
      reader.push(line)
    })
  return part()
}

/**
 * The whole sizer file read from its bytes (UTF-8): the same part as readSizerPart gives for the text they decode
 * to (a byte-order mark dropped), without that text. Without a carriage return, lines are cut at each \n byte (never
 * inside a multi-byte character) and a plain row is read from its bytes (the reader's pushBytes); any other line is
 * decoded alone. A file with a carriage return is decoded whole and read as text. A year of 5-minute rows of 100
 * bins took 1.11–1.23 s of processor time this way against 1.35–1.48 s decoded and read as text (DEVELOPERS.md, the
 * station record). Throws InputError.
 */
export function readSizerBytes(input: Pick<CampaignInput, 'kind' | 'name'>, bytes: Uint8Array): SizerPart {
  if (bytes.includes(13)) return readSizerPart({ ...input, text: new TextDecoder().decode(bytes) })
  const { reader, took, part } = partReader(input.name, bytes.length)
  // the first line decoded as the whole text's start (its byte-order mark dropped), the others with theirs kept
  const first = new TextDecoder()
  const rest = new TextDecoder('utf-8', { ignoreBOM: true })
  const n = bytes.length
  for (let at = 0; at < n; ) {
    let end = bytes.indexOf(10, at)
    if (end < 0) end = n
    took(end - at + 1)
    if (!reader.pushBytes(bytes, at, end)) reader.push((at === 0 ? first : rest).decode(bytes.subarray(at, end)))
    at = end + 1
  }
  return part()
}

/**
 * Where a sizer file's text may be cut into a first part and a second (at the first line that starts at or after
 * `share` of its length), for two readers: undefined when the file is small, its table is not recognised within its
 * first lines, it is not one row per time, or its date order is not known from its header (rows would be held).
 */
export function sizerCut(input: CampaignInput, share: number, minChars = 4_000_000): LineCut | undefined {
  const { text, name } = input
  if (text.length < minChars) return undefined
  let at = text.indexOf('\n', Math.floor(text.length * share))
  if (at < 0 || at + 1 >= text.length) return undefined
  at++
  let recognised = false
  try {
    const reader = createSizerReader({ fileName: name, rowsFrom: Infinity })
    let seen = 0
    eachLine(text, 0, at, (line) => {
      seen += line.length + 1
      reader.push(line)
      return reader.header === undefined && seen < at / 2
    })
    const h = reader.header
    recognised = h !== undefined && h.layout === 'time-rows' && !reader.orderPending
  } catch (e) {
    if (!(e instanceof InputError)) throw e
  }
  if (!recognised) return undefined
  return { from: at, line: lineBreaksBefore(text, at) + 1 }
}

/** How many line breaks (\r\n, \n or a lone \r) text[0, end) holds. */
function lineBreaksBefore(text: string, end: number): number {
  let n = 0
  for (let i = text.indexOf('\n'); i >= 0 && i < end; i = text.indexOf('\n', i + 1)) n++
  for (let i = text.indexOf('\r'); i >= 0 && i < end; i = text.indexOf('\r', i + 1)) if (text.charCodeAt(i + 1) !== 10) n++
  return n
}

/**
 * True when a later part continues the parts before it as one reader would have read on: its first kept row has the
 * zone form of the file's first and comes after the last kept row before it. Otherwise one reader must read the
 * file again (it stops at that row, or leaves out rows the part kept).
 */
export function partsJoin(before: SizerPart, after: SizerPart): boolean {
  if (before.rows === 0 || after.rows === 0) return before.zoned === undefined || after.zoned === undefined
  return before.zoned === after.zoned && after.timesMs[0] > before.timesMs[before.rows - 1]
}

/** A sizer file's parts, in order and joined (partsJoin), as one reading: the same record and summary. Throws InputError. */
export function finishSizer(input: CampaignInput, parts: readonly SizerPart[], density?: number): ReadSizer {
  const { kind, name } = input
  const part = parts.length === 1 ? parts[0] : joinParts(parts)
  const { rows, timeText, timesMs } = part
  const end = part.end
  if (rows === 0) throw new InputError(name, 'no row with an ISO 8601 time and a full set of values was read', 'Give one row per time: the time (e.g. 2026-06-01T10:05:00Z), then one value per bin.')
  const reasons: LeftOutRow[] = [...part.timeReasons, ...end.rejected.map((r: SizerRejection) => ({ ...r }))]
  const { recordCount: _n, rejected: _r, rejectedCount: _c, firstTime: _f, lastTime: _l, ...table } = end
  const unit = table.diameterUnit === 'nm' ? 'nm' : 'µm'
  const edgesNative = table.edges ? Float64Array.from(table.diameters) : edgesFromMidpoints(table.diameters, unit)
  const binsOf = binsFromMeasurement({ diameters: edgesNative, diameterKind: 'edges', diameterUnit: table.diameterUnit, quantity: table.quantity, values: new Array(edgesNative.length - 1).fill(1), density })
  reasons.sort((a, b) => a.line - b.line)
  const leftOut = table.rowsLeftOut + part.timeReasons.length
  const interval = typicalInterval(timesMs)
  const summary: CampaignFileSummary = {
    kind,
    name,
    ok: true,
    rows,
    bins: edgesNative.length - 1,
    channels: [],
    firstTime: timeText[0],
    lastTime: timeText[rows - 1],
    interval: interval !== undefined ? formatDuration(Math.round(interval)) : '',
    ignoredColumns: table.ignoredColumns.map((c) => c.name),
    leftOut,
    reasons: reasons.slice(0, MAX_LISTED),
    notes: [...table.notes, `${CAMPAIGN_KIND_WORDS[kind]}: ${table.diameters.length - (table.edges ? 1 : 0)} bins in ${table.quantity}, diameters in ${table.diameterUnit} (${table.unitSource})`],
    ...(table.humidityColumn ? { humidity: humiditySummary(`"${table.humidityColumn.name}" (column ${table.humidityColumn.column})`, part.rh!, end.humidityRejectedCount, end.humidityRejected) } : {})
  }
  return { summary, table, rows, bins: part.bins, values: part.values, timeText, timesMs, zoned: part.zoned!, edgesUm: binsOf.edges, factor: binsOf.dNdlogD, ...(table.humidityColumn ? { rh: part.rh! } : {}) }
}

/** Parts joined into one: rows after rows, the counts summed, the lists one after the other. */
function joinParts(parts: readonly SizerPart[]): SizerPart {
  const rows = parts.reduce((n, p) => n + p.rows, 0)
  const bins = parts.find((p) => p.rows > 0)?.bins ?? 0
  const values = new Float64Array(rows * bins)
  const timesMs = new Float64Array(rows)
  let k = 0
  for (const p of parts) {
    values.set(p.values.subarray(0, p.rows * bins), k * bins)
    timesMs.set(p.timesMs, k)
    k += p.rows
  }
  const ends = parts.map((p) => p.end)
  const sum = (f: (e: SizerSummary) => number) => ends.reduce((n, e) => n + f(e), 0)
  const first = ends[0]
  const end: SizerSummary = {
    ...first,
    recordCount: sum((e) => e.recordCount),
    rejected: ends.flatMap((e) => e.rejected),
    rejectedCount: sum((e) => e.rejectedCount),
    rowsLeftOut: sum((e) => e.rowsLeftOut),
    negativesZeroed: { cells: sum((e) => e.negativesZeroed.cells), rows: sum((e) => e.negativesZeroed.rows) },
    humidityRejected: ends.flatMap((e) => e.humidityRejected),
    humidityRejectedCount: sum((e) => e.humidityRejectedCount),
    humidityRows: sum((e) => e.humidityRows),
    firstTime: ends.find((e) => e.firstTime)?.firstTime ?? '',
    lastTime: [...ends].reverse().find((e) => e.lastTime)?.lastTime ?? ''
  }
  const rh = first.humidityColumn ? new Float64Array(rows) : undefined
  if (rh) {
    let at = 0
    for (const p of parts) (rh.set(p.rh!, at), (at += p.rows))
  }
  const zoned = parts.find((p) => p.zoned !== undefined)?.zoned
  return { rows, bins, values, timesMs, timeText: parts.flatMap((p) => p.timeText), ...(rh ? { rh } : {}), ...(zoned !== undefined ? { zoned } : {}), timeReasons: parts.flatMap((p) => p.timeReasons), end }
}

/** Reads a scattering or absorption file; an InputError comes back as a refused summary. */
export function readCampaignInstrument(input: CampaignInput): ReadInstrument | { summary: CampaignFileSummary } {
  const { kind, name, text } = input
  if (isSizerKind(kind)) throw new Error(`readCampaignInstrument: ${kind} is a sizer`)
  try {
    const allowed = kind === 'scattering' ? (['scattering', 'backscattering'] as const) : (['absorption'] as const)
    const r = parseOpticalText(text, { fileName: name, allowed, allowedWhere: `the ${CAMPAIGN_KIND_WORDS[kind]} file` })
    const interval = typicalInterval(r.records.map((x) => x.ms))
    const summary: CampaignFileSummary = {
      kind,
      name,
      ok: true,
      rows: r.records.length,
      bins: 0,
      channels: r.header.channels.map((c) => `${c.quantity} ${c.wavelengthNm} nm`),
      firstTime: r.records[0]?.time ?? '',
      lastTime: r.records[r.records.length - 1]?.time ?? '',
      interval: interval !== undefined ? formatDuration(Math.round(interval)) : '',
      ignoredColumns: [],
      leftOut: r.rejectedCount,
      reasons: r.rejected.slice(0, MAX_LISTED).map((x) => ({ ...x })),
      notes: [],
      ...(r.header.humidityColumn !== undefined ? { humidity: humiditySummary(`"${r.header.humidityName}" (column ${r.header.humidityColumn})`, r.records.map((x) => x.rh ?? NaN), r.humidityRejectedCount, r.humidityRejected) } : {})
    }
    return { summary, header: r.header, records: r.records }
  } catch (e) {
    if (e instanceof InputError) return { summary: refused(kind, name, e) }
    throw e
  }
}
