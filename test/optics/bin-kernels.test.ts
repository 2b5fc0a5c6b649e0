// Per-bin kernels: a distribution's optics as a dot product must match the full integration of the same bins.
import { describe, expect, it } from 'vitest'
import { binKernelsInputs, binnedRowEvaluator, binnedRowWidth, binOpticsKernels, computeSampleOptics, InputError, opticsFromBinKernels, packBinKernels, type BinLayout, type Sample, type Study } from '../../src-core/index.ts'

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

  it('the per-row evaluator of long series gives opticsFromBinKernels\'s numbers bit for bit, for every quantity, and its errors', () => {
    // Same arithmetic in the same order (a faster path, not a new method): the numbers must be identical.
    const diameters = Array.from({ length: 12 }, (_, i) => 30 * 1.3 ** i)
    const sample: Pick<Sample, 'name' | 'composition' | 'rh_percent' | 'rh_history' | 'temperature_k'> = {
      name: 'evaluator test',
      composition: { components: [{ material: 'ammonium-sulfate', volume_fraction: 0.8 }, { material: 'black-carbon', volume_fraction: 0.2 }], mixing: 'volume-average' },
      rh_percent: 40,
      rh_history: 'falling'
    }
    const study = { wavelengths_nm: [450, 700] }
    for (const quantity of ['dN/dlogDp', 'dN', 'dS/dlogDp', 'dV/dlogDp', 'dM/dlogDp'] as const) {
      const layout: BinLayout = { diameters, diameter_unit: 'nm', edges: false, quantity }
      const k = binOpticsKernels(sample, study, layout, { tolerance: 1e-3 })
      const evaluate = binnedRowEvaluator(k, layout)
      const rows = [diameters.map((d, i) => 1000 * Math.exp(-i / 3) + d / 7), diameters.map(() => 0), diameters.map((_, i) => (i % 3 === 0 ? 0.5 : 1e-7 * i))]
      const packed = Float64Array.from(rows.flat())
      const out = new Float64Array(binnedRowWidth(k) * rows.length)
      rows.forEach((_, r) => evaluate(packed, r * diameters.length, out, r * binnedRowWidth(k)))
      rows.forEach((values, r) => {
        const o = opticsFromBinKernels(k, layout, values)
        const want = [...o.wavelengths.flatMap((w) => [w.ext, w.sca, w.abs, w.ssa, w.g]), o.number_cm3, o.volume_um3_cm3, o.mass_ug_m3]
        expect(Array.from(out.subarray(r * want.length, (r + 1) * want.length)), quantity).toEqual(want) // toEqual: same doubles (NaN equals NaN)
      })
      // a negative value: the same InputError as binsFromMeasurement's
      const bad = rows[0].slice()
      bad[4] = -1
      let mine: unknown
      let theirs: unknown
      try { evaluate(bad, 0, out, 0) } catch (e) { mine = e }
      try { opticsFromBinKernels(k, layout, bad) } catch (e) { theirs = e }
      expect(mine).toBeInstanceOf(InputError)
      expect((mine as Error).message).toBe((theirs as Error).message)
    }
  })
})

describe('bin kernels kept between runs (packBinKernels, binKernelsInputs)', () => {
  const diameters = Array.from({ length: 9 }, (_, i) => 40 * 1.4 ** i)
  const layout: BinLayout = { diameters, diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp' }
  const sample: Pick<Sample, 'name' | 'composition' | 'rh_percent' | 'rh_history' | 'temperature_k'> = {
    name: 'cache test',
    composition: { components: [{ material: 'ammonium-sulfate', volume_fraction: 0.85 }, { material: 'black-carbon', volume_fraction: 0.15 }], mixing: 'volume-average' },
    rh_percent: 70,
    rh_history: 'falling'
  }
  const study = { wavelengths_nm: [450, 550, 700] }

  it('kernels made from their packed figures are the integrated ones, bit for bit; a packed array of another size is refused', () => {
    const k = binOpticsKernels(sample, study, layout, { tolerance: 1e-3 })
    const packed = packBinKernels(k)
    expect(packed.length).toBe(4 * 9 * 3)
    const again = binOpticsKernels(sample, study, layout, { tolerance: 1e-3, integrated: packed })
    for (const key of ['ext', 'sca', 'abs', 'gsca'] as const) {
      for (let j = 0; j < 3; j++) expect(Array.from(again[key][j]).every((v, i) => Object.is(v, k[key][j][i]))).toBe(true)
    }
    expect(Array.from(again.edgesUm)).toEqual(Array.from(k.edgesUm))
    expect(Array.from(again.volumeWeights)).toEqual(Array.from(k.volumeWeights))
    expect(again.kind.densityGcm3).toBe(k.kind.densityGcm3)
    // a row through either gives the same figures
    const values = diameters.map((d) => 1000 * Math.exp(-((Math.log(d / 150) ** 2) / 0.5)))
    expect(opticsFromBinKernels(again, layout, values)).toEqual(opticsFromBinKernels(k, layout, values))
    expect(() => binOpticsKernels(sample, study, layout, { integrated: packed.subarray(1) })).toThrow(/107 values given for 9 bins at 3 wavelengths/)
  })

  it('the inputs text changes with every input the figures depend on, and not with the order of keys or the sample name', () => {
    const base = binKernelsInputs(sample, study, layout, 1e-4)
    const reordered = binKernelsInputs({ rh_history: 'falling', rh_percent: 70, composition: { mixing: 'volume-average', components: sample.composition.components.map((c) => ({ volume_fraction: c.volume_fraction, material: c.material })) } }, { wavelengths_nm: [450, 550, 700] }, { quantity: 'dN/dlogDp', edges: false, diameter_unit: 'nm', diameters }, 1e-4)
    expect(reordered).toBe(base)
    expect(binKernelsInputs({ ...sample, name: 'another name' } as typeof sample, study, layout, 1e-4)).toBe(base)
    const changed = [
      binKernelsInputs({ ...sample, rh_percent: 71 }, study, layout, 1e-4),
      binKernelsInputs({ ...sample, rh_history: 'rising' }, study, layout, 1e-4),
      binKernelsInputs({ ...sample, temperature_k: 280 }, study, layout, 1e-4),
      binKernelsInputs({ ...sample, composition: { ...sample.composition, mixing: 'maxwell-garnett' } }, study, layout, 1e-4),
      binKernelsInputs(sample, { wavelengths_nm: [450, 550, 701] }, layout, 1e-4),
      binKernelsInputs(sample, { ...study, user_materials: [{ name: 'x', n: 1.5, k: 0, density_gcm3: 1.5, kappa: 0.1 } as never] }, layout, 1e-4),
      binKernelsInputs(sample, study, { ...layout, diameters: diameters.map((d, i) => (i === 4 ? d * (1 + 1e-12) : d)) }, 1e-4),
      binKernelsInputs(sample, study, { ...layout, diameter_unit: 'um' }, 1e-4),
      binKernelsInputs(sample, study, { ...layout, edges: true }, 1e-4),
      binKernelsInputs(sample, study, layout, 1e-5)
    ]
    expect(new Set([base, ...changed]).size).toBe(changed.length + 1)
  })
})
