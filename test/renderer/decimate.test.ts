// The station record's charts draw at most about two points per pixel column (src-renderer/campaign/decimate.ts):
// the envelope of each line (its lowest and highest value in each bucket of rows) is kept, and gaps stay gaps.
import { describe, expect, it } from 'vitest'
import type { RecordSeries } from '../../src-core/index.ts'
import { decimate } from '../../src-renderer/campaign/decimate.ts'

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
})
