// The uncertainty tool's `spread` input: measured bins that keep their spread (a stretch of the station record
// made a sample) drawn within it, every bin at the same quantile of a lognormal with its mean and spread.
import { describe, expect, it } from 'vitest'
import { demoStudy, InputError, runUncertainty, type Sample, type Study, type UncertainInput } from '../../src-core/index.ts'

const DIAMETERS = [50, 70, 100, 140, 200, 280, 400]
const VALUES = [500, 1500, 3000, 2500, 1200, 400, 80]
const ROWS = 9

/** The demo's soot sample (its composition, humidity, layer) with invented measured bins and the given spread. */
function withBins(spread: number[]): { study: Study; name: string } {
  const study = demoStudy()
  const base = study.samples.find((s) => s.name === 'Aged soot with sulfate coating')!
  const sample: Sample = { ...base, name: 'Stretch', size: { kind: 'bins', bins: { diameters: DIAMETERS, diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp', values: VALUES, rows_averaged: ROWS, spread } } }
  study.samples.push(sample)
  return { study, name: sample.name }
}
const input = (scale?: 'standard-error' | 'standard-deviation'): UncertainInput => ({ quantity: 'spread', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 1 }, ...(scale ? { spread_scale: scale } : {}) })
const run = (spread: number[], scale?: 'standard-error' | 'standard-deviation') => {
  const { study, name } = withBins(spread)
  return runUncertainty(study, name, { draws: 200, seed: 3, sampling: 'latin-hypercube', precision: 0, inputs: [input(scale)] })
}
const fig = (r: ReturnType<typeof runUncertainty>, key: string) => r.figures.find((f) => f.key === key)!

describe('drawing measured bins within their spread', () => {
  it('adds no spread when the spread is zero: every draw is the plain calculation', () => {
    const r = run(VALUES.map(() => 0), 'standard-deviation')
    for (const key of ['ext', 'sca', 'abs', 'forcing']) {
      const f = fig(r, key)
      expect(f.sd, key).toBe(0)
      expect(f.mean, key).toBe(f.central)
    }
  })

  it('gives the figures the relative spread of the bins when every bin has the same relative spread', () => {
    // every bin × the same lognormal factor of coefficient of variation c (its mean 1): the optics are linear in
    // the distribution, so ext, sca and abs vary by that factor, with relative sd c (a lognormal's moments,
    // Aitchison & Brown 1957), and ω = sca/ext does not move at all
    const c = 0.1
    const sd = run(VALUES.map((v) => c * v), 'standard-deviation')
    for (const key of ['ext', 'sca', 'abs']) {
      const f = fig(sd, key)
      expect(f.sd / f.central, key).toBeCloseTo(c, 2)
      expect(f.mean / f.central, key).toBeCloseTo(1, 2)
    }
    expect(fig(sd, 'ssa').sd).toBeLessThan(1e-12)
    // the standard error of the mean of 9 rows: a third of it (the default)
    const se = run(VALUES.map((v) => c * v))
    expect(fig(se, 'ext').sd / fig(se, 'ext').central).toBeCloseTo(c / Math.sqrt(ROWS), 3)
    expect(se.inputs[0].label).toMatch(/standard error/)
  })

  it('spreads the result more as the spread grows', () => {
    const small = fig(run(VALUES.map((v) => 0.05 * v), 'standard-deviation'), 'forcing').sd
    const large = fig(run(VALUES.map((v) => 0.2 * v), 'standard-deviation'), 'forcing').sd
    expect(small).toBeGreaterThan(0)
    expect(large).toBeGreaterThan(3 * small)
  })

  it('is refused for a sample without a spread, with the fix', () => {
    const study = demoStudy()
    const name = study.samples[0].name
    expect(() => runUncertainty(study, name, { draws: 2, inputs: [input()] })).toThrow(InputError)
    expect(() => runUncertainty(study, name, { draws: 2, inputs: [input()] })).toThrow(/no spread kept with its bins/)
    const { study: s2, name: n2 } = withBins(VALUES.map(() => 1))
    expect(() => runUncertainty(s2, n2, { draws: 2, inputs: [{ ...input(), apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.2 } }] })).toThrow(/offset in units of the spread/)
  })
})
