// A sample computed in shares of its wavelengths (as the app's workers split it) and then assembled must be the
// sample computed whole: the same size ranges, the same integration, the same derived figures.
import { describe, expect, it } from 'vitest'
import { assembleSampleOptics, computeSampleOptics, demoStudy, finish, OpticsWorkspace, sampleBulkSteps } from '../../src-core/index.ts'

describe('a computation split by wavelength', () => {
  const study = { ...demoStudy(), wavelengths_nm: [350, 550, 700, 1000, 2500] }
  for (const sample of study.samples.filter((s) => s.name.startsWith('Humid') || s.name.startsWith('Aged'))) {
    it(`assembles to the whole computation: ${sample.name}`, () => {
      const whole = computeSampleOptics(sample, study)
      // two shares, each with its own workspace, assembled in another order than the study's
      const a = finish(sampleBulkSteps(sample, study, { only: [2500, 550], workspace: new OpticsWorkspace() }))
      const b = finish(sampleBulkSteps(sample, study, { only: [1000, 350, 700], workspace: new OpticsWorkspace() }))
      const split = assembleSampleOptics(sample, study, [...b, ...a])
      expect(split.wavelengths.map((w) => w.wavelength_nm)).toEqual(study.wavelengths_nm)
      split.wavelengths.forEach((w, i) => {
        const v = whole.wavelengths[i]
        for (const key of ['ext', 'sca', 'abs', 'g', 'upscatter_fraction', 'mass_ext_dry', 'optical_depth', 'visual_range_km'] as const) {
          expect(w[key]).toBe(v[key])
        }
      })
      expect(split.angstrom_fit).toEqual(whole.angstrom_fit)
      expect(split.angular).toEqual(whole.angular)
    })
  }
})
