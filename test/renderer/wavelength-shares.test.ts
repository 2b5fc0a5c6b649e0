// How the app's computing worker shares a sample's wavelengths with its helpers (src-renderer/compute/steps.ts).
import { describe, expect, it } from 'vitest'
import { wavelengthShares } from '../../src-renderer/compute/steps.ts'

const demo = [350, 400, 450, 500, 550, 600, 700, 800, 1000, 1250, 1600, 2000, 2500]
// the estimated cost the shares balance: λ⁻², twice that for the wavelength that also carries the phase function (550 nm)
const load = (share: number[]) => share.reduce((a, wl) => a + (wl === 550 ? 2 : 1) / (wl * wl), 0)

describe('wavelength shares', () => {
  for (const threads of [1, 2, 3, 4]) {
    it(`${threads} thread(s): every wavelength in exactly one share, the same shares every time`, () => {
      const shares = wavelengthShares(demo, threads)
      expect(shares).toHaveLength(threads)
      expect(shares.flat().sort((a, b) => a - b)).toEqual(demo)
      // given in another order, the wavelengths make the same shares (each worker keeps its wavelengths' nodes)
      expect(wavelengthShares([...demo].reverse(), threads)).toEqual(shares)
    })
  }

  it('balances the estimated cost: the heaviest share is within one wavelength of the lightest', () => {
    // greedy assignment to the lightest share (a longest-processing-time rule): the spread is at most one item
    for (const threads of [2, 3, 4]) {
      const loads = wavelengthShares(demo, threads).map(load)
      expect(Math.max(...loads) - Math.min(...loads)).toBeLessThanOrEqual(1 / (350 * 350) + 1e-15)
    }
  })

  it('gives empty shares rather than none when there are more threads than wavelengths', () => {
    const shares = wavelengthShares([550], 3)
    expect(shares).toEqual([[550], [], []])
  })
})
