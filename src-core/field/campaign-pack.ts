/**
 * What one reader of a campaign's files hands another (the app reads them in two workers): a sizer file's part and
 * a measured file's records packed into a few typed arrays and one text, so that they cross between threads as
 * transferred buffers rather than as a structured clone of a hundred thousand objects. Unpacked, they are what was
 * packed: the same numbers, bit for bit.
 */
import type { CampaignFileSummary, ReadInstrument, SizerPart } from './campaign-read.ts'
import type { OpticalHeader, OpticalRecord } from './optical-file.ts'

/** A sizer part packed: its arrays as they are, the time texts joined by line breaks (a time stamp holds none). */
export interface PackedSizerPart extends Omit<SizerPart, 'timeText'> {
  timeText: string
}

/** A measured file's records packed: per record its line, time, ms, zone form, values (row after row) and humidity. */
export interface PackedInstrument {
  summary: CampaignFileSummary
  header: OpticalHeader
  lines: Float64Array
  times: string
  ms: Float64Array
  zoned: Uint8Array
  values: Float64Array
  /** 1 where a record carries a humidity (`rh`), and its value. */
  hasRh: Uint8Array
  rh: Float64Array
}

/** The buffers to transfer with a packed part or file (each once). */
export function packedBuffers(p: PackedSizerPart | PackedInstrument): ArrayBuffer[] {
  const arrays = 'end' in p ? [p.values, p.timesMs, p.rh] : [p.lines, p.ms, p.zoned, p.values, p.hasRh, p.rh]
  return [...new Set(arrays.filter((a) => a !== undefined).map((a) => a!.buffer as ArrayBuffer))]
}

export function packSizerPart(p: SizerPart): PackedSizerPart {
  // the part's own rows only (its buffer may have room beyond them)
  const values = p.values.byteOffset === 0 && p.values.length === p.values.buffer.byteLength / 8 ? p.values : p.values.slice()
  return { ...p, values, timeText: p.timeText.join('\n') }
}

export function unpackSizerPart(p: PackedSizerPart): SizerPart {
  return { ...p, timeText: p.rows === 0 ? [] : p.timeText.split('\n') }
}

export function packInstrument(r: ReadInstrument): PackedInstrument {
  const n = r.records.length
  const width = r.header.channels.length
  const lines = new Float64Array(n)
  const ms = new Float64Array(n)
  const zoned = new Uint8Array(n)
  const values = new Float64Array(n * width)
  const hasRh = new Uint8Array(n)
  const rh = new Float64Array(n)
  r.records.forEach((x, i) => {
    lines[i] = x.line
    ms[i] = x.ms
    zoned[i] = x.zoned ? 1 : 0
    values.set(x.values, i * width)
    if (x.rh !== undefined) (hasRh[i] = 1), (rh[i] = x.rh)
  })
  return { summary: r.summary, header: r.header, lines, times: r.records.map((x) => x.time).join('\n'), ms, zoned, values, hasRh, rh }
}

export function unpackInstrument(p: PackedInstrument): ReadInstrument {
  const n = p.ms.length
  const width = p.header.channels.length
  const times = n === 0 ? [] : p.times.split('\n')
  const records: OpticalRecord[] = new Array(n)
  for (let i = 0; i < n; i++) {
    const values = p.values.subarray(i * width, (i + 1) * width)
    const base = { line: p.lines[i], time: times[i], ms: p.ms[i], zoned: p.zoned[i] === 1, values }
    records[i] = p.hasRh[i] ? { ...base, rh: p.rh[i] } : base
  }
  return { summary: p.summary, header: p.header, records }
}
