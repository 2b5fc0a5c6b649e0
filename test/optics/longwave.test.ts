import { describe, expect, it } from 'vitest'
import {
  LONGWAVE_BANDS,
  computeSampleOptics,
  demoStudy,
  finish,
  parseStudy,
  sampleForcing,
  sampleForcingFigures,
  sampleLongwaveSteps,
  type Sample,
  type Study
} from '../../src-core/index.ts'

const study = demoStudy()
const quarry = study.samples.find((s) => s.name === 'Quarry dust event')!

function constantIndexStudy(n: number, k: number, sample: Sample): Pick<Study, 'user_materials' | 'wavelengths_nm'> {
  return { wavelengths_nm: [550], user_materials: [{ id: 'grey-test', name: 'grey test', index: { kind: 'constant', n, k }, density_g_cm3: 2, kappa: 0 }] }
}

describe('thermal-infrared band optics of a sample', () => {
  it('small particles match the small-particle absorption limit σabs = (6π/λ) V Im((m² − 1)/(m² + 2)) (Bohren & Huffman 1983, eq. 5.11 ff.)', () => {
    // a dry mode of 30 nm median particles with a constant index: at 9 µm (the 8.5–9.5 µm band's one node) x ≤ 0.03
    // over nearly all of the volume, where the Rayleigh absorption term holds to O(x²)
    const N = 5000
    const median = 0.03
    const gsd = 1.5
    const sample: Sample = {
      name: 'fine grey',
      size: { kind: 'modes', modes: [{ by: 'number', number_cm3: N, median_um: median, gsd }] },
      composition: { components: [{ material: 'grey-test', volume_fraction: 1 }], mixing: 'volume-average' },
      rh_percent: 0,
      rh_history: 'rising',
      layer: { kind: 'depth', depth_m: 1000 }
    }
    const m = { re: 1.6, im: 0.4 }
    const lw = finish(sampleLongwaveSteps(sample, constantIndexStudy(m.re, m.im, sample)))
    expect(lw.withheld).toBeNull()
    const i = LONGWAVE_BANDS.findIndex((b) => b.loUm === 8.5)
    expect(LONGWAVE_BANDS[i].nodesUm).toEqual([9])
    // V = N (π/6) D_g³ exp(4.5 ln²σ_g) (Hatch–Choate), µm³ cm⁻³
    const V = N * (Math.PI / 6) * median ** 3 * Math.exp(4.5 * Math.log(gsd) ** 2)
    // (m² − 1)/(m² + 2) with m² = (n² − k²) + 2ink
    const a = m.re * m.re - m.im * m.im
    const b = 2 * m.re * m.im
    const im = (3 * b) / ((a + 2) ** 2 + b * b)
    const limit = ((6 * Math.PI) / 9) * V * im
    expect(Math.abs(lw.bands[i].abs / limit - 1)).toBeLessThan(3e-3)
    // and scattering, ∝ V²/λ⁴, is negligible next to it
    expect(lw.bands[i].ssa).toBeLessThan(1e-3)
  })
  it("refuses to extrapolate: a study's own component tabulated over the visible only leaves the infrared part out, with the reason", () => {
    const s: Study = {
      ...study,
      user_materials: [{ id: 'visible-only', name: 'visible only', index: { kind: 'table', rows: [[0.2, 1.5, 0.01], [3, 1.5, 0.01]] }, density_g_cm3: 1.5, kappa: 0 }],
      samples: [{ ...quarry, composition: { components: [{ material: 'visible-only', volume_fraction: 1 }], mixing: 'volume-average' } }]
    }
    const optics = computeSampleOptics(s.samples[0], s)
    expect(optics.longwave?.bands).toEqual([])
    expect(optics.longwave?.withheld).toMatch(/infrared part is left out/)
    const f = sampleForcing(optics, s.site)
    expect(f.longwave_toa_w_m2).toBeNull()
    expect(f.net_toa_w_m2).toBe(f.thin_layer_w_m2)
    expect(f.longwave_withheld).toMatch(/visible only|visible-only/)
  })
})

describe('the infrared part of a sample forcing', () => {
  it("the demo's quarry dust shows the net verdict: sunlight + infrared, the infrared part warming", () => {
    const f = sampleForcing(computeSampleOptics(quarry, study), study.site, study.verdict_margin_w_m2)
    expect(f.longwave_toa_w_m2).not.toBeNull()
    expect(f.longwave_toa_w_m2!).toBeGreaterThan(0)
    expect(f.net_toa_w_m2).toBeCloseTo(f.thin_layer_w_m2 + f.longwave_toa_w_m2!, 12)
    const word = Math.abs(f.net_toa_w_m2) < f.margin_w_m2 ? 'too close to call' : f.net_toa_w_m2 < 0 ? 'cools' : 'warms'
    expect(f.verdict).toBe(word)
    expect(f.explanation).toMatch(/Net .* sunlight .* thermal infrared/)
  })
  it('sampleForcingFigures (what an uncertainty draw keeps) gives the figures of sampleForcing to the bit, with and without the infrared part', () => {
    const optics = computeSampleOptics(quarry, study)
    const withheld = { ...optics, longwave: undefined }
    for (const o of [optics, withheld]) {
      const full = sampleForcing(o, study.site, study.verdict_margin_w_m2)
      expect(sampleForcingFigures(o, study.site)).toEqual({
        thin_layer_w_m2: full.thin_layer_w_m2,
        daily_mean_w_m2: full.daily_mean_w_m2,
        two_stream_toa_w_m2: full.two_stream.toa_w_m2,
        longwave_toa_w_m2: full.longwave_toa_w_m2,
        net_toa_w_m2: full.net_toa_w_m2
      })
    }
    expect(sampleForcing(withheld, study.site).longwave_toa_w_m2).toBeNull()
  })
  it('a coarse dust layer at 3 km over a hot desert warms in the infrared by a few to about twenty W m⁻² per unit visible AOD (clear sky)', () => {
    // Published satellite estimates of Saharan dust's clear-sky infrared TOA effect run from a few to about 20 W m⁻²
    // per unit visible optical depth (e.g. Zhang & Christopher 2003, Geophys. Res. Lett. 30:2188, about +7 W m⁻²
    // over the Sahara in September 2000; from memory). The check is the sign and the order of magnitude.
    const dust: Sample = { ...quarry, rh_percent: 20, layer: { kind: 'optical-depth', aod_550: 0.5 } }
    const site = { ...study.site, cloud_fraction: 0, surface: 'desert-sand', surface_temperature_k: 315, layer_height_km: 3, water_column_cm: 1.5 }
    const f = sampleForcing(computeSampleOptics(dust, study), site)
    const perTau = f.longwave!.clear_sky_toa_w_m2 / 0.5
    expect(perTau).toBeGreaterThan(2)
    expect(perTau).toBeLessThan(30)
    // it warms the surface more than the top (it sends infrared down), and offsets part of the sunlight cooling
    expect(f.longwave_surface_w_m2!).toBeGreaterThan(f.longwave_toa_w_m2!)
  })
  it("over desert sand the surface type's emissivity by band is used (quartz's 8.5–9.5 µm dip, Salisbury & D'Aria 1992, from memory), unless the site gives its own, which is grey", () => {
    const optics = computeSampleOptics(quarry, study)
    const sand = { ...study.site, surface: 'desert-sand', surface_albedo: undefined, surface_emissivity: undefined }
    const byBand = sampleForcing(optics, sand).longwave!
    expect(byBand.surface_emissivity_bands).toHaveLength(LONGWAVE_BANDS.length)
    const dip = LONGWAVE_BANDS.findIndex((b) => b.loUm === 8.5)
    expect(byBand.surface_emissivity_bands![dip]).toBeLessThan(Math.min(...byBand.surface_emissivity_bands!.filter((_, i) => i !== dip)))
    const grey = sampleForcing(optics, { ...sand, surface_emissivity: 0.9 }).longwave!
    expect(grey.surface_emissivity_bands).toBeNull()
    // the surface emits less in the dip, so the clean window sends less up: the figures differ, with the same sign
    expect(byBand.clear_sky_toa_w_m2).not.toBe(grey.clear_sky_toa_w_m2)
    expect(Math.sign(byBand.clear_sky_toa_w_m2)).toBe(Math.sign(grey.clear_sky_toa_w_m2))
    // a grey surface type has none
    expect(sampleForcing(optics, { ...study.site, surface: 'forest', surface_albedo: undefined, surface_emissivity: undefined }).longwave!.surface_emissivity_bands).toBeNull()
  })
  it('refuses out-of-range infrared site inputs at their field, with the range and the reason', () => {
    const text = (site: Record<string, unknown>) => JSON.stringify({ ...study, site: { ...study.site, ...site } })
    for (const [field, value] of [['surface_temperature_k', 20], ['surface_emissivity', 1.3], ['layer_height_km', 40], ['water_column_cm', 25]] as const) {
      const r = parseStudy(text({ [field]: value }))
      expect(r.ok).toBe(false)
      if (r.ok) continue
      const p = r.problems.find((q) => q.path === `site.${field}`)
      expect(p, field).toBeDefined()
      expect(p!.message).toMatch(/outside .* to .*\(/)
    }
  })
})
