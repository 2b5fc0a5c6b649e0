// The rows a chart draws for a visible time range: all of them when they are few for its width, else per bucket of
// rows the lowest and the highest value of each line (its envelope: no peak is lost), so a redraw costs about the
// plot's width in points, not the record's rows. A bucket with a gap (an inserted break, or a line's value missing)
// keeps it as null, so lines still stop across gaps.
import type { RecordSeries, RecordSeriesName } from '../../src-core/index.ts'

export interface Shown {
  x: number[]
  /** The record row of each point (−1: a break or a bucket's envelope point of several rows, see `first`). */
  row: number[]
  values: Partial<Record<RecordSeriesName, (number | null)[]>>
}

/** First index with x ≥ t (or, `after`, x > t): binary search. */
function bound(x: readonly number[], t: number, after = false): number {
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
 * about 2 × `buckets` of them.
 */
export function decimate(s: RecordSeries, keys: readonly RecordSeriesName[], lo: number, hi: number, buckets: number): Shown {
  const a = Math.max(0, bound(s.x, lo) - 1)
  const b = Math.min(s.x.length, bound(s.x, hi, true) + 1)
  const n = b - a
  const out: Shown = { x: [], row: [], values: {} }
  for (const k of keys) out.values[k] = []
  if (n <= 2 * buckets) {
    out.x = s.x.slice(a, b)
    out.row = s.row.slice(a, b)
    for (const k of keys) out.values[k] = s.values[k].slice(a, b)
    return out
  }
  const size = Math.ceil(n / buckets)
  for (let start = a; start < b; start += size) {
    const end = Math.min(b, start + size)
    let gap = false
    for (let i = start; i < end; i++) if (s.row[i] < 0) gap = true
    out.x.push(s.x[start], s.x[end - 1])
    out.row.push(end - start === 1 ? s.row[start] : -1, -1)
    for (const k of keys) {
      const v = s.values[k]
      let min = Infinity
      let max = -Infinity
      let missing = gap
      for (let i = start; i < end; i++) {
        const y = v[i]
        if (y === null) {
          missing = true
          continue
        }
        if (y < min) min = y
        if (y > max) max = y
      }
      const col = out.values[k]!
      if (min === Infinity) col.push(null, null)
      else if (missing) col.push(min, null) // the line stops in this bucket
      else col.push(min, max)
    }
  }
  return out
}
