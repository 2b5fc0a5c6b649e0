import { describe, expect, it } from 'vitest'
import {
  BIN_SHAPE,
  binMassConcentration,
  binNumberConcentration,
  binPowerIntegral,
  binsFromMeasurement,
  binSurfaceConcentration,
  binValues,
  binVolumeConcentration,
  edgesFromMidpoints,
  erf,
  modeFromNumber,
  surfaceConcentration,
  volumeConcentration
} from '../../src-core/index.ts'

/** Simpson's rule for ∫_lo^hi D^k dlog₁₀D with n (even) intervals in log₁₀D. */
function numericPower(lo: number, hi: number, k: number, n = 2000): number {
  const a = Math.log10(lo)
  const b = Math.log10(hi)
  const h = (b - a) / n
  let s = 0
  for (let i = 0; i <= n; i++) {
    const f = 10 ** (k * (a + i * h))
    s += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * f
  }
  return (s * h) / 3
}

const EDGES_UM = [0.1, 0.15, 0.2, 0.3, 0.5, 1.0]
const DNDLOGD = [1200, 900, 500, 150, 20]

describe('measured bins', () => {
  it('exact bin integral of D^k in log D agrees with numerical integration (calculus; flat-in-logD bins)', () => {
    for (const k of [-1, 0, 0.5, 1, 2, 3, 6]) {
      for (const [lo, hi] of [[0.1, 0.1001], [0.1, 1], [2, 10]]) {
        expect(binPowerIntegral(lo, hi, k) / numericPower(lo, hi, k) - 1).toBeCloseTo(0, 10)
      }
    }
    // k = 0 is the log₁₀ width; k = 3 closed form (hi³ − lo³)/(3 ln 10)
    expect(binPowerIntegral(0.1, 1, 0)).toBeCloseTo(1, 14)
    expect(binPowerIntegral(1, 2, 3)).toBeCloseTo(7 / (3 * Math.LN10), 14)
  })

  it('canonical form: nm edges become µm; dN/dlogDp is kept; moments are sums of exact bin integrals', () => {
    const bins = binsFromMeasurement({
      diameters: EDGES_UM.map((d) => d * 1000),
      diameterKind: 'edges',
      diameterUnit: 'nm',
      quantity: 'dN/dlogDp',
      values: DNDLOGD
    })
    expect(bins.edges).toBeInstanceOf(Float64Array)
    expect(Array.from(bins.edges).map((e, i) => e / EDGES_UM[i])).toEqual(EDGES_UM.map(() => expect.closeTo(1, 14)))
    expect(Array.from(bins.dNdlogD)).toEqual(DNDLOGD)
    // surface and volume against independent numerical integration bin by bin
    let S = 0
    let V = 0
    let N = 0
    for (let i = 0; i < DNDLOGD.length; i++) {
      N += DNDLOGD[i] * Math.log10(EDGES_UM[i + 1] / EDGES_UM[i])
      S += DNDLOGD[i] * Math.PI * numericPower(EDGES_UM[i], EDGES_UM[i + 1], 2)
      V += DNDLOGD[i] * (Math.PI / 6) * numericPower(EDGES_UM[i], EDGES_UM[i + 1], 3)
    }
    expect(binNumberConcentration(bins) / N).toBeCloseTo(1, 12)
    expect(binSurfaceConcentration(bins) / S).toBeCloseTo(1, 11)
    expect(binVolumeConcentration(bins) / V).toBeCloseTo(1, 11)
    expect(binMassConcentration(bins, 1.5) / (1.5 * V)).toBeCloseTo(1, 11)
    expect(BIN_SHAPE).toMatch(/flat in log D/)
  })

  it("'dN' is number per bin: dN/dlogD = dN / Δlog₁₀D", () => {
    const bins = binsFromMeasurement({ diameters: [0.1, 1, 10], diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dN', values: [300, 2] })
    expect(bins.dNdlogD[0]).toBeCloseTo(300, 12) // one decade wide
    expect(binNumberConcentration(bins)).toBeCloseTo(302, 12)
  })

  it('dS/dlogDp and dV/dlogDp use the bin integral, so the bin keeps the surface/volume it reported (not the midpoint value)', () => {
    // One wide bin 0.1–1 µm reporting dV/dlogDp = 10 µm³ cm⁻³: its volume is 10 × Δlog₁₀D = 10.
    const bins = binsFromMeasurement({ diameters: [0.1, 1], diameterKind: 'edges', diameterUnit: 'um', quantity: 'dV/dlogDp', values: [10] })
    expect(binVolumeConcentration(bins)).toBeCloseTo(10, 12)
    // A midpoint evaluation (π/6) D_m³ with D_m = √(0.1·1) would give a very different number concentration:
    const midpointGuess = 10 / ((Math.PI / 6) * Math.sqrt(0.1) ** 3)
    expect(Math.abs(bins.dNdlogD[0] / midpointGuess - 1)).toBeGreaterThan(0.5)
    const s = binsFromMeasurement({ diameters: [0.1, 1], diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dS/dlogDp', values: [40] })
    expect(binSurfaceConcentration(s)).toBeCloseTo(40, 12)
    const m = binsFromMeasurement({ diameters: [0.1, 1], diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dM/dlogDp', values: [17.7], density: 1.77 })
    expect(binVolumeConcentration(m)).toBeCloseTo(10, 12)
  })

  it('conversions are consistent: dN → dV/dlogDp (and dS, dM, dN) → dN gives the same distribution', () => {
    const bins = binsFromMeasurement({ diameters: EDGES_UM, diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dN/dlogDp', values: DNDLOGD })
    for (const q of ['dN', 'dS/dlogDp', 'dV/dlogDp', 'dM/dlogDp'] as const) {
      const values = binValues(bins, q, 2.0)
      const back = binsFromMeasurement({ diameters: EDGES_UM, diameterKind: 'edges', diameterUnit: 'µm', quantity: q, values, density: 2.0 })
      for (let i = 0; i < DNDLOGD.length; i++) expect(back.dNdlogD[i] / DNDLOGD[i]).toBeCloseTo(1, 12)
    }
    // dV/dlogDp values are bin-average volumes: Σ value·Δlog = total volume
    const dv = binValues(bins, 'dV/dlogDp')
    let V = 0
    for (let i = 0; i < dv.length; i++) V += dv[i] * Math.log10(EDGES_UM[i + 1] / EDGES_UM[i])
    expect(V / binVolumeConcentration(bins)).toBeCloseTo(1, 12)
  })

  it('edges from midpoints: geometric means inside, mirrored in log D outside', () => {
    const e = edgesFromMidpoints([0.1, 0.2, 0.4])
    expect(e[1]).toBeCloseTo(Math.sqrt(0.02), 14)
    expect(e[2]).toBeCloseTo(Math.sqrt(0.08), 14)
    expect(e[0]).toBeCloseTo(0.01 / Math.sqrt(0.02), 14) // log e0 = 2 log m0 − log e1
    expect(e[3]).toBeCloseTo(0.16 / Math.sqrt(0.08), 14)
    // Log-spaced midpoints (64 per decade, as a mobility sizer gives them): every bin has the same log width and is centred on its midpoint
    const mids = Array.from({ length: 20 }, (_, i) => 0.01 * 10 ** (i / 64))
    const edges = edgesFromMidpoints(mids)
    for (let i = 0; i < 20; i++) {
      expect(Math.log10(edges[i + 1] / edges[i])).toBeCloseTo(1 / 64, 13)
      expect(Math.sqrt(edges[i] * edges[i + 1]) / mids[i]).toBeCloseTo(1, 13)
    }
    // binsFromMeasurement uses the same edges for midpoint input (and scales nm)
    const bins = binsFromMeasurement({ diameters: [100, 200, 400], diameterKind: 'midpoints', diameterUnit: 'nm', quantity: 'dN/dlogDp', values: [1, 2, 3] })
    for (let i = 0; i < 4; i++) expect(bins.edges[i] / e[i]).toBeCloseTo(1, 14)
  })

  it('a lognormal mode put into fine bins keeps its number exactly and its surface/volume to second order in bin width (Seinfeld & Pandis ch. 8)', () => {
    const mode = modeFromNumber({ number: 1500, median: 0.08, gsd: 1.7 })
    const l = Math.log(1.7)
    const cdf = (d: number) => 0.5 * (1 + erf(Math.log(d / 0.08) / (Math.SQRT2 * l)))
    // perDecade bins from 1 nm to 10 µm; exact number per bin from the lognormal CDF ½(1 + erf(...))
    const binned = (perDecade: number) => {
      const n = 4 * perDecade
      const edges = Array.from({ length: n + 1 }, (_, i) => 0.001 * 10 ** (i / perDecade))
      const dN = Array.from({ length: n }, (_, i) => 1500 * (cdf(edges[i + 1]) - cdf(edges[i])))
      return binsFromMeasurement({ diameters: edges, diameterKind: 'edges', diameterUnit: 'µm', quantity: 'dN', values: dN })
    }
    const b200 = binned(200)
    const b400 = binned(400)
    expect(binNumberConcentration(b200) / 1500).toBeCloseTo(1, 9)
    const errS200 = binSurfaceConcentration(b200) / surfaceConcentration(mode) - 1
    const errV200 = binVolumeConcentration(b200) / volumeConcentration(mode) - 1
    const errV400 = binVolumeConcentration(b400) / volumeConcentration(mode) - 1
    expect(Math.abs(errS200)).toBeLessThan(3e-4)
    expect(Math.abs(errV200)).toBeLessThan(3e-4)
    // flat-in-logD inside a bin is a second-order approximation: halving the bin width quarters the error
    expect(errV200 / errV400).toBeGreaterThan(3.5)
    expect(errV200 / errV400).toBeLessThan(4.5)
  })
})
