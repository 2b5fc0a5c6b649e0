// The time base shared by the field instruments: ISO 8601 stamps (ISO 8601-1:2019, extended format), steps on
// multiples of the averaging interval, arithmetic means of the records inside each step, and no value for an
// empty step.
import { describe, expect, it } from 'vitest'
import { formatTimeStamp, parseDuration, parseTimeStamp, regularTimeBase, stampTimeBase, stepOf, TimeAverager, typicalInterval } from '../../src-core/index.ts'

const MIN = 60000

describe('time stamps (ISO 8601)', () => {
  it('reads zoned and naive forms; an offset moves the instant to UTC', () => {
    const z = parseTimeStamp('2026-06-01T10:05:00Z')!
    expect(z).toEqual({ ms: Date.UTC(2026, 5, 1, 10, 5, 0), zoned: true })
    expect(parseTimeStamp('2026-06-01T12:05:00+02:00')!.ms).toBe(z.ms)
    expect(parseTimeStamp('2026-06-01T05:35-0430')!.ms).toBe(z.ms)
    expect(parseTimeStamp('2026-06-01 10:05')).toEqual({ ms: z.ms, zoned: false })
    expect(parseTimeStamp('2026-06-01T10:05:00.250Z')!.ms).toBe(z.ms + 250)
  })

  it('refuses what is not a date-time or names an impossible one', () => {
    for (const t of ['', '01/06/2026 10:05', '2026-02-29T00:00Z', '2026-13-01', '2026-06-01T10:75', 'n/a']) expect(parseTimeStamp(t)).toBeUndefined()
    expect(parseTimeStamp('2024-02-29T00:00Z')).toBeDefined() // 2024 is a leap year
  })

  it('writes stamps back as ISO 8601, with Z only when the input had a zone', () => {
    const t = Date.UTC(2026, 5, 1, 10, 5, 0)
    expect(formatTimeStamp(t, true)).toBe('2026-06-01T10:05:00Z')
    expect(formatTimeStamp(t, false)).toBe('2026-06-01T10:05:00')
    expect(parseTimeStamp(formatTimeStamp(t + 125, true))!.ms).toBe(t + 125)
  })

  it('reads durations as people type them, and refuses others with the form to use', () => {
    expect(parseDuration('10min', '--every')).toBe(10 * MIN)
    expect(parseDuration('1 h', '--every')).toBe(60 * MIN)
    expect(parseDuration('300s', '--every')).toBe(5 * MIN)
    expect(() => parseDuration('ten minutes', '--every')).toThrow(/--every.*e\.g\. 10min/)
  })
})

describe('time base and averaging', () => {
  it('the typical interval is the median spacing, so gaps do not change it', () => {
    const t = [0, 1, 2, 3, 10, 11, 12].map((m) => m * MIN)
    expect(typicalInterval(t)).toBe(MIN)
    expect(typicalInterval([5])).toBeUndefined()
  })

  it('regular steps start on multiples of the step and hold their start, not their end', () => {
    const t0 = Date.UTC(2026, 5, 1, 10, 3)
    const base = regularTimeBase(t0, t0 + 21 * MIN, 10 * MIN)
    expect(Array.from(base.starts, (s) => formatTimeStamp(s, true))).toEqual(['2026-06-01T10:00:00Z', '2026-06-01T10:10:00Z', '2026-06-01T10:20:00Z'])
    expect(stepOf(base, Date.UTC(2026, 5, 1, 10, 10))).toBe(1)
    expect(stepOf(base, Date.UTC(2026, 5, 1, 10, 9, 59, 999))).toBe(0)
    expect(stepOf(base, Date.UTC(2026, 5, 1, 10, 30))).toBe(-1)
  })

  it('averages two clocks onto one base: arithmetic means of the records of each step; an empty step has no mean', () => {
    const base = regularTimeBase(0, 29 * MIN, 10 * MIN)
    const fast = new TimeAverager(base, 2)
    // one-minute records with value (minute, 2·minute), none from minute 10 to 19
    for (let m = 0; m < 30; m++) if (m < 10 || m >= 20) fast.add(m * MIN + 30000, [m, 2 * m])
    const out = new Float64Array(2)
    expect(fast.mean(0, out)).toBe(true)
    expect(Array.from(out)).toEqual([4.5, 9]) // mean of 0..9
    expect(fast.count(0)).toBe(10)
    out.fill(-1)
    expect(fast.mean(1, out)).toBe(false)
    expect(Array.from(out)).toEqual([-1, -1]) // untouched: never filled
    expect(fast.mean(2, out)).toBe(true)
    expect(out[0]).toBe(24.5)
    expect(fast.add(31 * MIN, [0, 0])).toBe(-1) // outside the base: not used
    // the same means as views, without copies; the empty step stays without one
    const views = fast.means()
    expect(Array.from(views[0]!)).toEqual([4.5, 9])
    expect(views[1]).toBeUndefined()
    expect(views[2]![1]).toBe(49)
    expect(fast.mean(0, out) && out[0]).toBe(4.5)
  })

  it('a base of one step per stamp (for aligning other instruments to a sizer) cuts each step at the next stamp', () => {
    const b = stampTimeBase([0, 5 * MIN, 10 * MIN, 30 * MIN])
    expect(Array.from(b.ends)).toEqual([5 * MIN, 10 * MIN, 15 * MIN, 35 * MIN])
    expect(() => stampTimeBase([0, 0], MIN)).toThrow(/not after/)
  })
})
