import { describe, expect, it } from 'vitest'
import { erf, erfc, InputError, standardNormalBelow, twoSidedNormalQuantile } from '../../src-core/index.ts'

/** Composite Simpson rule for ∫_a^b f, n even. */
function simpson(f: (t: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n
  let s = f(a) + f(b)
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h)
  return (s * h) / 3
}

describe('erf and erfc', () => {
  it('match handbook values (Abramowitz & Stegun, Handbook of Mathematical Functions, table 7.1)', () => {
    const table: [number, number][] = [
      [0.1, 0.1124629160182849],
      [0.5, 0.5204998778130465],
      [1.0, 0.8427007929497149],
      [1.5, 0.9661051464753108],
      [2.0, 0.9953222650189527]
    ]
    for (const [x, v] of table) {
      expect(Math.abs(erf(x) - v)).toBeLessThan(4e-16)
      expect(Math.abs(erf(-x) + v)).toBeLessThan(4e-16) // erf is odd (A&S 7.1.9)
    }
  })

  it('erfc keeps relative accuracy in the tail (values from memory, cross-checked by integration below)', () => {
    const tail: [number, number][] = [
      [2, 4.677734981047266e-3],
      [3, 2.209049699858544e-5],
      [4, 1.541725790028002e-8],
      [5, 1.537459794428035e-12]
    ]
    for (const [x, v] of tail) expect(Math.abs(erfc(x) / v - 1)).toBeLessThan(1e-13)
  })

  it('equals (2/√π)∫ exp(−t²) dt by numerical integration (definition, A&S 7.1.1–7.1.2)', () => {
    const g = (t: number) => (2 / Math.sqrt(Math.PI)) * Math.exp(-t * t)
    for (const x of [0.05, 0.3, 0.7, 1.2, 1.99, 2.01, 2.7]) {
      expect(Math.abs(erf(x) - simpson(g, 0, x, 2000))).toBeLessThan(1e-14)
    }
    for (const x of [0.3, 1, 2.5, 4, 6]) {
      expect(Math.abs(erfc(x) / simpson(g, x, x + 10, 80000) - 1)).toBeLessThan(1e-11)
    }
  })

  it('erf + erfc = 1, limits and the normal distribution (A&S 7.1.2, 26.2.29 from memory)', () => {
    for (const x of [-3, -0.6, 0, 0.4, 0.49, 0.51, 1.7, 2.3, 8]) expect(Math.abs(erf(x) + erfc(x) - 1)).toBeLessThan(2e-15)
    expect(erf(0)).toBe(0)
    expect(erf(Infinity)).toBe(1)
    expect(erf(-Infinity)).toBe(-1)
    expect(erfc(-Infinity)).toBe(2)
    expect(erfc(40)).toBe(0)
    // Φ(1.96) ≈ 0.975 (standard normal table, from memory)
    expect(standardNormalBelow(1.96)).toBeCloseTo(0.9750021, 6)
    // two-sided 5 % point z = 1.959964 (standard normal table, from memory)
    expect(twoSidedNormalQuantile(0.05)).toBeCloseTo(1.959964, 5)
  })

  it('refuses NaN instead of returning it', () => {
    expect(() => erf(NaN)).toThrow(InputError)
    expect(() => erfc(NaN)).toThrow(/not a number/)
  })
})
