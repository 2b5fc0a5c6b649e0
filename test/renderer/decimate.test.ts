// The station record's charts draw at most about two points per pixel column (src-renderer/campaign/decimate.ts):
// the envelope of each line (its lowest and highest value in each bucket of rows) is kept, and gaps stay gaps.
import { describe, expect, it } from 'vitest'
import type { RecordColumns, RecordSeries } from '../../src-core/index.ts'
import { decimate as decimateWith, envelopes } from '../../src-renderer/campaign/decimate.ts'

/** A record's series of n rows, one line `ext` = f(i), with a break (null) after row `gapAfter`. */
function series(n: number, f: (i: number) => number | null, gapAfter = -1): RecordSeries {
  const s = { x: [] as number[], row: [] as number[], values: { ext: [] as (number | null)[] } } as unknown as RecordSeries
  for (let i = 0; i < n; i++) {
    s.x.push(i * 300)
    s.row.push(i)
    s.values.ext.push(f(i))
    if (i === gapAfter) {
      s.x.push(i * 300 + 150)
      s.row.push(-1)
      s.values.ext.push(null)
    }
  }
  return s
}

/** The series as the charts keep them (recordColumns: typed arrays, NaN for null). */
const cols = (s: RecordSeries): RecordColumns => ({ x: Float64Array.from(s.x), row: Int32Array.from(s.row), values: { ext: Float64Array.from(s.values.ext, (y) => y ?? NaN) } }) as unknown as RecordColumns

const decimate = (s: RecordSeries, keys: ['ext'], lo: number, hi: number, buckets: number) => decimateWith(cols(s), keys, lo, hi, buckets, envelopes(cols(s), keys))

describe('decimating a long record for drawing', () => {
  it('passes a range that fits the width through unchanged', () => {
    const s = series(50, (i) => i)
    const d = decimate(s, ['ext'], -Infinity, Infinity, 100)
    expect(d.x).toEqual(s.x)
    expect(d.values.ext).toEqual(s.values.ext)
  })

  it('keeps every peak: the highest and lowest value of the range survive, with about two points a bucket', () => {
    const s = series(100_000, (i) => Math.sin(i / 10) + (i === 61_234 ? 50 : 0) - (i === 7 ? 50 : 0))
    const d = decimate(s, ['ext'], -Infinity, Infinity, 500)
    expect(d.x.length).toBeLessThanOrEqual(2 * 500 + 2)
    const v = d.values.ext!.filter((y): y is number => y !== null)
    // independent check: the extremes of the whole line, computed here
    expect(Math.max(...v)).toBe(Math.max(...(s.values.ext as number[])))
    expect(Math.min(...v)).toBe(Math.min(...(s.values.ext as number[])))
  })

  it('keeps a gap as a break, and only the visible range (one point beyond each end)', () => {
    const s = series(100_000, () => 1, 50_000)
    const d = decimate(s, ['ext'], -Infinity, Infinity, 300)
    expect(d.values.ext!.some((y) => y === null)).toBe(true)
    const part = decimate(s, ['ext'], 1000 * 300, 1010 * 300, 300)
    expect(part.x[0]).toBe(999 * 300)
    expect(part.x[part.x.length - 1]).toBe(1011 * 300)
  })

  it('gives each bucket the lowest and highest value of the rows it spans, at any zoom (a scan of those rows)', () => {
    const s = series(12_345, (i) => (i % 997 === 5 ? null : Math.sin(i / 7) * Math.cos(i / 131)), 6000)
    const env = envelopes(cols(s), ['ext'])
    for (const [lo, hi, buckets] of [[-Infinity, Infinity, 400], [300 * 1234, 300 * 9876, 250], [300 * 17, 300 * 2900, 120]] as const) {
      const d = decimateWith(cols(s), ['ext'], lo, hi, buckets, env)
      expect(d.x.length).toBeLessThanOrEqual(2 * buckets + 2)
      for (let p = 0; p < d.x.length; p += 2) {
        // the rows of this bucket, found by their times
        const ys = s.x.flatMap((x, i) => (x >= d.x[p] && x <= d.x[p + 1] ? [s.values.ext[i]] : []))
        const got = ys.filter((y): y is number => y !== null)
        if (got.length === 0) expect([d.values.ext![p], d.values.ext![p + 1]]).toEqual([null, null])
        else {
          expect(d.values.ext![p]).toBe(Math.min(...got))
          expect(d.values.ext![p + 1]).toBe(got.length < ys.length ? null : Math.max(...got))
        }
      }
    }
  })

  it('builds the envelopes the code before built (every level of the points copied first), bit for bit', () => {
    // the code before, kept here: level 0 a copy of the points, each level from the one below
    const before = (s: RecordSeries) => {
      const v = s.values.ext
      const n = v.length
      let min = new Float64Array(n)
      let max = new Float64Array(n)
      let missing = new Uint8Array(n)
      for (let i = 0; i < n; i++) {
        const y = v[i]
        if (y === null) (min[i] = Infinity), (max[i] = -Infinity), (missing[i] = 1)
        else (min[i] = y), (max[i] = y), (missing[i] = s.row[i] < 0 ? 1 : 0)
      }
      const levels: { min: Float64Array; max: Float64Array; missing: Uint8Array }[] = []
      for (let m = Math.ceil(n / 2); n > 1; m = Math.ceil(m / 2)) {
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
          }
          else (lo[i] = min[j]), (hi[i] = max[j]), (gap[i] = missing[j])
        }
        levels.push({ min: lo, max: hi, missing: gap })
        ;[min, max, missing] = [lo, hi, gap]
        if (m === 1) break
      }
      return levels
    }
    for (const n of [1, 2, 3, 7, 64, 1000, 12_345]) {
      const s = series(n, (i) => (i % 97 === 5 ? null : i % 13 === 0 ? -0 : i % 13 === 1 ? 0 : Math.sin(i / 7) * Math.cos(i / 131)), Math.floor(n / 2))
      const got = envelopes(cols(s), ['ext']).lines.ext!
      const want = before(s)
      expect(got.length).toBe(want.length)
      got.forEach((g, k) => {
        expect(new Uint8Array(g.min.buffer)).toEqual(new Uint8Array(want[k].min.buffer))
        expect(new Uint8Array(g.max.buffer)).toEqual(new Uint8Array(want[k].max.buffer))
        expect(g.missing).toEqual(want[k].missing)
      })
    }
  })
})
