// A sample computed in shares of its wavelengths (as the app's workers split it) and then assembled must be the
// sample computed whole: the same size ranges, the same integration, the same derived figures.
import { describe, expect, it } from 'vitest'
import {
  assembleSampleOptics,
  computeSampleOptics,
  demoStudy,
  finish,
  HUMIDITY_CURVE_RH,
  humidityCurveFrom,
  humidityCurveKey,
  humidityGrowthCurve,
  humidityScatteringSteps,
  OpticsWorkspace,
  sampleBulkSteps
} from '../../src-core/index.ts'

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

describe('an f(RH) curve split by humidity', () => {
  it('assembles to the whole curve', () => {
    const study = demoStudy()
    const i = study.samples.findIndex((s) => s.name.startsWith('Humid'))
    const whole = humidityGrowthCurve(study, i)
    const odd = HUMIDITY_CURVE_RH.filter((_, k) => k % 2 === 1)
    const even = HUMIDITY_CURVE_RH.filter((_, k) => k % 2 === 0)
    const a = finish(humidityScatteringSteps(study, i, even, new OpticsWorkspace()))
    const b = finish(humidityScatteringSteps(study, i, odd, new OpticsWorkspace()))
    const split = humidityCurveFrom(HUMIDITY_CURVE_RH.map((_, k) => (k % 2 ? b[(k - 1) / 2] : a[k / 2])))
    expect(split).toEqual(whole)
    // the curve is σsca(RH)/σsca(0): it starts at 1 and, for this hygroscopic sample, does not fall with humidity
    // (within the curve's integration tolerance, HUMIDITY_CURVE_TOLERANCE = 1e-3, twice over for a ratio) and is
    // well above 1 at 95 % (water uptake more than doubles the volume of such particles; common practice)
    expect(split.f[0]).toBe(1)
    for (let k = 1; k < split.f.length; k++) expect(split.f[k]).toBeGreaterThanOrEqual(split.f[k - 1] - 2e-3)
    expect(split.f[split.f.length - 1]).toBeGreaterThan(1.5)
  })
})

describe('the inputs of an f(RH) curve', () => {
  // humidityCurveKey tells the app's worker when a curve it has worked out still holds; checked here against the
  // computation itself, not against the list of fields the key is made of.
  const study = demoStudy()
  const i = study.samples.findIndex((s) => s.name.startsWith('Humid'))
  const base = study.samples[i]
  const withSample = (sample: typeof base, patch: Partial<typeof study> = {}) => ({ ...study, ...patch, samples: study.samples.map((s, k) => (k === i ? sample : s)) })
  const whole = humidityGrowthCurve(study, i)

  it('a change of humidity, layer, name, site or wavelengths keeps the key, and the curve is the same', () => {
    const edited = withSample(
      { ...base, name: 'renamed', rh_percent: base.rh_percent - 17, layer: { kind: 'depth', depth_m: 321 } },
      { wavelengths_nm: [450, 700], site: { ...study.site, latitude_deg: study.site.latitude_deg - 20 } }
    )
    expect(humidityCurveKey(edited, i)).toBe(humidityCurveKey(study, i))
    expect(humidityGrowthCurve(edited, i)).toEqual(whole)
  })

  it('a change of humidity branch or of the size distribution changes the key, and the curve', () => {
    // the salts of this sample effloresce and deliquesce at different humidities (hysteresis), so the branch matters
    const branch = withSample({ ...base, rh_history: base.rh_history === 'rising' ? 'falling' : 'rising' })
    expect(humidityCurveKey(branch, i)).not.toBe(humidityCurveKey(study, i))
    expect(humidityGrowthCurve(branch, i).f).not.toEqual(whole.f)
    if (base.size.kind !== 'modes') throw new Error('the demo sample is given by modes')
    const wider = withSample({ ...base, size: { ...base.size, modes: base.size.modes.map((m) => ({ ...m, gsd: m.gsd + 0.2 })) } })
    expect(humidityCurveKey(wider, i)).not.toBe(humidityCurveKey(study, i))
  })
})
