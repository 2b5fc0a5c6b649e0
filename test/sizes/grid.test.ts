import { describe, expect, it } from 'vitest'
import { integrationRange, type LognormalMode, modeFromNumber, moment } from '../../src-core/index.ts'
import { trapezoidMoment } from './helpers.ts'

/** Trapezoid ∫ D^k dN/dlnD dlnD over [lnA, lnB]. */
function partialMoment(mode: LognormalMode, k: number, A: number, B: number, n = 20000): number {
  return trapezoidMoment(mode, k, Math.log(A), Math.log(B), n)
}

describe('integration range for the optics code (Hatch–Choate shifted medians, Seinfeld & Pandis ch. 8)', () => {
  const modes = [
    modeFromNumber({ number: 1e4, median: 0.02, gsd: 1.5, name: 'Aitken' }),
    modeFromNumber({ number: 800, median: 0.15, gsd: 1.8, name: 'accumulation' }),
    modeFromNumber({ number: 2, median: 1.5, gsd: 2.5, name: 'coarse' })
  ]

  it('holds all but 1e-9 of moments 0..3 of every mode (numerical integration inside the range)', () => {
    const { min, max } = integrationRange(modes)
    expect(min).toBeGreaterThan(0)
    expect(max).toBeGreaterThan(min)
    for (const m of modes) {
      for (let k = 0; k <= 3; k++) {
        const missing = 1 - partialMoment(m, k, min, max) / moment(m, k)
        expect(missing).toBeLessThan(1.1e-9)
        expect(missing).toBeGreaterThan(-1e-12)
      }
    }
  })

  it('is not wider than needed: the lower end leaves about half the tail of the number moment of the mode that sets it', () => {
    const aitken = modes[0]
    const { min } = integrationRange([aitken], { tailFraction: 1e-6 })
    const below = partialMoment(aitken, 0, min / 1e4, min) / aitken.number
    expect(below / 5e-7).toBeCloseTo(1, 3)
    // and the upper end leaves about half the tail of the 3rd moment
    const { max } = integrationRange([aitken], { tailFraction: 1e-6 })
    const above = partialMoment(aitken, 3, max, max * 1e4) / moment(aitken, 3)
    expect(above / 5e-7).toBeCloseTo(1, 3)
  })
})
