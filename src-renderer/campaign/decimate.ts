// The rows a chart draws for a visible time range: all of them when they are few for its width, else per bucket of
// rows the lowest and the highest value of each line (its envelope: no peak is lost), so a redraw costs about the
// plot's width in points, not the record's rows. A bucket with a gap (an inserted break, or a line's value missing)
// keeps it as null, so lines still stop across gaps. The series come as typed arrays (recordColumns: NaN where a
// line has no value); what is drawn is uPlot's arrays of numbers and nulls, about two points per pixel column.
//
// The buckets are aligned blocks of 2^k points whose envelopes are worked out once per record (`envelopes`: each
// level halves the one below, so all levels together hold as many values as the series), so a zoom or a pan reads
// about 2 × `buckets` blocks per line whatever the number of rows in view.
import type { RecordColumns, RecordSeriesName } from '../../src-core/index.ts'

export interface Shown {
  x: number[]
  /** The record row of each point (−1: a break or a bucket's envelope point of several rows, see `first`). */
  row: number[]
  values: Partial<Record<RecordSeriesName, (number | null)[]>>
}

/** One line's envelopes of aligned blocks of 2, 4, 8 … points: lowest, highest, and whether a point is missing. */
interface Level {
  min: Float64Array
  max: Float64Array
  /** 1 where the block holds a break or a missing value. */
  missing: Uint8Array
}

export interface Envelopes {
  /** levels[k − 1]: blocks of 2^k points. */
  lines: Partial<Record<RecordSeriesName, Level[]>>
  /** Per level: 1 where the block holds an inserted break. */
  breaks: Uint8Array[]
}

/** Every level of `keys`' envelopes (about one pass over each series). */
export function envelopes(s: RecordColumns, keys: readonly RecordSeriesName[]): Envelopes {
  const n = s.x.length
  const out: Envelopes = { lines: {}, breaks: [] }
  let below = new Uint8Array(n)
  for (let i = 0; i < n; i++) below[i] = s.row[i] < 0 ? 1 : 0
  for (let m = Math.ceil(n / 2); n > 1 && below.length > 1; m = Math.ceil(m / 2)) {
    const level = new Uint8Array(m)
    for (let i = 0; i < m; i++) level[i] = below[2 * i] | (below[2 * i + 1] ?? 0)
    out.breaks.push(level)
    below = level
    if (m === 1) break
  }
  const row = s.row
  for (const k of keys) {
    const v = s.values[k]
    const levels: Level[] = []
    if (out.breaks.length === 0) {
      out.lines[k] = levels
      continue
    }
    // blocks of 2 straight from the points (a point: its value as lowest and highest, or missing; a NaN is missing
    // with lowest Infinity and highest −Infinity), then each level from the one below
    const m1 = out.breaks[0].length
    let min = new Float64Array(m1)
    let max = new Float64Array(m1)
    let missing = new Uint8Array(m1)
    for (let i = 0; i < m1; i++) {
      const j = 2 * i
      const a = v[j]
      const aNone = a !== a
      const aMin = aNone ? Infinity : a
      const aMax = aNone ? -Infinity : a
      const aGap = aNone || row[j] < 0 ? 1 : 0
      if (j + 1 < n) {
        const b = v[j + 1]
        const bNone = b !== b
        const bMin = bNone ? Infinity : b
        const bMax = bNone ? -Infinity : b
        min[i] = aMin < bMin ? aMin : bMin
        max[i] = aMax > bMax ? aMax : bMax
        missing[i] = aGap | (bNone || row[j + 1] < 0 ? 1 : 0)
      } else (min[i] = aMin), (max[i] = aMax), (missing[i] = aGap)
    }
    levels.push({ min, max, missing })
    for (const br of out.breaks.slice(1)) {
      const m = br.length
      const lo = new Float64Array(m)
      const hi = new Float64Array(m)
      const gap = new Uint8Array(m)
      for (let i = 0; i < m; i++) {
        const j = 2 * i
        if (j + 1 < min.length) {
          const a = min[j]
          const b = min[j + 1]
          lo[i] = a < b ? a : b
          const c = max[j]
          const d = max[j + 1]
          hi[i] = c > d ? c : d
          gap[i] = missing[j] | missing[j + 1]
        } else (lo[i] = min[j]), (hi[i] = max[j]), (gap[i] = missing[j])
      }
      levels.push({ min: lo, max: hi, missing: gap })
      min = lo
      max = hi
      missing = gap
    }
    out.lines[k] = levels
  }
  return out
}

/** First index with x ≥ t (or, `after`, x > t): binary search. */
function bound(x: Float64Array, t: number, after = false): number {
  let lo = 0
  let hi = x.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (x[mid] < t || (after && x[mid] === t)) lo = mid + 1
    else hi = mid
  }
  return lo
}

/**
 * The points of `keys` between x = lo and x = hi (one point beyond each end, so lines reach the edges), at most
 * about 2 × `buckets` of them (blocks of the smallest power of two that keeps them so).
 */
export function decimate(s: RecordColumns, keys: readonly RecordSeriesName[], lo: number, hi: number, buckets: number, env: Envelopes): Shown {
  const a = Math.max(0, bound(s.x, lo) - 1)
  const b = Math.min(s.x.length, bound(s.x, hi, true) + 1)
  const n = b - a
  const out: Shown = { x: [], row: [], values: {} }
  for (const k of keys) out.values[k] = []
  if (n <= 2 * buckets) {
    out.x = Array.from(s.x.subarray(a, b))
    out.row = Array.from(s.row.subarray(a, b))
    for (const k of keys) out.values[k] = Array.from(s.values[k].subarray(a, b), (y) => (y === y ? y : null))
    return out
  }
  // blocks of 2^level points, level ≥ 1, at most about `buckets` of them in [a, b)
  const level = Math.min(env.breaks.length, Math.max(1, Math.ceil(Math.log2(n / Math.max(1, buckets - 1)))))
  const size = 2 ** level
  const first = Math.floor(a / size)
  const last = Math.ceil(b / size)
  const lines = keys.map((k) => ({ level: env.lines[k]![level - 1], col: out.values[k]! }))
  for (let blk = first; blk < last; blk++) {
    const start = blk * size
    const end = Math.min(s.x.length, start + size)
    out.x.push(s.x[start], s.x[end - 1])
    out.row.push(-1, -1)
    for (const { level: lv, col } of lines) {
      const min = lv.min[blk]
      if (min === Infinity) col.push(null, null)
      else if (lv.missing[blk]) col.push(min, null) // the line stops in this bucket
      else col.push(min, lv.max[blk])
    }
  }
  return out
}
