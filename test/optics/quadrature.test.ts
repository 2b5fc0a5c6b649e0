// The adaptive size integration against an independent, much finer integration written here:
// composite 4-point Gauss–Legendre panels in ln D no wider than 0.02 in ln D or 0.05 in size parameter
// (about 30 panels per interference period of a sphere with n = 1.5), and 0.01 for non-absorbing spheres,
// whose narrow resonances need it; for absorbing spheres (k > 0.005),
// whose efficiencies are smooth at large x, panels may widen to 2e-3 in ln D. Over all but 1e-7 of the mode.
// b, β(μ₀) and β̄ are checked in upscatter.test.ts, against a reference without angular error (this file's
// reference used the engine's own angular rule, so it could not see that rule's error).
import { describe, expect, it } from 'vitest'
import { bulkOpticsAt, gaussLegendre, MieWorkspace, sphereEfficiencies } from '../../src-core/index.ts'
import { DRY, modePopulation } from './helpers.ts'

const gl4 = gaussLegendre(4)

function fineIntegration(median: number, gsd: number, n: number, k: number, wl: number) {
  const { pop, lo, hi } = modePopulation(median, gsd, n, k)
  const density = pop.segments[0].density
  const ws = new MieWorkspace()
  let ext = 0, sca = 0, abs = 0, gsca = 0
  let u = lo
  while (u < hi) {
    const x = (Math.PI * Math.exp(u)) / wl
    const h = Math.min(0.02, k > 0.005 ? Math.max(0.05 / x, 2e-3) : 0.01 / x, hi - u)
    for (let i = 0; i < 4; i++) {
      const uu = u + 0.5 * h * (gl4.nodes[i] + 1)
      const d = Math.exp(uu)
      const w = 0.5 * h * gl4.weights[i] * density(uu)
      const e = sphereEfficiencies((Math.PI * d) / wl, n, k, ws)
      const area = 0.25 * Math.PI * d * d
      ext += w * e.qext * area
      sca += w * e.qsca * area
      abs += w * e.qabs * area
      gsca += w * e.qsca * area * e.g
    }
    u += h
  }
  return { ext, sca, abs, g: gsca / sca }
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('size integration reaches 1e-4 relative accuracy', () => {
  // median (µm), gsd, n, k at 550 nm: widths 1.05 to 3, medians 1 nm to 100 µm, absorbing and not;
  // the narrow non-absorbing modes carry the ripple structure of the efficiencies.
  const cases: [number, number, number, number][] = [
    [0.001, 1.5, 1.5, 0.01],
    [0.05, 1.05, 1.5, 0],
    [0.3, 1.05, 1.5, 0],
    [2, 1.05, 1.33, 0],
    [8, 1.05, 1.5, 0],
    [0.2, 2, 1.53, 0.01],
    [0.1, 3, 1.53, 0.008],
    [20, 1.5, 1.53, 0.01],
    [100, 1.05, 1.53, 0.01]
  ]
  for (const [median, gsd, n, k] of cases) {
    it(`D_g = ${median} µm, σ_g = ${gsd}, m = ${n}+${k}i`, () => {
      const wl = 0.55
      const ref = fineIntegration(median, gsd, n, k, wl)
      const { pop } = modePopulation(median, gsd, n, k)
      const r = bulkOpticsAt([pop], wl, DRY)
      expect(rel(r.ext, ref.ext)).toBeLessThan(1e-4)
      expect(rel(r.sca, ref.sca)).toBeLessThan(1e-4)
      expect(Math.abs(r.abs - ref.abs) / ref.ext).toBeLessThan(1e-4)
      expect(Math.abs(r.g - ref.g)).toBeLessThan(1e-4)
    }, 180_000)
  }
})

describe('the stopping rule is not fooled by unresolved resonances', () => {
  // Narrow modes of lossless or nearly lossless spheres carry resonances far narrower than any grid: the
  // changes between refinement levels are then erratic. Shifting the wavelength by fractions of a percent moves
  // the resonances against the grid, so each of these wavelengths is a fresh draw of that luck; every one must
  // still land within the tolerance of the fine integration above.
  const cases: [number, number, number, number][] = [
    [8, 1.05, 1.5, 0],
    [3, 1.3, 1.45, 1e-6]
  ]
  for (const [median, gsd, n, k] of cases) {
    it(`D_g = ${median} µm, σ_g = ${gsd}, m = ${n}+${k}i at 12 wavelengths within 0.8 % of 550 nm`, () => {
      for (let i = 0; i < 12; i++) {
        const wl = 0.55 * (1 + 0.0007 * i)
        const ref = fineIntegration(median, gsd, n, k, wl)
        const { pop } = modePopulation(median, gsd, n, k)
        const r = bulkOpticsAt([pop], wl, DRY, { upscatter: false })
        expect(rel(r.ext, ref.ext)).toBeLessThan(1e-4)
        expect(rel(r.sca, ref.sca)).toBeLessThan(1e-4)
        expect(Math.abs(r.g - ref.g)).toBeLessThan(1e-4)
      }
    }, 180_000)
  }
})
