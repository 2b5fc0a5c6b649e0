// Checks of the homogeneous-sphere engine against published values and the physics' own identities.
import { describe, expect, it } from 'vitest'
import {
  angularFromCoefficients,
  gaussLegendre,
  InputError,
  MieWorkspace,
  newAngularScattering,
  sizeParameter,
  sphereEfficiencies
} from '../../src-core/index.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('published test cases', () => {
  // Wiscombe (1979), NCAR Technical Note TN-140+STR, test cases; values recomputed at 40 significant
  // digits and rounded to 7 digits, so agreement is to within half a unit of the 7th digit (≤ 5e-7 relative
  // for a leading digit of at least 1).
  const wiscombe: [number, number, number, number, number, number][] = [
    // x, n, k, Qext, Qsca, g
    [0.099, 0.75, 0, 7.417859e-6, 7.417859e-6, 0.001448231],
    [0.101, 0.75, 0, 8.033538e-6, 8.033538e-6, 0.00150743],
    [10, 0.75, 0, 2.232265, 2.232265, 0.8964726],
    [1000, 0.75, 0, 1.997908, 1.997908, 0.8449443],
    [1, 1.33, 1e-5, 0.09395198, 0.0939233, 0.1845173],
    [100, 1.33, 1e-5, 2.101321, 2.096594, 0.8689593],
    [1000, 1.33, 1e-5, 2.016875, 1.983333, 0.8857724],
    [0.055, 1.5, 1, 0.101491, 1.131687e-5, 0.0004911725],
    [1, 1.5, 1, 2.336321, 0.6634538, 0.1921364],
    [100, 1.5, 1, 2.097502, 1.283697, 0.850252],
    [1, 10, 10, 2.532993, 2.049405, -0.1106644],
    [100, 10, 10, 2.071124, 1.836785, 0.5562155]
  ]
  for (const [x, n, k, qext, qsca, g] of wiscombe) {
    it(`Wiscombe (1979) m = ${n}+${k}i, x = ${x}`, () => {
      const r = sphereEfficiencies(x, n, k)
      expect(rel(r.qext, qext)).toBeLessThan(5e-7)
      expect(rel(r.qsca, qsca)).toBeLessThan(5e-7)
      // g has 7 significant digits except 0.00150743 (6): half a unit of the last digit given
      expect(rel(r.g, g)).toBeLessThan(g === 0.00150743 ? 5e-6 : 5e-7)
    })
  }

  it('Bohren & Huffman (1983) appendix A: r = 0.525 µm, m = 1.55, λ = 0.6328 µm', () => {
    // Qsca = Qext = 3.105426 and Qback = 2.925341 (recomputed at 40 digits, rounded to 7)
    const x = sizeParameter(2 * 0.525, 0.6328)
    const r = sphereEfficiencies(x, 1.55, 0)
    expect(rel(r.qext, 3.105426)).toBeLessThan(2e-7)
    expect(rel(r.qsca, 3.105426)).toBeLessThan(2e-7)
    expect(rel(r.qback, 2.925341)).toBeLessThan(2e-7)
    expect(r.qabs).toBe(0)
  })
})

describe('limits', () => {
  it('Rayleigh limit (Bohren & Huffman 1983, ch. 5): Qsca, Qabs and g for x ≪ 1', () => {
    for (const [n, k] of [[1.5, 0], [1.53, 0.01], [1.95, 0.79], [0.75, 0], [10, 10]]) {
      for (const x of [1e-6, 1e-5, 1e-4]) {
        // L = (m² − 1)/(m² + 2)
        const er = n * n - k * k
        const ei = 2 * n * k
        const den = (er + 2) ** 2 + ei ** 2
        const lr = ((er - 1) * (er + 2) + ei * ei) / den
        const li = (ei * (er + 2) - (er - 1) * ei) / den
        const r = sphereEfficiencies(x, n, k)
        const qsca = (8 / 3) * x ** 4 * (lr * lr + li * li)
        const qabs = 4 * x * li
        // leading-order formulas; the next terms are O(x²|m|⁴) relative (Bohren & Huffman eq. 5.11,
        // from memory), so the check is kept where that is below 1e-7
        if (x * x * (n * n + k * k) ** 2 > 1e-7) continue
        expect(rel(r.qsca, qsca)).toBeLessThan(1e-6)
        if (k > 0) expect(rel(r.qabs, qabs)).toBeLessThan(1e-6)
        expect(Math.abs(r.g)).toBeLessThan(1e-6)
      }
    }
  })

  it('extinction paradox: Qext → 2 for large spheres (van de Hulst 1957)', () => {
    // The approach to 2 goes as x^(−2/3) (van de Hulst 1957, §12.32, from memory): check that the
    // distance from 2 shrinks as x grows, and is small at x = 1e4.
    const d = [1e2, 1e3, 1e4].map((x) => Math.abs(sphereEfficiencies(x, 1.5, 0.1).qext - 2))
    expect(d[2]).toBeLessThan(d[0])
    expect(d[2]).toBeLessThan(0.01)
    expect(Math.abs(sphereEfficiencies(2e4, 1.33, 1e-8).qext - 2)).toBeLessThan(0.01)
  })
})

describe('conservation and identities', () => {
  const spheres: [number, number, number][] = [
    [0.3, 1.5, 0], [3, 1.33, 0], [25, 1.53, 0.01], [60, 1.95, 0.79], [8, 0.75, 0], [12, 3, 4], [150, 1.53, 0.008]
  ]

  it('no absorption when k = 0 (any x, any n)', () => {
    for (const x of [1e-6, 0.01, 1, 30, 500, 5000]) for (const n of [0.05, 0.75, 1, 1.33, 2, 10]) {
      const r = sphereEfficiencies(x, n, 0)
      expect(r.qabs).toBe(0)
      expect(r.qext).toBe(r.qsca)
    }
  })

  it('m = 1 exactly scatters nothing: efficiencies zero to rounding', () => {
    // the coefficients are differences of equal quantities computed by two paths: zero to rounding
    const r = sphereEfficiencies(5, 1, 0)
    expect(r.qext).toBeLessThan(1e-28)
    expect(r.qabs).toBe(0)
  })

  it('optical theorem: Qext = (4/x²) Re S(0) (Bohren & Huffman eq. 4.76)', () => {
    const ws = new MieWorkspace()
    for (const [x, n, k] of spheres) {
      const eff = sphereEfficiencies(x, n, k, ws)
      const a = angularFromCoefficients(x, ws, eff, newAngularScattering([0]))
      expect(rel((4 / (x * x)) * a.s1Re[0], eff.qext)).toBeLessThan(1e-10)
      expect(rel(a.s2Re[0], a.s1Re[0])).toBeLessThan(1e-12)
    }
  })

  it('Qback = 4|S1(180°)|²/x² and S1(180°) = −S2(180°) (Bohren & Huffman §4.6)', () => {
    const ws = new MieWorkspace()
    for (const [x, n, k] of spheres) {
      const eff = sphereEfficiencies(x, n, k, ws)
      const a = angularFromCoefficients(x, ws, eff, newAngularScattering([180]))
      const s1 = a.s1Re[0] ** 2 + a.s1Im[0] ** 2
      expect(rel((4 * s1) / (x * x), eff.qback)).toBeLessThan(1e-9)
      expect(Math.abs(a.s1Re[0] + a.s2Re[0])).toBeLessThan(1e-9 * Math.sqrt(s1) + 1e-300)
    }
  })

  it('the phase function integrates to 4π and its first moment is the series g', () => {
    const ws = new MieWorkspace()
    for (const [x, n, k] of spheres) {
      const eff = sphereEfficiencies(x, n, k, ws)
      // Gauss–Legendre in cos θ with well over 2N nodes integrates the polynomial S11 exactly
      const nodes = 2 * eff.terms + 20
      const { nodes: mu, weights } = gaussLegendre(nodes)
      const angles = Array.from(mu, (m) => (Math.acos(m) * 180) / Math.PI)
      const a = angularFromCoefficients(x, ws, eff, newAngularScattering(angles))
      let norm = 0
      let first = 0
      for (let i = 0; i < nodes; i++) {
        norm += weights[i] * a.phase[i]
        first += weights[i] * a.phase[i] * mu[i]
      }
      // ∫ p dΩ = 2π ∫ p dμ = 4π  ⇔  ∫ p dμ = 2
      expect(rel(norm, 2)).toBeLessThan(1e-9)
      expect(Math.abs(first / 2 - eff.g)).toBeLessThan(1e-9)
    }
  })

  it('Qpr = Qext − g Qsca and 0 ≤ Qabs ≤ Qext', () => {
    for (const [x, n, k] of spheres) {
      const r = sphereEfficiencies(x, n, k)
      expect(r.qpr).toBeCloseTo(r.qext - r.g * r.qsca, 12)
      expect(r.qabs).toBeGreaterThanOrEqual(0)
      expect(r.qabs).toBeLessThanOrEqual(r.qext)
    }
  })

  it('series length is at least Wiscombe\'s (1980) N = x + 4.05 x^(1/3) + 2', () => {
    for (const x of [0.01, 1, 10, 1000, 2e4]) expect(sphereEfficiencies(x, 1.5, 0).terms).toBeGreaterThanOrEqual(Math.floor(x + 4.05 * Math.cbrt(x) + 2))
  })
})

describe('domain', () => {
  const bad: [number, number, number, string][] = [
    [0, 1.5, 0, 'size parameter x'],
    [3e4, 1.5, 0, 'size parameter x'],
    [Number.NaN, 1.5, 0, 'size parameter x'],
    [1, 0.01, 0, 'real index n'],
    [1, 11, 0, 'real index n'],
    [1, 1.5, -0.1, 'imaginary index k'],
    [1, 1.5, 11, 'imaginary index k']
  ]
  for (const [x, n, k, name] of bad) {
    it(`refuses ${name} outside its range (x=${x}, n=${n}, k=${k})`, () => {
      expect(() => sphereEfficiencies(x, n, k)).toThrow(InputError)
      expect(() => sphereEfficiencies(x, n, k)).toThrow(name)
    })
  }
})
