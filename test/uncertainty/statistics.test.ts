// The statistics layer of the uncertainty runs, checked against closed forms and published values.
import { describe, expect, it } from 'vitest'
import {
  histogramOf,
  normalCdf,
  normalQuantile,
  pearsonCorrelation,
  probabilityPositive,
  quantileSorted,
  randomPermutation,
  ranksOf,
  spearmanRankCorrelation,
  stoppingStandardError,
  summarizeValues,
  Xoshiro128
} from '../../src-core/index.ts'

/** n standard normal variates from the seeded generator (inverse-CDF method). */
function normals(n: number, seed: number, stream = 0): Float64Array {
  const g = new Xoshiro128(seed, 0, stream)
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) out[i] = normalQuantile(g.nextUniform())
  return out
}

describe('random numbers', () => {
  it('the normal quantile inverts Φ and matches published quantiles', () => {
    // published values (standard normal tables): Φ⁻¹(0.975) = 1.959963984540054, Φ⁻¹(0.95) = 1.6448536269514722
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 12)
    expect(normalQuantile(0.95)).toBeCloseTo(1.6448536269514722, 12)
    expect(normalQuantile(0.5)).toBe(0)
    // closed form: Φ⁻¹(Φ(x)) = x, across the central region and both tails (Acklam's regions)
    for (const x of [-7, -3.2, -1, -0.1, 0.3, 1.7, 2.5]) expect(normalQuantile(normalCdf(x))).toBeCloseTo(x, 9)
  })

  it('repeats exactly for the same (seed, draw) and differs otherwise', () => {
    const seq = (seed: number, draw: number) => {
      const g = new Xoshiro128(seed, draw)
      return Array.from({ length: 8 }, () => g.nextUint32())
    }
    expect(seq(1, 5)).toEqual(seq(1, 5))
    expect(seq(1, 5)).not.toEqual(seq(1, 6))
    expect(seq(1, 5)).not.toEqual(seq(2, 5))
  })

  it('gives uniform numbers with mean 1/2 and variance 1/12 (closed form)', () => {
    const g = new Xoshiro128(7)
    const n = 40000
    let s = 0
    let s2 = 0
    let outside = 0
    for (let i = 0; i < n; i++) {
      const u = g.nextUniform()
      if (!(u > 0 && u < 1)) outside++
      s += u
      s2 += u * u
    }
    const mean = s / n
    const variance = s2 / n - mean * mean
    expect(outside).toBe(0)
    // 4 standard errors: sd of the mean is √(1/12 / n)
    expect(Math.abs(mean - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n))
    expect(variance).toBeCloseTo(1 / 12, 2)
  })

  it('permutes every index exactly once', () => {
    const p = randomPermutation(500, new Xoshiro128(3))
    expect([...p].sort((a, b) => a - b)).toEqual(Array.from({ length: 500 }, (_, i) => i))
  })
})

describe('summaries', () => {
  it('quantiles interpolate between order statistics (Hyndman & Fan definition 7, common practice)', () => {
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5)
    expect(quantileSorted([10, 20, 30, 40, 50], 0.05)).toBeCloseTo(12, 12)
  })

  it('a linear function of a normal input has the closed-form mean, sd and 5–95 % range', () => {
    // y = 3 − 2 z: mean 3, sd 2, 5 % and 95 % points 3 ∓ 1.6449·2 (closed form)
    const z = normals(20000, 11)
    const y = z.map((v) => 3 - 2 * v)
    const s = summarizeValues(y)
    const se = 2 / Math.sqrt(y.length)
    expect(Math.abs(s.mean - 3)).toBeLessThan(4 * se)
    expect(s.sd).toBeCloseTo(2, 1)
    expect(s.median).toBeCloseTo(3, 1)
    expect(s.p05).toBeCloseTo(3 - 2 * 1.6448536, 1)
    expect(s.p95).toBeCloseTo(3 + 2 * 1.6448536, 1)
    expect(s.histogram.counts.reduce((a, b) => a + b, 0)).toBe(y.length)
    expect(s.histogram.edges.length).toBe(s.histogram.counts.length + 1)
    expect(s.histogram.edges[0]).toBe(s.min)
    expect(s.histogram.edges[s.histogram.edges.length - 1]).toBe(s.max)
  })

  it('a histogram of identical values is one bin holding them all', () => {
    expect(histogramOf([2, 2, 2])).toEqual({ edges: [2, 2], counts: [3] })
  })

  it('refuses a non-finite draw instead of summarising it', () => {
    expect(() => summarizeValues([1, NaN, 2])).toThrow(/draw 1/)
  })

  it('P(positive) has the binomial standard error √(p(1−p)/n) (closed form)', () => {
    const values = Array.from({ length: 100 }, (_, i) => (i < 30 ? 1 : -1))
    const p = probabilityPositive(values)
    expect(p.probability).toBe(0.3)
    expect(p.standard_error).toBeCloseTo(Math.sqrt((0.3 * 0.7) / 100), 15)
    // Laplace's rule for the stopping error does not vanish when no draw is positive
    expect(stoppingStandardError(0, 100)).toBeGreaterThan(0)
  })
})

describe('Spearman rank correlation', () => {
  it('averages tied ranks (common practice)', () => {
    expect(Array.from(ranksOf([5, 1, 3, 3]))).toEqual([4, 1, 2.5, 2.5])
  })

  it('is 1 for any increasing transform and −1 for a decreasing one', () => {
    const x = normals(300, 2)
    expect(spearmanRankCorrelation(x, x.map((v) => Math.exp(3 * v)))).toBeCloseTo(1, 12)
    expect(spearmanRankCorrelation(x, x.map((v) => -(v ** 3)))).toBeCloseTo(-1, 12)
  })

  it('for a bivariate normal with correlation r is (6/π) arcsin(r/2) (Pearson 1907, closed form)', () => {
    const n = 20000
    const a = normals(n, 5, 0)
    const b = normals(n, 5, 1)
    const r = 0.6
    const y = a.map((v, i) => r * v + Math.sqrt(1 - r * r) * b[i])
    expect(pearsonCorrelation(a, y)!).toBeCloseTo(r, 1)
    // sampling sd of ρ_s is about 1/√n ≈ 0.007; allow 0.03
    expect(Math.abs(spearmanRankCorrelation(a, y)! - (6 / Math.PI) * Math.asin(r / 2))).toBeLessThan(0.03)
  })

  it('is null (not NaN) when an input does not vary', () => {
    expect(spearmanRankCorrelation([1, 1, 1], [1, 2, 3])).toBeNull()
  })
})
