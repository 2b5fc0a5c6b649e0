// The size range a computation integrates over (src-core/optics/sample.ts, modeSegment): a looser tolerance may
// stop sooner among large particles, never among small ones, and stays within its tolerance.
import { erf } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { computeSampleOptics, demoStudy, samplePopulations, studyMaterials, type Sample } from '../../src-core/index.ts'

const study = demoStudy()
const own = studyMaterials(study)
const longest = Math.max(...study.wavelengths_nm) / 1000
const named = (start: string): Sample => study.samples.find((s) => s.name.startsWith(start))!
const coarseOnly = (s: Sample): Sample => (s.size.kind === 'modes' ? { ...s, size: { ...s.size, modes: s.size.modes.slice(-1) } } : s)

/** The share of a lognormal's k-th moment above D (Hatch–Choate: that moment is lognormal with ln median ln D_g + k ln²σ_g; Hinds 1999, ch. 4). */
function momentAbove(d: number, dg: number, gsd: number, k: number): number {
  const l = Math.log(gsd)
  return 0.5 * (1 - (erf((Math.log(d) - Math.log(dg) - k * l * l) / (Math.SQRT2 * l)) as number))
}

describe('integration range', () => {
  it('a coarse mode: the full range leaves out 1e-5 of its second moment (a tenth of the tolerance; both tails), a quick pass 1e-3', () => {
    const sample = coarseOnly(named('Quarry dust'))
    const [full] = samplePopulations(sample, own, longest)
    const [quick] = samplePopulations(sample, own, longest, 1e-2)
    const mode = full.mode!
    // the upper tail is half of the two-sided share
    expect(momentAbove(Math.exp(full.segments[0].hi), mode.median, mode.gsd, 2) / 0.5e-5).toBeCloseTo(1, 2)
    expect(momentAbove(Math.exp(quick.segments[0].hi), mode.median, mode.gsd, 2) / 0.5e-3).toBeCloseTo(1, 2)
    // where it stops, particles are large next to every wavelength
    expect((Math.PI * Math.exp(quick.segments[0].hi)) / longest).toBeGreaterThan(20)
    expect(quick.segments[0].lo).toBe(full.segments[0].lo)
  })

  it('a fine mode keeps its full range under a loose tolerance (its Q_ext still climbs steeply there)', () => {
    const sample = named('Winter wood smoke')
    const full = samplePopulations(sample, own, longest)
    const quick = samplePopulations(sample, own, longest, 1e-2)
    expect(quick.length).toBe(full.length)
    quick.forEach((p, i) => {
      expect(p.segments[0].lo).toBe(full[i].segments[0].lo)
      expect(p.segments[0].hi).toBe(full[i].segments[0].hi)
    })
  })

  for (const name of ['Quarry dust', 'Coastal haze']) {
    it(`${name}: a pass at tolerance 1e-2 stays within 1e-2 of the full figures at every wavelength`, () => {
      const sample = named(name)
      const quick = computeSampleOptics(sample, study, { tolerance: 1e-2, coarsestStep: 2 })
      const full = computeSampleOptics(sample, study)
      quick.wavelengths.forEach((q, i) => {
        const f = full.wavelengths[i]
        expect(Math.abs(q.ext / f.ext - 1)).toBeLessThan(1e-2)
        expect(Math.abs(q.sca / f.sca - 1)).toBeLessThan(1e-2)
        expect(Math.abs(q.abs - f.abs) / f.ext).toBeLessThan(1e-2)
        expect(Math.abs(q.g - f.g)).toBeLessThan(1e-2)
        // b and β̄ are fractions, held like g in absolute terms (README). The quick pass's angular sums stop at
        // level 2 without the control variate; the full pass's go further (integrate.ts), so their difference
        // is the quick pass's own error, up to about 1e-3 on this lossless coarse sample.
        expect(Math.abs(q.backscatter_fraction - f.backscatter_fraction)).toBeLessThan(1e-2)
        expect(Math.abs(q.upscatter_fraction - f.upscatter_fraction)).toBeLessThan(1e-2)
      })
    })
  }
})
