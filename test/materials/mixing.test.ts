import { describe, expect, it } from 'vitest'
import { MIXING_RULES, mixRefractiveIndices, type ComplexRefractiveIndex, type MixingRule } from '../../src-core/index.ts'
import { abs, add, c, div, eps, mul, scale, sub, thrownMessage, type C } from './helpers.ts'

// Test indices: water and black carbon at 550 nm (Hale & Querry 1973; Bond & Bergstrom 2006, from memory), dust-like.
const WATER = { n: 1.333, k: 2e-9 }
const BC = { n: 1.95, k: 0.79 }
const DUST = { n: 1.53, k: 0.008 }

function expectIndexClose(a: ComplexRefractiveIndex, b: ComplexRefractiveIndex, tol: number): void {
  expect(Math.abs(a.n - b.n)).toBeLessThanOrEqual(tol)
  expect(Math.abs(a.k - b.k)).toBeLessThanOrEqual(tol)
}

/** Bruggeman 1935 (Ann. Phys. 416:636) condition Σ f_j (ε_j − ε)/(ε_j + 2ε), evaluated on the test side. */
function bruggemanResidual(ms: ComplexRefractiveIndex[], f: number[], m: ComplexRefractiveIndex): number {
  const e = eps(m)
  let s: C = c(0)
  ms.forEach((mj, j) => {
    const ej = eps(mj)
    s = add(s, scale(f[j], div(sub(ej, e), add(ej, scale(2, e)))))
  })
  return abs(s)
}

describe('mixing rules: limits', () => {
  it.each(MIXING_RULES)('%s returns the pure component at f = 0 and f = 1 (definition of every rule)', (rule) => {
    expectIndexClose(mixRefractiveIndices([WATER, BC], [1, 0], rule), WATER, 1e-12)
    expectIndexClose(mixRefractiveIndices([WATER, BC], [0, 1], rule), BC, 1e-12)
    expectIndexClose(mixRefractiveIndices([BC, WATER, DUST], [0, 0, 1], rule), DUST, 1e-12)
  })

  it.each(MIXING_RULES)('%s gives back the common index when all components are the same (reduction)', (rule) => {
    expectIndexClose(mixRefractiveIndices([DUST, DUST, DUST], [0.2, 0.3, 0.5], rule), DUST, 1e-12)
  })

  it.each(MIXING_RULES)('%s keeps n > 0 and k >= 0 for absorbing mixtures at every fraction (passivity)', (rule) => {
    for (let i = 0; i <= 20; i++) {
      const f = i / 20
      const m = mixRefractiveIndices([WATER, BC], [1 - f, f], rule)
      expect(m.k).toBeGreaterThanOrEqual(0)
      expect(m.n).toBeGreaterThan(0)
    }
  })
})

describe('Maxwell Garnett', () => {
  it('agrees with its first-order expansion ε ≈ ε_h + 3 f ε_h (ε_i − ε_h)/(ε_i + 2ε_h) for small f (Bohren & Huffman 1983, §8.5, from memory)', () => {
    const f = 1e-4
    const eh = eps(WATER)
    const ei = eps(BC)
    const first = add(eh, scale(3 * f, div(mul(eh, sub(ei, eh)), add(ei, scale(2, eh)))))
    const mg = eps(mixRefractiveIndices([WATER, BC], [1 - f, f], 'maxwell-garnett'))
    // the first-order term itself is ~3e-4; the remainder is O(f²)
    expect(abs(sub(first, eh))).toBeGreaterThan(1e-4)
    expect(abs(sub(mg, first))).toBeLessThan(10 * f * f * abs(eh))
  })

  it('splitting one inclusion into two identical inclusions changes nothing (multi-inclusion form reduces to one)', () => {
    const one = mixRefractiveIndices([WATER, BC], [0.7, 0.3], 'maxwell-garnett')
    const two = mixRefractiveIndices([WATER, BC, BC], [0.7, 0.1, 0.2], 'maxwell-garnett')
    expectIndexClose(one, two, 1e-13)
  })

  it('matches the single-inclusion closed form ε_h (ε_i + 2ε_h + 2f(ε_i − ε_h)) / (ε_i + 2ε_h − f(ε_i − ε_h)) (Maxwell Garnett 1904)', () => {
    const f = 0.35
    const eh = eps(WATER)
    const ei = eps(BC)
    const d = sub(ei, eh)
    const num = add(add(ei, scale(2, eh)), scale(2 * f, d))
    const den = sub(add(ei, scale(2, eh)), scale(f, d))
    const expected = mul(eh, div(num, den))
    const got = eps(mixRefractiveIndices([WATER, BC], [1 - f, f], 'maxwell-garnett'))
    expect(abs(sub(got, expected))).toBeLessThan(1e-12)
  })
})

describe('Bruggeman', () => {
  it('is symmetric in its components (Bruggeman 1935: no host)', () => {
    const a = mixRefractiveIndices([WATER, BC], [0.6, 0.4], 'bruggeman')
    const b = mixRefractiveIndices([BC, WATER], [0.4, 0.6], 'bruggeman')
    expectIndexClose(a, b, 1e-13)
    const p1 = mixRefractiveIndices([WATER, BC, DUST], [0.5, 0.2, 0.3], 'bruggeman')
    const p2 = mixRefractiveIndices([DUST, WATER, BC], [0.3, 0.5, 0.2], 'bruggeman')
    const p3 = mixRefractiveIndices([BC, DUST, WATER], [0.2, 0.3, 0.5], 'bruggeman')
    expectIndexClose(p1, p2, 1e-11)
    expectIndexClose(p1, p3, 1e-11)
  })

  it('satisfies Σ f_j (ε_j − ε)/(ε_j + 2ε) = 0 for two and three components (Bruggeman 1935, Ann. Phys. 416:636)', () => {
    for (const f of [0.05, 0.3, 0.5, 0.8]) {
      const m2 = mixRefractiveIndices([WATER, BC], [1 - f, f], 'bruggeman')
      expect(bruggemanResidual([WATER, BC], [1 - f, f], m2)).toBeLessThan(1e-12)
    }
    const fr = [0.5, 0.2, 0.3]
    const m3 = mixRefractiveIndices([WATER, BC, DUST], fr, 'bruggeman')
    expect(bruggemanResidual([WATER, BC, DUST], fr, m3)).toBeLessThan(1e-10)
  })

  it('three components, two of them identical, equal the two-component result with merged fraction (reduction)', () => {
    const a = mixRefractiveIndices([WATER, BC], [0.55, 0.45], 'bruggeman')
    const b = mixRefractiveIndices([WATER, BC, BC], [0.55, 0.15, 0.3], 'bruggeman')
    expectIndexClose(a, b, 1e-10)
  })

  it('follows a continuous root from f = 0 to 1 (no branch jumps)', () => {
    let prev = mixRefractiveIndices([WATER, BC], [1, 0], 'bruggeman')
    for (let i = 1; i <= 200; i++) {
      const f = i / 200
      const m = mixRefractiveIndices([WATER, BC], [1 - f, f], 'bruggeman')
      expect(Math.hypot(m.n - prev.n, m.k - prev.k)).toBeLessThan(0.02)
      prev = m
    }
  })

  it('shows the percolation threshold at f = 1/3 for a highly conducting inclusion (Landauer 1952, J. Appl. Phys. 23:779, from memory)', () => {
    // ε₂ → ∞: below f = 1/3, ε → ε₁/(1 − 3f); above, ε → (3f − 1) ε₂ / 2 (limits of the Bruggeman quadratic)
    const host = { n: 1, k: 0 }
    const metal = { n: 100, k: 100 } // ε₂ = 20000i
    const below = eps(mixRefractiveIndices([host, metal], [0.8, 0.2], 'bruggeman'))
    expect(abs(sub(below, c(1 / (1 - 0.6))))).toBeLessThan(2e-3)
    const above = eps(mixRefractiveIndices([host, metal], [0.5, 0.5], 'bruggeman'))
    const e2 = eps(metal)
    expect(abs(sub(above, scale(0.25, e2))) / abs(scale(0.25, e2))).toBeLessThan(1e-3)
  })
})

describe('rules compared', () => {
  it('Wiener and Hashin–Shtrikman bounds: harmonic mean ≤ MG(low host) ≤ Bruggeman ≤ MG(high host) ≤ arithmetic mean, for real ε (Hashin & Shtrikman 1962, J. Appl. Phys. 33:3125; Aspnes 1982, Am. J. Phys. 50:704, from memory)', () => {
    const lo = { n: 1.33, k: 0 }
    const hi = { n: 2.4, k: 0 }
    const e1 = lo.n ** 2
    const e2 = hi.n ** 2
    for (const f of [0.1, 0.3, 0.5, 0.7, 0.9]) {
      const harmonic = 1 / ((1 - f) / e1 + f / e2)
      const arithmetic = (1 - f) * e1 + f * e2
      const mgLow = mixRefractiveIndices([lo, hi], [1 - f, f], 'maxwell-garnett').n ** 2
      const mgHigh = mixRefractiveIndices([hi, lo], [f, 1 - f], 'maxwell-garnett').n ** 2
      const br = mixRefractiveIndices([lo, hi], [1 - f, f], 'bruggeman').n ** 2
      const va = mixRefractiveIndices([lo, hi], [1 - f, f], 'volume-average-permittivity').n ** 2
      expect(harmonic).toBeLessThan(mgLow)
      expect(mgLow).toBeLessThan(br)
      expect(br).toBeLessThan(mgHigh)
      expect(mgHigh).toBeLessThan(arithmetic)
      expect(va).toBeCloseTo(arithmetic, 12)
    }
  })

  it('all rules agree when the indices are close, and disagree only at second order in the contrast (Taylor expansion)', () => {
    function spread(delta: number): number {
      const a = { n: 1.5, k: 0.001 }
      const b = { n: 1.5 + delta, k: 0.001 + delta / 10 }
      const ms = MIXING_RULES.map((r: MixingRule) => mixRefractiveIndices([a, b], [0.7, 0.3], r))
      let s = 0
      for (const m of ms) for (const o of ms) s = Math.max(s, Math.hypot(m.n - o.n, m.k - o.k))
      return s
    }
    expect(spread(0.02)).toBeLessThan(1e-4)
    const ratio = spread(0.01) / spread(0.005)
    expect(ratio).toBeGreaterThan(3.5)
    expect(ratio).toBeLessThan(4.5)
  })
})

describe('input checks', () => {
  it('fractions that do not sum to 1 within 1e-6 throw InputError naming the fractions', () => {
    const msg = thrownMessage(() => mixRefractiveIndices([WATER, BC], [0.5, 0.4], 'bruggeman'))
    expect(msg).toContain('0.5, 0.4')
    // within 1e-6 is accepted
    mixRefractiveIndices([WATER, BC], [0.5, 0.5 + 5e-7], 'bruggeman')
  })

  it('negative, NaN or missing fractions, bad indices and unknown rules throw InputError', () => {
    thrownMessage(() => mixRefractiveIndices([WATER, BC], [1.2, -0.2], 'volume-average'))
    thrownMessage(() => mixRefractiveIndices([WATER, BC], [Number.NaN, 1], 'volume-average'))
    thrownMessage(() => mixRefractiveIndices([WATER, BC], [1], 'volume-average'))
    thrownMessage(() => mixRefractiveIndices([WATER, { n: 1.5, k: -0.1 }], [0.5, 0.5], 'maxwell-garnett'))
    thrownMessage(() => mixRefractiveIndices([], [], 'bruggeman'))
    expect(thrownMessage(() => mixRefractiveIndices([WATER, BC], [0.5, 0.5], 'lorentz-lorenz' as MixingRule))).toContain('bruggeman')
  })
})
