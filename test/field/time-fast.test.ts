// The plain ISO 8601 reader (readPlainIso, the sizer reader's per-row fast path) against the general date
// reader on the same cells: where it answers, it answers exactly as the general path does (same ISO text, same
// milliseconds); where it does not (other forms, impossible dates and times), the general path decides. The
// general path is reached with a leading space, which the plain form never has and readDateTime trims.
import { describe, expect, it } from 'vitest'
import { readDateTime, readPlainIso } from '../../src-core/index.ts'

/** A small deterministic generator (Park & Miller 1988 minimal standard), so the cells are the same every run. */
function lcg(seed: number) {
  let s = seed
  return (n: number) => {
    s = (s * 48271) % 2147483647
    return s % n
  }
}
const pad = (v: number, w: number) => String(v).padStart(w, '0')

function cells(): string[] {
  const r = lcg(12345)
  const out: string[] = []
  for (let i = 0; i < 20000; i++) {
    const y = r(5) === 0 ? [1000, 1900, 2000, 2024, 2100, 999, 2023][r(7)] : 1000 + r(2000)
    const mo = r(10) === 0 ? r(14) : 1 + r(12)
    const d = r(8) === 0 ? [0, 28, 29, 30, 31, 32][r(6)] : 1 + r(28)
    const h = r(10) === 0 ? [23, 24, 25][r(3)] : r(24)
    const mi = r(12) === 0 ? [59, 60][r(2)] : r(60)
    const s = r(12) === 0 ? [59, 60][r(2)] : r(60)
    const frac = ['', '', '.000', '.123', '.999', '.5', '.1234'][r(7)]
    const zone = ['', 'Z', 'Z', '+02:00', 'z'][r(5)]
    const sep = ['T', 'T', ' ', '  ', 't'][r(5)]
    let cell = `${pad(y, 4)}-${pad(mo, 2)}-${pad(d, 2)}${sep}${pad(h, 2)}:${pad(mi, 2)}:${pad(s, 2)}${frac}${zone}`
    if (r(20) === 0) cell = cell.replace(/\d/, 'x')
    if (r(30) === 0) cell = cell.replace('-', '/')
    out.push(cell)
  }
  return out
}

describe('readPlainIso: the same answers as the general date reader', () => {
  for (const zone of [undefined, 0, 120, -330]) {
    it(`default zone ${zone}`, () => {
      let answered = 0
      for (const cell of cells()) {
        const general = readDateTime(' ' + cell, undefined, 'ymd', zone)
        const fast = readPlainIso(cell, zone)
        // every valid cell of the plain form (hours below 24, seconds below 60, a year from 1000) is answered
        const m = /^(\d{4})-\d{2}-\d{2}[T ](\d{2}):\d{2}:(\d{2})(\.\d{3})?Z?$/.exec(cell)
        if (general && m && +m[1] >= 1000 && +m[2] < 24 && +m[3] < 60) expect(fast, cell).toBeDefined()
        if (fast === undefined) continue
        answered++
        expect(fast, cell).toEqual(general)
        // and readDateTime itself gives the same through its fast path
        expect(readDateTime(cell, undefined, 'ymd', zone), cell).toEqual(general)
      }
      expect(answered).toBeGreaterThan(1000)
    })
  }

  it('leaves to the general path what it does not read: 24:00, a leap second, other fractions, zones, years before 1000', () => {
    for (const cell of ['2024-01-01T24:00:00', '2016-12-31T23:59:60Z', '2024-01-01T00:00:00.5Z', '2024-01-01T00:00:00+01:00', '0999-01-01T00:00:00Z', '2024-01-01T00:00']) {
      expect(readPlainIso(cell, undefined), cell).toBeUndefined()
    }
    // and refuses nothing the general path reads: these are still read, by it
    expect(readDateTime('2024-01-01T24:00:00', undefined, 'ymd', undefined)?.iso).toBe('2024-01-02T00:00:00')
    expect(readDateTime('2024-01-01T00:00:00+01:00', undefined, 'ymd', undefined)?.iso).toBe('2024-01-01T00:00:00+01:00')
  })

  it('an impossible date is not read by either path', () => {
    for (const cell of ['2023-02-29T00:00:00Z', '2024-13-01T00:00:00Z', '2024-04-31T00:00:00Z', '1900-02-29T00:00:00Z']) {
      expect(readPlainIso(cell, undefined), cell).toBeUndefined()
      expect(readDateTime(cell, undefined, 'ymd', undefined), cell).toBeUndefined()
    }
    expect(readPlainIso('2000-02-29T00:00:00Z', undefined)?.iso).toBe('2000-02-29T00:00:00Z') // 2000 is a leap year (Gregorian rule)
  })
})
