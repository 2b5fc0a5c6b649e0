// Sizers merged into one volume-equivalent distribution. The sizer data are made from a known bimodal lognormal
// (test/field/synthetic.ts: forward conversions of DeCarlo et al. 2004, exact bin counts through the lognormal
// CDF); the merged distribution must give back the known figures (test/field/stats.ts: Hatch–Choate relations).
import { describe, expect, it } from 'vitest'
import { edgesFromMidpoints, fitDensity, mergeStep, planMerge, type SizerInput } from '../../src-core/index.ts'
import { AERODYNAMIC_MIDPOINTS_UM, instrumentValues, KNOWN_DENSITY, KNOWN_MODES, KNOWN_SHAPE_FACTOR, logMidpoints, MOBILITY_MIDPOINTS_UM } from './synthetic.ts'
import { binFigures, modeFigures, relativeErrors } from './stats.ts'

const truth = { shapeFactor: KNOWN_SHAPE_FACTOR, density: KNOWN_DENSITY }
const mobility: SizerInput = { kind: 'mobility', label: 'mobility.csv', edgesUm: edgesFromMidpoints(MOBILITY_MIDPOINTS_UM) }
const aerodynamic: SizerInput = { kind: 'aerodynamic', label: 'aerodynamic.csv', edgesUm: edgesFromMidpoints(AERODYNAMIC_MIDPOINTS_UM) }
const vm = instrumentValues('mobility', MOBILITY_MIDPOINTS_UM, KNOWN_MODES, truth)
const va = instrumentValues('aerodynamic', AERODYNAMIC_MIDPOINTS_UM, KNOWN_MODES, truth)

describe('merging a mobility and an aerodynamic sizer of a known aerosol (ρ = 1.8 g cm⁻³, χ = 1.15)', () => {
  const plan = planMerge([mobility, aerodynamic], truth)
  const merged = new Float64Array(plan.edges.length - 1)
  const empty = mergeStep(plan, [vm, va], merged)

  it('gives back the number, volume, medians and widths of the known modes', () => {
    expect(empty).toBe(0)
    const err = relativeErrors(binFigures(plan.edges, merged), modeFigures(KNOWN_MODES))
    // Tolerances: the sizers' own bins (32 a decade, number flat in log D inside each) limit the volume to about
    // half a percent; measured: number 4e-6, volume 5.5e-3, number median 1.4e-5, volume median 2.8e-3,
    // number σg 1.6e-3, volume σg 7e-6.
    expect(err.number).toBeLessThan(1e-3)
    expect(err.volume).toBeLessThan(1e-2)
    expect(err.numberMedianUm).toBeLessThan(1e-2)
    expect(err.volumeMedianUm).toBeLessThan(1e-2)
    expect(err.numberGsd).toBeLessThan(1e-2)
    expect(err.volumeGsd).toBeLessThan(1e-2)
  })

  it('hands over linearly in log d_ve across the overlap: weights 1 → 0 and 0 → 1, summing to 1 (the stated rule)', () => {
    expect(plan.overlaps).toHaveLength(1)
    const { fromUm, toUm } = plan.overlaps[0]
    let inside = 0
    for (let k = 0; k < merged.length; k++) {
      const x = Math.sqrt(plan.edges[k] * plan.edges[k + 1])
      const [wm, wa] = [plan.sizers[0].weight[k], plan.sizers[1].weight[k]]
      if (x > fromUm && x < toUm) {
        inside++
        expect(wm + wa).toBeCloseTo(1, 12)
        expect(wa).toBeCloseTo(Math.log(x / fromUm) / Math.log(toUm / fromUm), 12)
      } else if (x <= fromUm) expect([wm, wa]).toEqual([1, 0])
      else expect([wm, wa]).toEqual([0, 1])
    }
    expect(inside).toBeGreaterThan(5)
  })

  it('a merged bin covered by one sizer alone conserves that sizer\'s particles (per-bin counts kept through the Jacobian)', () => {
    // number below the overlap from the merged bins = number of the mobility sizer's bins below it
    const cut = plan.overlaps[0].fromUm
    let fromMerged = 0
    for (let k = 0; plan.edges[k + 1] <= cut; k++) fromMerged += merged[k] * Math.log10(plan.edges[k + 1] / plan.edges[k])
    const s = plan.sizers[0]
    let fromSizer = 0
    for (let j = 0; j + 1 < s.edgesVe.length; j++) {
      const hi = Math.min(s.edgesVe[j + 1], plan.edges[plan.edges.findIndex((e) => e > cut) - 1])
      if (hi <= s.edgesVe[j]) break
      fromSizer += vm[j] * Math.log10(mobility.edgesUm[j + 1] / mobility.edgesUm[j]) * (Math.log(hi / s.edgesVe[j]) / Math.log(s.edgesVe[j + 1] / s.edgesVe[j]))
    }
    expect(fromMerged / fromSizer).toBeCloseTo(1, 10)
  })

  it('a sizer without data at a step drops out: its bins stay empty (NaN, written empty), the others are unchanged outside the overlap', () => {
    const onlyMobility = new Float64Array(merged.length)
    const emptyBins = mergeStep(plan, [vm, undefined], onlyMobility)
    const top = plan.sizers[0].rangeVe[1]
    let nan = 0
    for (let k = 0; k < merged.length; k++) {
      if (plan.edges[k] >= top) {
        expect(onlyMobility[k]).toBeNaN()
        nan++
      } else {
        expect(Number.isNaN(onlyMobility[k])).toBe(false)
        if (plan.sizers[1].weight[k] === 0) expect(onlyMobility[k]).toBe(merged[k])
      }
    }
    expect(emptyBins).toBe(nan)
    expect(nan).toBeGreaterThan(30)
  })
})

describe('the density fitted in the overlap (Khlystov, Stanier & Pandis 2004)', () => {
  it('recovers the true density within 2 % (measured 0.07 %), with a misfit far below that of a wrong density', () => {
    const fit = fitDensity(mobility, aerodynamic, [[vm, va]], { shapeFactor: KNOWN_SHAPE_FACTOR })
    expect(Math.abs(fit.density / KNOWN_DENSITY - 1)).toBeLessThan(0.02)
    const atUnit = fit.scan.reduce((p, c) => (Math.abs(Math.log(c.density)) < Math.abs(Math.log(p.density)) ? c : p))
    expect(atUnit.misfit).toBeGreaterThan(5 * fit.misfit)
    expect(fit.compared).toBeGreaterThan(0)
    expect(fit.atBound).toBe(false)
  })

  it('recovers another density (1.3 g cm⁻³, spheres) from files made with it, over several time steps', () => {
    const s = { shapeFactor: 1, density: 1.3 }
    const m = instrumentValues('mobility', MOBILITY_MIDPOINTS_UM, KNOWN_MODES, s)
    const a = instrumentValues('aerodynamic', AERODYNAMIC_MIDPOINTS_UM, KNOWN_MODES, s)
    const steps = [0.5, 1, 2].map((f) => [m.map((v) => v * f), a.map((v) => v * f)] as [number[], number[]])
    const fit = fitDensity(mobility, aerodynamic, [...steps, [m, undefined]], { shapeFactor: 1 })
    expect(Math.abs(fit.density / 1.3 - 1)).toBeLessThan(0.02)
  })

  it('says when the best density lies at the end of the searched range (files made with 8 g cm⁻³, searched 0.5–5)', () => {
    const s = { shapeFactor: 1, density: 8 }
    const m = instrumentValues('mobility', MOBILITY_MIDPOINTS_UM, KNOWN_MODES, s)
    const a = instrumentValues('aerodynamic', AERODYNAMIC_MIDPOINTS_UM, KNOWN_MODES, s)
    const fit = fitDensity(mobility, aerodynamic, [[m, a]], { shapeFactor: 1 })
    expect(fit.atBound).toBe(true)
  })

  it('says so when the two ranges cannot overlap', () => {
    const far: SizerInput = { kind: 'aerodynamic', label: 'far.csv', edgesUm: edgesFromMidpoints(logMidpoints(5, 20, 16)) }
    expect(() => fitDensity(mobility, far, [[vm, new Array(far.edgesUm.length - 1).fill(1)]], { shapeFactor: 1 })).toThrow(/do not overlap.*--density/)
  })
})

describe('ranges that cannot be merged are refused, with the option that fixes them', () => {
  it('a hole between the trusted ranges', () => {
    const narrow: SizerInput = { ...mobility, rangeUm: [0.01, 0.2] }
    expect(() => planMerge([narrow, aerodynamic], truth)).toThrow(/no sizer covers .* hole.*--mobility-range/)
  })

  it('one trusted range inside another', () => {
    const inner: SizerInput = { kind: 'aerodynamic', label: 'inner.csv', edgesUm: edgesFromMidpoints(logMidpoints(0.05, 0.2, 16)) }
    expect(() => planMerge([mobility, inner], truth)).toThrow(/lies inside that of mobility\.csv.*--mobility-range/)
  })

  it('a trusted range narrows a sizer: the merged bins start at its converted lower end', () => {
    const p = planMerge([{ ...mobility, rangeUm: [0.02, 0.8] }, aerodynamic], truth)
    expect(p.edges[0]).toBeGreaterThan(0.015)
    expect(p.edges[0]).toBeLessThan(0.02)
  })
})
