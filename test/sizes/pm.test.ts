import { describe, expect, it } from 'vitest'
import {
  aerodynamicDiameter,
  BIN_SHAPE,
  binsFromMeasurement,
  dNdlnD,
  erf,
  massBelowCut,
  massBelowCutBins,
  massConcentration,
  modeFromMass,
  modeFromNumber,
  particulateMatter,
  particulateMatterBins
} from '../../src-core/index.ts'

const fine = modeFromMass({ mass: 8, massMedian: 0.35, density: 1.7, gsd: 1.8, name: 'accumulation' })
const coarse = modeFromMass({ mass: 25, massMedian: 4, density: 1.7, gsd: 2.2, name: 'coarse' })

describe('mass below a size cut (PM1, PM2.5, PM10)', () => {
  it('PM2.5 of a mode entirely below 2.5 µm equals its total mass to ~1e-6 (both diameters)', () => {
    const small = modeFromNumber({ number: 5000, median: 0.08, gsd: 1.6 })
    const total = massConcentration(small, 1.5)
    for (const diameter of ['geometric', 'aerodynamic'] as const) {
      const r = massBelowCut([small], 2.5, { diameter, density: 1.5 })
      expect(Math.abs(r.mass / total - 1)).toBeLessThan(1e-6)
      expect(r.total / total).toBeCloseTo(1, 12)
    }
  })

  it('PM1 ≤ PM2.5 ≤ PM10 ≤ total for modes and for bins, with either diameter', () => {
    for (const diameter of ['geometric', 'aerodynamic'] as const) {
      const pm = particulateMatter([fine, coarse], { diameter, density: 1.7 })
      expect(pm.pm1).toBeGreaterThan(0)
      expect(pm.pm1).toBeLessThanOrEqual(pm.pm2_5)
      expect(pm.pm2_5).toBeLessThanOrEqual(pm.pm10)
      expect(pm.pm10).toBeLessThanOrEqual(pm.total)
      expect(pm.total).toBeCloseTo(33, 10)
      expect(pm.diameter).toBe(diameter)
    }
    const bins = binsFromMeasurement({ diameters: [0.1, 0.5, 1, 2, 3, 5, 8, 12, 20], diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dN/dlogDp', values: [3000, 200, 30, 5, 2, 1, 0.5, 0.1] })
    const pb = particulateMatterBins(bins, { diameter: 'aerodynamic', density: 2 })
    expect(pb.pm1).toBeLessThanOrEqual(pb.pm2_5)
    expect(pb.pm2_5).toBeLessThanOrEqual(pb.pm10)
    expect(pb.pm10).toBeLessThanOrEqual(pb.total)
  })

  it('geometric cut: closed form with erf agrees with numerical integration of ρ (π/6) D³ dN/dlnD up to the cut by the Simpson rule (Seinfeld & Pandis ch. 8)', () => {
    const mode = modeFromNumber({ number: 50, median: 1.2, gsd: 2 })
    for (const cut of [0.5, 1, 2.5, 10]) {
      const a = Math.log(1.2) - 16 * Math.log(2)
      const b = Math.log(cut)
      const n = 20000
      const h = (b - a) / n
      let s = 0
      for (let i = 0; i <= n; i++) {
        const u = a + i * h
        const f = (Math.PI / 6) * Math.exp(3 * u) * dNdlnD(mode, Math.exp(u))
        s += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * f // Simpson weights
      }
      s /= 3
      const r = massBelowCut([mode], cut, { diameter: 'geometric', density: 2 })
      expect(r.mass / (2 * s * h)).toBeCloseTo(1, 10)
      expect(r.geometricCuts[0]).toBe(cut)
    }
  })

  it('aerodynamic cut: unit-density spheres give the geometric result; denser particles pass less', () => {
    const g = massBelowCut([coarse], 2.5, { diameter: 'geometric', density: 1 })
    const a = massBelowCut([coarse], 2.5, { diameter: 'aerodynamic', density: 1 })
    expect(a.mass / g.mass).toBeCloseTo(1, 10) // d_a = d for ρ = 1, χ = 1 (definition)
    const g2 = massBelowCut([coarse], 2.5, { diameter: 'geometric', density: 2 })
    const a2 = massBelowCut([coarse], 2.5, { diameter: 'aerodynamic', density: 2 })
    expect(a2.mass).toBeLessThan(g2.mass)
    // the geometric cut used is the diameter whose aerodynamic diameter is 2.5 µm, near 2.5/√2 (slip is small there)
    expect(aerodynamicDiameter(a2.geometricCuts[0], 2)).toBeCloseTo(2.5, 10)
    expect(a2.geometricCuts[0] / (2.5 / Math.SQRT2)).toBeCloseTo(1, 1)
    // results say which diameter they used
    expect(a2.basis).toMatch(/aerodynamic/)
    expect(g2.basis).toMatch(/geometric/)
  })

  it('per-mode densities: each mode gets its own geometric cut', () => {
    const r = massBelowCut([fine, coarse], 2.5, { diameter: 'aerodynamic', density: [1.7, 2.6] })
    expect(r.geometricCuts[1]).toBeLessThan(r.geometricCuts[0])
  })

  it('bins: a cut inside a bin takes the exact flat-in-logD share; a finely binned mode matches the mode', () => {
    // one bin 1–4 µm, cut at 2 µm: share = ∫₁² D³ dlogD / ∫₁⁴ D³ dlogD = (2³ − 1)/(4³ − 1) = 7/63 (calculus)
    const one = binsFromMeasurement({ diameters: [1, 4], diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dN/dlogDp', values: [10] })
    const r = massBelowCutBins(one, 2, { diameter: 'geometric', density: 1 })
    expect(r.mass / r.total).toBeCloseTo(7 / 63, 14)
    expect(r.basis).toContain(BIN_SHAPE)
    // coarse mode into 100 bins per decade from 0.01 to 100 µm (exact number per bin from the lognormal CDF)
    const edges = Array.from({ length: 401 }, (_, i) => 0.01 * 10 ** (i / 100))
    const l = Math.log(coarse.gsd)
    const cdf = (d: number) => 0.5 * (1 + erf(Math.log(d / coarse.median) / (Math.SQRT2 * l)))
    const dN = edges.slice(0, -1).map((e, i) => coarse.number * (cdf(edges[i + 1]) - cdf(e)))
    const bins = binsFromMeasurement({ diameters: edges, diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dN', values: dN })
    for (const diameter of ['geometric', 'aerodynamic'] as const) {
      const fromBins = particulateMatterBins(bins, { diameter, density: 1.7 })
      const fromMode = particulateMatter([coarse], { diameter, density: 1.7 })
      expect(fromBins.pm2_5 / fromMode.pm2_5).toBeCloseTo(1, 3)
      expect(fromBins.pm10 / fromMode.pm10).toBeCloseTo(1, 3)
    }
  })
})
