import { describe, expect, it } from 'vitest'
import { gaussLegendre, gaussLegendreOn } from '../../src-core/index.ts'

describe('Gauss–Legendre quadrature', () => {
  it('integrates x^k exactly on [−1, 1] up to degree 2n − 1 (Abramowitz & Stegun 1964, §25.4.29)', () => {
    for (const n of [2, 3, 8, 40]) {
      const { nodes, weights } = gaussLegendre(n)
      for (let k = 0; k <= 2 * n - 1; k++) {
        let s = 0
        for (let i = 0; i < n; i++) s += weights[i] * nodes[i] ** k
        const exact = k % 2 === 1 ? 0 : 2 / (k + 1)
        expect(Math.abs(s - exact)).toBeLessThan(1e-13)
      }
    }
  })

  it('has the tabulated 3-point nodes ±√(3/5) and weights 5/9, 8/9 (Abramowitz & Stegun table 25.4)', () => {
    const { nodes, weights } = gaussLegendre(3)
    expect(nodes[2]).toBeCloseTo(Math.sqrt(0.6), 15)
    expect(weights[0]).toBeCloseTo(5 / 9, 15)
    expect(weights[1]).toBeCloseTo(8 / 9, 15)
  })

  it('maps onto [a, b]: ∫_0^π sin = 2 (closed form)', () => {
    const { nodes, weights } = gaussLegendreOn(20, 0, Math.PI)
    let s = 0
    for (let i = 0; i < 20; i++) s += weights[i] * Math.sin(nodes[i])
    expect(s).toBeCloseTo(2, 13)
  })
})
