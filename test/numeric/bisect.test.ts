import { describe, expect, it } from 'vitest'
import { solveIncreasing } from '../../src-core/numeric/index.ts'

describe('solveIncreasing: the root of an increasing function by bisection in ln x', () => {
  it('finds closed-form roots to 1e-14 relative from guesses far on either side', () => {
    // x³ = 27 → 3; x + ln x = 1 → 1 (exact); e^x = 10 → ln 10 (closed forms)
    for (const guess of [1e-6, 1, 1e6]) {
      expect(Math.abs(solveIncreasing((x) => x ** 3, 27, guess) / 3 - 1)).toBeLessThan(1e-14)
      expect(Math.abs(solveIncreasing((x) => x + Math.log(x), 1, guess) - 1)).toBeLessThan(1e-14)
      expect(Math.abs(solveIncreasing(Math.exp, 10, guess) / Math.LN10 - 1)).toBeLessThan(1e-14)
    }
  })
})
