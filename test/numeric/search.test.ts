// lastAtOrBelow against a linear scan (its definition), on sorted arrays with repeats, at and between the values.
import { describe, expect, it } from 'vitest'
import { lastAtOrBelow } from '../../src-core/index.ts'

/** The definition, by a scan from the end. */
function scan(a: number[], x: number, count = a.length): number {
  for (let i = count - 1; i >= 0; i--) if (a[i] <= x) return i
  return -1
}

describe('lastAtOrBelow', () => {
  it('agrees with a linear scan at, between and beyond the values, with repeats and a shortened count', () => {
    const arrays = [[], [1], [1, 2], [0, 1, 1, 1, 4, 9], [-3, -3, 0.5, 2, 2, 7, 10, 10]]
    for (const a of arrays) {
      const probes = [-Infinity, -5, ...a, ...a.map((v) => v + 0.25), ...a.map((v) => v - 0.25), 100, Infinity]
      for (const x of probes) {
        expect(lastAtOrBelow(a, x), `${x} in [${a}]`).toBe(scan(a, x))
        if (a.length > 1) expect(lastAtOrBelow(a, x, a.length - 1)).toBe(scan(a, x, a.length - 1))
      }
    }
  })
  it('finds nothing for NaN', () => {
    expect(lastAtOrBelow([1, 2, 3], NaN)).toBe(-1)
  })
})
