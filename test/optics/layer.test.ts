// The layer a sample fills, its optical depth, and what the forcing makes of it (src-core/optics/sample.ts and
// forcing.ts): a uniform depth, an exponential profile of given scale height, or an optical depth given at 550 nm.
import { describe, expect, it } from 'vitest'
import { computeSampleOptics, demoStudy, sampleForcing, sampleForcingMap, type Sample, type SampleOptics } from '../../src-core/index.ts'

const study = { ...demoStudy(), wavelengths_nm: [450, 550, 700] }
const smoke = study.samples.find((s) => s.name.startsWith('Winter wood'))!
const withLayer = (layer: Sample['layer'], s: Sample = smoke): Sample => ({ ...s, layer })
const optics = (s: Sample, st: { wavelengths_nm: number[] } = study): SampleOptics => computeSampleOptics(s, { ...study, ...st })

describe('optical depth of the layer', () => {
  it('a uniform layer: τ = σext × depth at every wavelength (Beer–Lambert, common practice; Mm⁻¹ × m = 1e-6)', () => {
    const o = optics(withLayer({ kind: 'depth', depth_m: 1200 }))
    for (const w of o.wavelengths) expect(w.optical_depth).toBeCloseTo(w.ext * 1e-6 * 1200, 14)
  })

  it('an exponential profile of scale height H holds the same τ as a uniform layer H deep (∫₀^∞ e^(−z/H) dz = H, common practice)', () => {
    const a = optics(withLayer({ kind: 'scale-height', scale_height_m: 1500 }))
    const b = optics(withLayer({ kind: 'depth', depth_m: 1500 }))
    a.wavelengths.forEach((w, i) => expect(w.optical_depth).toBe(b.wavelengths[i].optical_depth))
  })

  it('a given AOD at 550 nm sets τ there; the other wavelengths follow the spectrum of σext', () => {
    const o = optics(withLayer({ kind: 'optical-depth', aod_550: 0.3 }))
    const at550 = o.wavelengths.find((w) => w.wavelength_nm === 550)!
    expect(at550.optical_depth).toBeCloseTo(0.3, 14)
    for (const w of o.wavelengths) expect(w.optical_depth / 0.3).toBeCloseTo(w.ext / at550.ext, 12)
  })

  it('a given AOD at 550 nm when 550 nm is not computed: the Ångström (log–log) interpolation of τ at 550 nm gives it back', () => {
    const o = optics(withLayer({ kind: 'optical-depth', aod_550: 0.2 }), { wavelengths_nm: [450, 700] })
    const [a, b] = o.wavelengths
    const t = Math.log(550 / 450) / Math.log(700 / 450)
    expect(Math.exp((1 - t) * Math.log(a.optical_depth) + t * Math.log(b.optical_depth))).toBeCloseTo(0.2, 12)
  })

  it('refuses a negative depth, naming the field and the fix', () => {
    expect(() => optics(withLayer({ kind: 'depth', depth_m: -5 }))).toThrow(/layer: depth_m.*-5 m is not a depth.*0 or more/s)
  })
})

describe('the forcing of the layer', () => {
  it('no layer, no forcing: a depth of 0 gives τ = 0, ΔF = 0 and "too close to call"', () => {
    const f = sampleForcing(optics(withLayer({ kind: 'depth', depth_m: 0 })), study.site)
    expect(f.tau_550).toBe(0)
    expect(Math.abs(f.thin_layer_w_m2)).toBe(0)
    expect(f.two_stream.toa_w_m2).toBeCloseTo(0, 12)
    expect(f.verdict).toBe('too close to call')
  })

  it('in the thin limit the forcing is proportional to τ (Chylek & Wong 1995, GRL 22, 929: ΔF ∝ τ)', () => {
    const f1 = sampleForcing(optics(withLayer({ kind: 'optical-depth', aod_550: 0.02 })), study.site)
    const f2 = sampleForcing(optics(withLayer({ kind: 'optical-depth', aod_550: 0.04 })), study.site)
    expect(f2.thin_layer_w_m2 / f1.thin_layer_w_m2).toBeCloseTo(2, 10)
    // the efficiency (forcing per unit τ) does not depend on τ
    expect(f2.efficiency_w_m2_per_tau).toBeCloseTo(f1.efficiency_w_m2_per_tau, 10)
    // the two-stream model agrees in the thin limit to first order: twice the τ, nearly twice the forcing
    expect(f2.two_stream.toa_w_m2 / f1.two_stream.toa_w_m2).toBeGreaterThan(1.9)
    expect(f2.two_stream.toa_w_m2 / f1.two_stream.toa_w_m2).toBeLessThan(2.05)
  })
})

describe('the forcing map', () => {
  const soot: Sample = {
    ...smoke,
    name: 'bare soot',
    size: { kind: 'modes', modes: [{ by: 'number', name: 'soot', number_cm3: 5000, median_um: 0.08, gsd: 1.5 }] },
    composition: { components: [{ material: 'black-carbon', volume_fraction: 1 }], mixing: 'volume-average' },
    rh_percent: 0,
    layer: { kind: 'optical-depth', aod_550: 0.05 }
  }

  it('spans ω from 0.5 to 1 for a weakly absorbing sample, and reaches below a strongly absorbing one (bare soot, ω < 0.5, common practice)', () => {
    const weak = sampleForcing(optics(smoke), study.site)
    expect(weak.ssa_550).toBeGreaterThan(0.55)
    const weakMap = sampleForcingMap(weak, study.site)
    expect(weakMap.ssa[0]).toBe(0.5)
    expect(weakMap.ssa.at(-1)).toBe(1)

    const strong = sampleForcing(optics(soot), study.site)
    expect(strong.ssa_550).toBeLessThan(0.5)
    const map = sampleForcingMap(strong, study.site)
    expect(map.ssa[0]).toBeLessThanOrEqual(strong.ssa_550 - 0.05)
    expect(map.ssa.at(-1)).toBe(1)
    expect(map.sample).toEqual([strong.surface_albedo, strong.ssa_550])
  })

  it('at the sample’s own surface albedo and ω, the map reads the sample’s thin-layer forcing (bilinear within 1 %)', () => {
    for (const s of [smoke, soot]) {
      const f = sampleForcing(optics(s), study.site)
      const map = sampleForcingMap(f, study.site)
      const [rs, w] = map.sample
      const i = Math.min(map.surface_albedo.length - 2, map.surface_albedo.findIndex((x) => x > rs) - 1)
      const j = Math.min(map.ssa.length - 2, map.ssa.findIndex((x) => x > w) - 1)
      const tx = (rs - map.surface_albedo[i]) / (map.surface_albedo[i + 1] - map.surface_albedo[i])
      const ty = (w - map.ssa[j]) / (map.ssa[j + 1] - map.ssa[j])
      const v =
        (1 - ty) * ((1 - tx) * map.forcing[j][i] + tx * map.forcing[j][i + 1]) + ty * ((1 - tx) * map.forcing[j + 1][i] + tx * map.forcing[j + 1][i + 1])
      expect(Math.abs(v - f.thin_layer_w_m2)).toBeLessThan(0.01 * Math.abs(f.thin_layer_w_m2))
    }
  })
})

describe('warnings where a figure leaves its method’s range', () => {
  const one = { ...study, wavelengths_nm: [550] }
  const opticsAt550 = (s: Sample) => computeSampleOptics(s, one, { tolerance: 1e-3, angularWavelengthsNm: [] })

  it('the demo’s humid sulfate–nitrate layer (τ ≈ 2) carries the thin-layer warning naming its two-stream figure; a thin layer of the same particles none', () => {
    const humid = study.samples.find((s) => s.name.startsWith('Humid sulfate'))!
    const f = sampleForcing(opticsAt550(humid), study.site)
    expect(f.tau_550).toBeGreaterThan(1)
    expect(f.warnings).toHaveLength(1)
    expect(f.warnings[0]).toContain(`${Number(f.two_stream.toa_w_m2.toPrecision(3))} W m⁻²`)
    expect(f.warnings[0]).toMatch(/Use the two-stream figure/)
    const thin = sampleForcing(opticsAt550(withLayer({ kind: 'optical-depth', aod_550: 0.01 }, humid)), study.site)
    expect(thin.warnings).toEqual([])
  })

  it('the sample’s two-stream layer uses its β̄, so in the thin limit it meets the thin-layer figure (within 10τ of the forcing scale; Chylek & Wong 1995 as the τ → 0 limit, see twoStream.ts)', () => {
    const f = sampleForcing(opticsAt550(withLayer({ kind: 'optical-depth', aod_550: 1e-3 })), study.site)
    const scale = (1361 / 4) * study.site.transmittance ** 2 * (1 - study.site.cloud_fraction) * f.tau_550
    expect(Math.abs(f.two_stream.toa_w_m2 - f.thin_layer_w_m2)).toBeLessThan(10 * f.tau_550 * scale)
  })

  it('a sample at 97 % RH carries the near-saturation warning on its optics; at 80 % it does not (κ-Köhler, Petters & Kreidenweis 2007)', () => {
    const humid = study.samples.find((s) => s.name.startsWith('Humid sulfate'))!
    expect(opticsAt550({ ...humid, rh_percent: 97 }).warnings.join(' ')).toMatch(/97 % RH.*κ-Köhler/)
    expect(opticsAt550({ ...humid, rh_percent: 80 }).warnings).toEqual([])
  })
})
