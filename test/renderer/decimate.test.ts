// The station record's charts draw at most about two points per pixel column (src-renderer/campaign/decimate.ts):
// the envelope of each line (its lowest and highest value in each bucket of rows) is kept, and gaps stay gaps.
import { describe, expect, it } from 'vitest'
import type { RecordSeries } from '../../src-core/index.ts'
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

const decimate = (s: RecordSeries, keys: ['ext'], lo: number, hi: number, buckets: number) => decimateWith(s, keys, lo, hi, buckets, envelopes(s, keys))

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
    const env = envelopes(s, ['ext'])
    for (const [lo, hi, buckets] of [[-Infinity, Infinity, 400], [300 * 1234, 300 * 9876, 250], [300 * 17, 300 * 2900, 120]] as const) {
      const d = decimateWith(s, ['ext'], lo, hi, buckets, env)
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
})
