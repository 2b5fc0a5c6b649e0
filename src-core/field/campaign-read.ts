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
import type { SizerHeader, SizerRejection } from './types.ts'

/**
 * The lines of a text one at a time, split as the file readers split them (\r\n, \n or a lone \r; no empty last
 * line after a final break), without an array of every line.
 */
function eachLine(text: string, take: (line: string) => void): void {
  let at = 0
  const n = text.length
  while (at < n) {
    let end = at
    while (end < n) {
      const c = text.charCodeAt(end)
      if (c === 10 || c === 13) break
      end++
    }
    take(text.slice(at, end))
    if (end < n && text.charCodeAt(end) === 13 && text.charCodeAt(end + 1) === 10) end++
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

function humiditySummary(column: string, rh: readonly number[], leftOut: number, reasons: readonly LeftOutRow[]): NonNullable<CampaignFileSummary['humidity']> {
  let rows = 0
  for (const v of rh) if (v === v) rows++
  return { column, rows, leftOut, reasons: reasons.slice(0, MAX_LISTED).map((x) => ({ ...x })) }
}

function refused(kind: CampaignFileKind, name: string, e: InputError): CampaignFileSummary {
  let problem = e.message
  if (e.where && problem.startsWith(`${e.where}: `)) problem = problem.slice(e.where.length + 2)
  if (e.fix && problem.endsWith(` ${e.fix}`)) problem = problem.slice(0, -(e.fix.length + 1))
  return { kind, name, ok: false, error: { where: e.where, problem, fix: e.fix }, rows: 0, bins: 0, channels: [], firstTime: '', lastTime: '', interval: '', ignoredColumns: [], leftOut: 0, reasons: [], notes: [] }
}

/** Reads a sizer file; an InputError comes back as a refused summary, never thrown. */
export function readCampaignSizer(input: CampaignInput, density?: number): ReadSizer | { summary: CampaignFileSummary } {
  const { kind, name, text } = input
  try {
    // rows whose time is not an ISO 8601 stamp, or whose zone form differs from the first's, are left out here;
    // the kept rows' values are packed into one growing Float64Array (no array per row)
    const reasons: LeftOutRow[] = []
    const times: number[] = []
    const timeText: string[] = []
    const rh: number[] = []
    let values = new Float64Array(0)
    let bins = 0
    let zoned: boolean | undefined
    let lastLine = 0
    let extra = 0
    const reader = createSizerReader({
      fileName: name,
      reuseBuffer: true,
      maxKeptRejections: Infinity,
      onRecord: (r) => {
        const t = parseTimeStamp(r.time)
        if (!t) return void (extra++, reasons.push({ line: r.line, column: 1, reason: `"${r.time}" is not an ISO 8601 time stamp; the row is left out`, fix: 'Write times as 2026-06-01T10:05:00Z or 2026-06-01 10:05.' }))
        if (zoned !== undefined && t.zoned !== zoned) return void (extra++, reasons.push({ line: r.line, column: 1, reason: `the time "${r.time}" ${t.zoned ? 'has a zone' : 'has no zone'} unlike the file's first; the row is left out`, fix: 'Give every time stamp of the file the same form.' }))
        if (times.length > 0 && !(t.ms > times[times.length - 1])) throw new InputError(`${name} line ${r.line} column 1`, `the time ${r.time} does not follow the row before it (line ${lastLine})`, 'Sort the rows by time and remove repeated times.')
        zoned = t.zoned
        bins = r.values.length
        const k = times.length
        if ((k + 1) * bins > values.length) {
          const grown = new Float64Array(Math.max(1024 * bins, 2 * values.length))
          grown.set(values)
          values = grown
        }
        for (let j = 0; j < bins; j++) values[k * bins + j] = r.values[j]
        times.push(t.ms)
        timeText.push(r.time)
        if (r.rh !== undefined) rh.push(r.rh)
        lastLine = r.line
      }
    })
    eachLine(text, (line) => reader.push(line))
    const end = reader.end()
    reasons.push(...end.rejected.map((r: SizerRejection) => ({ ...r })))
    if (times.length === 0) throw new InputError(name, 'no row with an ISO 8601 time and a full set of values was read', 'Give one row per time: the time (e.g. 2026-06-01T10:05:00Z), then one value per bin.')
    const { recordCount: _n, rejected: _r, rejectedCount: _c, firstTime: _f, lastTime: _l, ...table } = end
    const unit = table.diameterUnit === 'nm' ? 'nm' : 'µm'
    const edgesNative = table.edges ? Float64Array.from(table.diameters) : edgesFromMidpoints(table.diameters, unit)
    const binsOf = binsFromMeasurement({ diameters: edgesNative, diameterKind: 'edges', diameterUnit: table.diameterUnit, quantity: table.quantity, values: new Array(edgesNative.length - 1).fill(1), density })
    reasons.sort((a, b) => a.line - b.line)
    const leftOut = table.rowsLeftOut + extra
    const interval = typicalInterval(times)
    const summary: CampaignFileSummary = {
      kind,
      name,
      ok: true,
      rows: times.length,
      bins: edgesNative.length - 1,
      channels: [],
      firstTime: timeText[0],
      lastTime: timeText[timeText.length - 1],
      interval: interval !== undefined ? formatDuration(Math.round(interval)) : '',
      ignoredColumns: table.ignoredColumns.map((c) => c.name),
      leftOut,
      reasons: reasons.slice(0, MAX_LISTED),
      notes: [...table.notes, `${CAMPAIGN_KIND_WORDS[kind]}: ${table.diameters.length - (table.edges ? 1 : 0)} bins in ${table.quantity}, diameters in ${table.diameterUnit} (${table.unitSource})`],
      ...(table.humidityColumn ? { humidity: humiditySummary(`"${table.humidityColumn.name}" (column ${table.humidityColumn.column})`, rh, end.humidityRejectedCount, end.humidityRejected) } : {})
    }
    return { summary, table, rows: times.length, bins, values: values.subarray(0, times.length * bins), timeText, timesMs: Float64Array.from(times), zoned: zoned!, edgesUm: binsOf.edges, factor: binsOf.dNdlogD, ...(table.humidityColumn ? { rh: Float64Array.from(rh) } : {}) }
  } catch (e) {
    if (e instanceof InputError) return { summary: refused(kind, name, e) }
    throw e
  }
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
