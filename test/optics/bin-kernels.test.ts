// Per-bin kernels: a distribution's optics as a dot product must match the full integration of the same bins.
import { describe, expect, it } from 'vitest'
import { binOpticsKernels, computeSampleOptics, opticsFromBinKernels, type Sample, type Study } from '../../src-core/index.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('bin kernels', () => {
  it('reproduce the full integration for measured bins (linearity of σ in dN/dlogD)', () => {
    const diameters = Array.from({ length: 31 }, (_, i) => 20 * 1.15 ** i) // nm midpoints
    const values = diameters.map((d) => 3000 * Math.exp(-((Math.log(d / 120) ** 2) / (2 * 0.5 ** 2))))
    const layout = { diameters, diameter_unit: 'nm' as const, edges: false, quantity: 'dN/dlogDp' as const }
    const sample: Sample = {
      name: 'kernel test',
      size: { kind: 'bins', bins: { ...layout, values } },
      composition: { components: [{ material: 'ammonium-sulfate', volume_fraction: 0.9 }, { material: 'black-carbon', volume_fraction: 0.1 }], mixing: 'volume-average' },
      rh_percent: 60,
      rh_history: 'falling',
      layer: { kind: 'depth', depth_m: 1000 }
    }
    const study: Pick<Study, 'wavelengths_nm' | 'user_materials'> = { wavelengths_nm: [450, 550, 700] }
    const full = computeSampleOptics(sample, study, { angularWavelengthsNm: [] })
    const k = binOpticsKernels(sample, study, layout)
    const row = opticsFromBinKernels(k, layout, values)
    row.wavelengths.forEach((w, j) => {
      const f = full.wavelengths[j]
      // both integrate each bin to the 1e-4 tolerance
      expect(rel(w.ext, f.ext)).toBeLessThan(3e-4)
      expect(rel(w.abs, f.abs)).toBeLessThan(3e-4)
      expect(Math.abs(w.g - f.g)).toBeLessThan(3e-4)
    })
    expect(rel(row.number_cm3, full.number_cm3)).toBeLessThan(1e-9)
    // doubling every value doubles every coefficient and leaves ω and g
    const twice = opticsFromBinKernels(k, layout, values.map((v) => 2 * v))
    expect(twice.wavelengths[1].ext).toBeCloseTo(2 * row.wavelengths[1].ext, 9)
    expect(twice.wavelengths[1].g).toBeCloseTo(row.wavelengths[1].g, 12)
  })
})
