// How the app's computing worker shares a sample's wavelengths with its helpers (src-renderer/compute/steps.ts).
import { describe, expect, it } from 'vitest'
import { sharesByCost, wavelengthShares } from '../../src-renderer/compute/steps.ts'

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

describe('wavelength shares by measured cost', () => {
  // costs of the kind a coarse sample's full pass measures (ms): dear at the short wavelengths, one of them far above the rest
  const costs = new Map(demo.map((wl, i) => [wl, [150, 60, 45, 40, 70, 30, 20, 15, 10, 8, 6, 5, 4][i]]))
  const cost = (share: number[]) => share.reduce((a, wl) => a + costs.get(wl)!, 0)

  it('every wavelength in exactly one share, the same shares whatever the order given', () => {
    for (const threads of [1, 2, 3]) {
      const shares = sharesByCost(demo, costs, threads, 12)
      expect(shares).toHaveLength(threads)
      expect(shares.flat().sort((a, b) => a - b)).toEqual(demo)
      expect(sharesByCost([...demo].reverse(), costs, threads, 12)).toEqual(shares)
    }
  })

  it('balances the measured cost, the first share counting its own extra work', () => {
    // dearest first to the lightest share (longest processing time first): for these costs (463 ms and 20 ms extra) the
    // two shares end within the cheapest wavelength's cost (4 ms) of each other (by hand: 242 and 241 ms)
    const extra = 20
    const shares = sharesByCost(demo, costs, 2, extra)
    const loads = [cost(shares[0]) + extra, cost(shares[1])]
    expect(Math.abs(loads[0] - loads[1])).toBeLessThanOrEqual(Math.min(...shares.flat().map((wl) => costs.get(wl)!)) + 1e-12)
    // the λ⁻² shares of the same wavelengths leave a larger gap for these costs
    const byEstimate = wavelengthShares(demo, 2)
    expect(Math.abs(cost(byEstimate[0]) + extra - cost(byEstimate[1]))).toBeGreaterThan(Math.abs(loads[0] - loads[1]))
  })

  it('falls back on the λ⁻² shares when a wavelength has no measured cost', () => {
    const some = new Map([...costs].slice(1))
    expect(sharesByCost(demo, some, 2)).toEqual(wavelengthShares(demo, 2))
  })
})
