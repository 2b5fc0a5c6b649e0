/**
 * One time base for instruments on their own clocks and intervals.
 *
 * Time stamps are ISO 8601 dates and times ("2026-06-01T10:05:00Z", "2026-06-01 10:05", with or without a zone).
 * A stamp without a zone is taken as written (a naive clock time) and stays without one in every output; stamps
 * with and without a zone cannot be mixed, since their offset is unknown.
 *
 * A time base is a list of steps [start, end) in milliseconds, ascending and not overlapping: a regular one
 * (`regularTimeBase`: steps of a fixed length on multiples of it, so 10-minute steps start at :00, :10, …) or
 * one step per record of another instrument (`stampTimeBase`). A `TimeAverager` puts each record into the step
 * that holds its time stamp and averages the records of a step value by value (plain arithmetic means, which
 * is right for concentrations). A step without records has no average: callers say so, never fill it.
 */
import { InputError } from '../errors.ts'
import { lastAtOrBelow } from '../numeric/index.ts'

/** A parsed time stamp: milliseconds (since 1970-01-01 in UTC, or in the naive clock) and whether a zone was given. */
export interface TimeStamp {
  ms: number
  zoned: boolean
}

const ISO = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?$/

/** An ISO 8601 date-time, or undefined when the text is not one (or names an impossible date or time). */
export function parseTimeStamp(text: string): TimeStamp | undefined {
  const m = ISO.exec(text.trim())
  if (!m) return undefined
  const [y, mo, d, h = '0', mi = '0', s = '0'] = m.slice(1, 7)
  const frac = m[7] ? Number(`0.${m[7]}`) * 1000 : 0
  const Y = Number(y)
  const M = Number(mo)
  const D = Number(d)
  const H = Number(h)
  const I = Number(mi)
  const S = Number(s)
  if (M < 1 || M > 12 || D < 1 || D > 31 || H > 24 || I > 59 || S > 60) return undefined
  let ms = Date.UTC(Y, M - 1, D, H, I, S) + frac
  const check = new Date(Date.UTC(Y, M - 1, D))
  if (check.getUTCDate() !== D) return undefined // 31 April, 29 February of a common year
  const zone = m[8]
  if (zone && zone !== 'Z' && zone !== 'z') {
    const sign = zone[0] === '-' ? -1 : 1
    const digits = zone.slice(1).replace(':', '')
    const oh = Number(digits.slice(0, 2))
    const om = digits.length > 2 ? Number(digits.slice(2)) : 0
    if (oh > 18 || om > 59) return undefined
    ms -= sign * (oh * 60 + om) * 60000
  }
  return { ms, zoned: zone !== undefined }
}

/**
 * `parseTimeStamp` of text[start, end) when it has the form YYYY-MM-DDTHH:MM:SS (or a space for the T), with Z or
 * no zone, and a day of the month up to 28: its milliseconds, the zone's presence in `zoned` (1 with Z, 0 without);
 * NaN for any other text (then parseTimeStamp reads it). The same numbers as parseTimeStamp, without its regular
 * expression and its Date (test/field/optical-fast.test.ts compares the two on every day of several years).
 */
export function plainStampMs(text: string, start: number, end: number): number {
  const len = end - start
  if (len !== 19 && len !== 20) return NaN
  if (len === 20 && text.charCodeAt(end - 1) !== 90) return NaN
  const sep = text.charCodeAt(start + 10)
  if (text.charCodeAt(start + 4) !== 45 || text.charCodeAt(start + 7) !== 45 || (sep !== 84 && sep !== 32) || text.charCodeAt(start + 13) !== 58 || text.charCodeAt(start + 16) !== 58) return NaN
  const Y = digits(text, start, 4)
  const M = digits(text, start + 5, 2)
  const D = digits(text, start + 8, 2)
  const H = digits(text, start + 11, 2)
  const I = digits(text, start + 14, 2)
  const S = digits(text, start + 17, 2)
  if (!(Y >= 0 && M >= 1 && M <= 12 && D >= 1 && D <= 28 && H <= 24 && I <= 59 && S <= 60)) return NaN
  return Date.UTC(Y, M - 1, D, H, I, S) + 0
}

/** The number written by n decimal digits at text[at]; NaN when one is not a digit. */
function digits(text: string, at: number, n: number): number {
  let v = 0
  for (let i = at; i < at + n; i++) {
    const c = text.charCodeAt(i) - 48
    if (c < 0 || c > 9) return NaN
    v = v * 10 + c
  }
  return v
}

/** ISO 8601 text of a time: "2026-06-01T10:05:00Z" (zoned, in UTC) or "2026-06-01T10:05:00" (naive). */
export function formatTimeStamp(ms: number, zoned: boolean): string {
  const iso = new Date(Math.round(ms)).toISOString() // YYYY-MM-DDTHH:MM:SS.sssZ
  const body = iso.endsWith('.000Z') ? iso.slice(0, 19) : iso.slice(0, 23)
  return zoned ? `${body}Z` : body
}

const DURATION = /^\s*(\d+(?:\.\d+)?)\s*(ms|s|sec|secs|seconds?|min|mins|minutes?|h|hr|hrs|hours?|d|days?)\s*$/i

/** A duration as people type it ("10min", "300 s", "1h", "1 day"), in ms. Throws InputError otherwise. */
export function parseDuration(text: string, where: string): number {
  const m = DURATION.exec(text)
  if (!m) throw new InputError(where, `"${text}" is not a duration`, 'Give a number and a unit, e.g. 10min, 300s, 1h or 1d.')
  const v = Number(m[1])
  const u = m[2].toLowerCase()
  const scale = u === 'ms' ? 1 : u.startsWith('s') ? 1000 : u.startsWith('m') ? 60000 : u.startsWith('h') ? 3600000 : 86400000
  const ms = v * scale
  if (!(ms >= 1000)) throw new InputError(where, `${text} is shorter than one second`, 'Give an averaging step of at least 1 s, e.g. 5min.')
  return ms
}

/** A duration in words: "10 min", "2 h", "90 s". */
export function formatDuration(ms: number): string {
  if (ms % 86400000 === 0) return `${ms / 86400000} d`
  if (ms % 3600000 === 0) return `${ms / 3600000} h`
  if (ms % 60000 === 0) return `${ms / 60000} min`
  return `${Number((ms / 1000).toPrecision(6))} s`
}

/**
 * An instrument's typical interval, ms: the median of the positive spacings between its time stamps (taken in
 * order of time), or undefined with fewer than two distinct stamps. The median ignores the long spacings of gaps.
 */
export function typicalInterval(timesMs: ArrayLike<number>): number | undefined {
  const t = Float64Array.from(timesMs).sort()
  const gaps: number[] = []
  for (let i = 1; i < t.length; i++) if (t[i] > t[i - 1]) gaps.push(t[i] - t[i - 1])
  if (gaps.length === 0) return undefined
  gaps.sort((a, b) => a - b)
  const mid = gaps.length >> 1
  return gaps.length % 2 ? gaps[mid] : (gaps[mid - 1] + gaps[mid]) / 2
}

/** Steps [starts[k], ends[k]) in ms, ascending and not overlapping. */
export interface TimeBase {
  readonly starts: Float64Array
  readonly ends: Float64Array
}

/** Steps of `stepMs` on multiples of it (since 1970-01-01 00:00), from the one holding firstMs to the one holding lastMs. */
export function regularTimeBase(firstMs: number, lastMs: number, stepMs: number): TimeBase {
  if (!(stepMs > 0) || !Number.isFinite(firstMs) || !(lastMs >= firstMs)) throw new InputError('time base', `no steps from ${firstMs} to ${lastMs} every ${stepMs} ms`, 'Give a first time not after the last and a positive step.')
  const k0 = Math.floor(firstMs / stepMs)
  const k1 = Math.floor(lastMs / stepMs)
  const n = k1 - k0 + 1
  if (n > 5_000_000) throw new InputError('time base', `${n} steps of ${formatDuration(stepMs)} from the first to the last record`, 'Give a longer averaging step (--every), or check the time stamps.')
  const starts = new Float64Array(n)
  const ends = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    starts[k] = (k0 + k) * stepMs
    ends[k] = (k0 + k + 1) * stepMs
  }
  return { starts, ends }
}

/**
 * One step per time stamp (ascending): [t_k, t_k + interval), cut at the next stamp. The interval defaults to the
 * stamps' typical interval. For aligning other instruments to the rows of one sizer.
 */
export function stampTimeBase(timesMs: ArrayLike<number>, intervalMs?: number): TimeBase {
  const n = timesMs.length
  const dt = intervalMs ?? typicalInterval(timesMs)
  if (dt === undefined || !(dt > 0)) throw new InputError('time base', 'the interval of a single time stamp is unknown', 'Give the averaging interval.')
  const starts = new Float64Array(n)
  const ends = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    starts[k] = timesMs[k]
    if (k > 0 && !(starts[k] > starts[k - 1])) throw new InputError('time base', `time stamp ${k + 1} is not after the one before it`, 'Sort the rows by time and remove repeated stamps.')
    ends[k] = starts[k] + dt
    if (k > 0 && ends[k - 1] > starts[k]) ends[k - 1] = starts[k]
  }
  return { starts, ends }
}

/** The step holding t, or −1 (binary search). */
export function stepOf(base: TimeBase, t: number): number {
  const k = lastAtOrBelow(base.starts, t)
  return k >= 0 && t < base.ends[k] ? k : -1
}

/**
 * Sums of records per step, `width` values a record, in one Float64Array (steps × width): memory follows the
 * number of steps, not of records.
 */
export class TimeAverager {
  readonly base: TimeBase
  readonly width: number
  private readonly sums: Float64Array
  private readonly counts: Uint32Array
  private finished = false

  constructor(base: TimeBase, width: number) {
    this.base = base
    this.width = width
    this.sums = new Float64Array(base.starts.length * width)
    this.counts = new Uint32Array(base.starts.length)
  }

  /** Adds a record stamped t (ms); returns its step, or −1 when t is outside the base (the record is not used). */
  add(t: number, values: ArrayLike<number>): number {
    if (this.finished) throw new Error('TimeAverager.add after means()')
    const k = stepOf(this.base, t)
    if (k < 0) return -1
    const w = this.width
    const off = k * w
    for (let j = 0; j < w; j++) this.sums[off + j] += values[j]
    this.counts[k]++
    return k
  }

  /** Records in step k. */
  count(k: number): number {
    return this.counts[k]
  }

  /**
   * Turns the sums into means in place, once, and returns each step's mean as a view into them (no copy), or
   * undefined for a step without records. `add` must not be called afterwards.
   */
  means(): (Float64Array | undefined)[] {
    if (!this.finished) {
      for (let k = 0; k < this.counts.length; k++) {
        const c = this.counts[k]
        if (c > 1) for (let j = k * this.width; j < (k + 1) * this.width; j++) this.sums[j] /= c
      }
      this.finished = true
    }
    const out: (Float64Array | undefined)[] = []
    for (let k = 0; k < this.counts.length; k++) out.push(this.counts[k] > 0 ? this.sums.subarray(k * this.width, (k + 1) * this.width) : undefined)
    return out
  }

  /** The mean of step k into `out` (length width); false, and `out` untouched, when the step has no records. */
  mean(k: number, out: Float64Array): boolean {
    const c = this.counts[k]
    if (c === 0) return false
    const off = k * this.width
    const d = this.finished ? 1 : c
    for (let j = 0; j < this.width; j++) out[j] = this.sums[off + j] / d
    return true
  }
}
