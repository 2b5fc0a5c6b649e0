// Bulk optics of populations against limits and published figures of the trade.
import { describe, expect, it } from 'vitest'
import {
  bulkOpticsAt,
  computeSampleOptics,
  localAngstromExponents,
  deciview,
  modeFromMass,
  moment,
  rayleighScatteringMm,
  sizeDistributionCurves,
  visualRangeKm,
  type Sample,
  type Study
} from '../../src-core/index.ts'
import { DRY, modePopulation } from './helpers.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

function oneModeStudy(mode: Sample['size'], composition: Sample['composition'], wavelengths: number[], rh = 0): { study: Study; sample: Sample } {
  const sample: Sample = { name: 'test', size: mode, composition, rh_percent: rh, rh_history: 'falling', layer: { kind: 'depth', depth_m: 1000 } }
  const study: Study = {
    format: 'motebench-study', version: 2, name: 'test', wavelengths_nm: wavelengths, samples: [sample],
    site: { latitude_deg: 45, day_of_year: 172, cloud_fraction: 0.6, transmittance: 0.76, surface: 'cropland' }
  }
  return { study, sample }
}

describe('limits', () => {
  it('a population far larger than the wavelength extinguishes twice its geometric cross-section (extinction paradox, van de Hulst 1957)', () => {
    // Qext − 2 shrinks as x^(−2/3) (van de Hulst 1957, §17.4, from memory): ten times larger particles bring
    // the excess down by about 10^(−2/3) ≈ 0.22, and at x ≈ 3000 it is below 1 %.
    const excess = (median: number) => {
      const { pop, mode } = modePopulation(median, 1.2, 1.53, 0.01, 1)
      const r = bulkOpticsAt([pop], 0.55, DRY)
      return r.ext / ((Math.PI / 4) * moment(mode, 2)) - 2
    }
    const near = excess(60)
    const far = excess(600)
    expect(far / near).toBeGreaterThan(0.15)
    expect(far / near).toBeLessThan(0.3)
    expect(Math.abs(far)).toBeLessThan(0.01)
  })

  it('Rayleigh limit: σsca follows the sixth moment and λ⁻⁴ (Bohren & Huffman 1983, ch. 5; Hatch–Choate moments)', () => {
    const n = 1.5
    const { pop, mode } = modePopulation(0.004, 1.5, n, 0, 1e5)
    const L = (n * n - 1) / (n * n + 2)
    for (const wl of [0.45, 0.7]) {
      const r = bulkOpticsAt([pop], wl, DRY)
      // C_sca = (2π⁵/3) |L|² D⁶ / λ⁴ summed over the mode: (2π⁵/3) |L|² M₆ / λ⁴
      const expected = ((2 * Math.PI ** 5) / 3) * L * L * (moment(mode, 6) / wl ** 4)
      expect(rel(r.sca, expected)).toBeLessThan(2e-3) // next order O(x²) with x ≲ 0.1 at the 6th-moment median
      expect(r.abs).toBe(0)
      // tiny spheres scatter symmetrically forward and back: b = β̄ = 1/2 for the Rayleigh phase function,
      // with a forward bias of order g = O(x²) as the spheres grow
      expect(Math.abs(r.backscatter - 0.5)).toBeLessThan(Math.max(2 * r.g, 1e-6))
      expect(Math.abs(r.upscatterMean - 0.5)).toBeLessThan(Math.max(2 * r.g, 1e-6))
      expect(r.g).toBeLessThan(0.01)
    }
  })

  it('Ångström exponent of extinction is near 4 for tiny particles and near 0 for coarse dust (common practice)', () => {
    const tiny = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 1e5, median_um: 0.005, gsd: 1.5 }] }, { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' }, [450, 550, 700])
    const a = computeSampleOptics(tiny.sample, tiny.study, { angularWavelengthsNm: [] })
    // the index varies a little with λ, so 4 within 0.1
    expect(Math.abs(a.angstrom_fit.ext - 4)).toBeLessThan(0.1)
    const dust = oneModeStudy({ kind: 'modes', modes: [{ by: 'mass', mass_ug_m3: 100, median_um: 4, gsd: 1.8 }] }, { components: [{ material: 'mineral-dust', volume_fraction: 1 }], mixing: 'volume-average' }, [450, 550, 700])
    const d = computeSampleOptics(dust.sample, dust.study, { angularWavelengthsNm: [] })
    expect(Math.abs(d.angstrom_fit.ext)).toBeLessThan(0.3)
  })

  it('the Ångström exponent at each wavelength: exact for a power law, and near 4 at every wavelength for tiny particles (common practice)', () => {
    // σ ∝ λ^(−1.3) on an uneven grid: every local exponent is 1.3 (Ångström 1929)
    const wl = [340, 370, 450, 520, 660, 880, 950]
    for (const a of localAngstromExponents(wl, wl.map((l) => 7 * l ** -1.3))) expect(a).toBeCloseTo(1.3, 12)
    // a curved spectrum: the exponent follows the local slope −d ln σ/d ln λ; ln σ = −(ln λ)²/2 has slope −ln λ,
    // and the centred secant of a parabola is its slope at the midpoint of the neighbours' ln λ
    const curved = localAngstromExponents(wl, wl.map((l) => Math.exp(-(Math.log(l) ** 2) / 2)))
    for (let i = 1; i < wl.length - 1; i++) expect(curved[i]).toBeCloseTo((Math.log(wl[i - 1]) + Math.log(wl[i + 1])) / 2, 12)
    expect(localAngstromExponents([550], [10])[0]).toBeNaN()
    expect(localAngstromExponents([450, 550], [0, 10])).toEqual([NaN, NaN])
    const tiny = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 1e5, median_um: 0.005, gsd: 1.5 }] }, { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' }, [400, 450, 550, 700, 1000])
    const rows = computeSampleOptics(tiny.sample, tiny.study, { angularWavelengthsNm: [] }).wavelengths
    for (const r of rows) expect(Math.abs(r.angstrom_ext - 4)).toBeLessThan(0.15)
  })
})

describe('published mass efficiencies', () => {
  it('dry ammonium sulfate scatters about 3 m² g⁻¹ at 550 nm (Malm et al. 1994, J. Geophys. Res. 99:1347, IMPROVE dry sulfate)', () => {
    // an accumulation mode with mass median diameter 0.3 µm, σg 2 (common practice for aged sulfate)
    const s = oneModeStudy({ kind: 'modes', modes: [{ by: 'mass', mass_ug_m3: 10, median_um: 0.3, gsd: 2 }] }, { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' }, [550])
    const r = computeSampleOptics(s.sample, s.study, { angularWavelengthsNm: [] })
    expect(r.wavelengths[0].mass_sca_dry).toBeGreaterThan(2.5)
    expect(r.wavelengths[0].mass_sca_dry).toBeLessThan(3.5)
  })

  it('fresh black carbon absorbs about 7.5 m² g⁻¹ at 550 nm (Bond & Bergstrom 2006, Aerosol Sci. Technol. 40:27)', () => {
    // Bond & Bergstrom give 7.5 ± 1.2 for fresh soot; Mie spheres of their recommended index
    // (1.95 + 0.79i, density 1.8) sit at the low side of it, so the check is the ±25 % band.
    const s = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 1000, median_um: 0.12, gsd: 1.5 }] }, { components: [{ material: 'black-carbon', volume_fraction: 1 }], mixing: 'volume-average' }, [550])
    const r = computeSampleOptics(s.sample, s.study, { angularWavelengthsNm: [] })
    expect(r.wavelengths[0].mass_abs_dry).toBeGreaterThan(7.5 * 0.75)
    expect(r.wavelengths[0].mass_abs_dry).toBeLessThan(7.5 * 1.25)
  })
})

describe('water uptake and derived figures', () => {
  it('f(RH) exceeds 1 and grows with humidity for a hygroscopic salt, and is 1 without uptake (Petters & Kreidenweis 2007)', () => {
    const mk = (material: string, rh: number) => {
      const s = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 1000, median_um: 0.15, gsd: 1.6 }] }, { components: [{ material, volume_fraction: 1 }], mixing: 'volume-average' }, [550], rh)
      return computeSampleOptics(s.sample, s.study, { angularWavelengthsNm: [] }).wavelengths[0].sca
    }
    const dry = mk('ammonium-sulfate', 0)
    const f70 = mk('ammonium-sulfate', 70) / dry
    const f90 = mk('ammonium-sulfate', 90) / dry
    expect(f70).toBeGreaterThan(1.2)
    expect(f90).toBeGreaterThan(f70)
    // soot does not take up water (κ = 0): no change
    expect(mk('black-carbon', 90) / mk('black-carbon', 0)).toBeCloseTo(1, 12)
  })

  it('the mode and its measured bins agree (flat-in-log-D bins, 64 bins per decade)', () => {
    const mode = modeFromMass({ mass: 10, massMedian: 0.35, gsd: 1.8, density: 1.77 })
    const edges: number[] = []
    for (let i = 0; i <= 192; i++) edges.push(0.01 * 10 ** (i / 64))
    const ln = Math.log(mode.gsd)
    const values = edges.slice(0, -1).map((e, i) => {
      const mid = Math.sqrt(e * edges[i + 1])
      return (mode.number / (Math.sqrt(2 * Math.PI) * ln * Math.LOG10E)) * Math.exp(-((Math.log(mid / mode.median) ** 2) / (2 * ln * ln)))
    })
    const comp: Sample['composition'] = { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' }
    const a = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: mode.number, median_um: mode.median, gsd: mode.gsd }] }, comp, [550])
    const b = oneModeStudy({ kind: 'bins', bins: { diameters: edges, diameter_unit: 'um', edges: true, quantity: 'dN/dlogDp', values } }, comp, [550])
    const ra = computeSampleOptics(a.sample, a.study, { angularWavelengthsNm: [] }).wavelengths[0]
    const rb = computeSampleOptics(b.sample, b.study, { angularWavelengthsNm: [] }).wavelengths[0]
    // the bins sample the lognormal at their midpoints: agreement to the binning error (~1e-3)
    expect(rel(rb.ext, ra.ext)).toBeLessThan(3e-3)
    expect(Math.abs(rb.g - ra.g)).toBeLessThan(3e-3)
  })

  it('visual range and haze index (Koschmieder; Pitchford & Malm 1994)', () => {
    expect(visualRangeKm(1000)).toBeCloseTo(3.912, 12) // 1 km⁻¹ → 3.912 km
    expect(deciview(10)).toBe(0) // 10 Mm⁻¹ is 0 dv by definition
    expect(deciview(10 * Math.E)).toBeCloseTo(10, 12)
  })

  it("the air's Rayleigh scattering at 550 nm is about 11–13 Mm⁻¹ at sea level (Bodhaine et al. 1999, from memory)", () => {
    const b = rayleighScatteringMm(0.55)
    expect(b).toBeGreaterThan(11)
    expect(b).toBeLessThan(13)
  })

  it('the population phase function integrates to 4π (normalisation)', () => {
    const s = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 1000, median_um: 0.2, gsd: 1.6 }] }, { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' }, [550])
    const angles = Array.from({ length: 1801 }, (_, i) => i / 10)
    const r = computeSampleOptics(s.sample, s.study, { anglesDeg: angles, angularWavelengthsNm: [550] })
    const p = r.angular[0].phase
    let integral = 0
    for (let i = 1; i < angles.length; i++) {
      const t0 = (angles[i - 1] * Math.PI) / 180
      const t1 = (angles[i] * Math.PI) / 180
      integral += 0.5 * (p[i - 1] * Math.sin(t0) + p[i] * Math.sin(t1)) * (t1 - t0)
    }
    expect(rel(2 * Math.PI * integral, 4 * Math.PI)).toBeLessThan(1e-3)
  })
})

describe('size distribution curves for plotting', () => {
  it('integrate over log D to the number and volume concentrations (Hatch–Choate, Seinfeld & Pandis ch. 8)', () => {
    const s = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 2000, median_um: 0.1, gsd: 1.8 }] }, { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' }, [550])
    const c = sizeDistributionCurves(s.sample, s.study)
    let n = 0
    let v = 0
    for (let i = 1; i < c.diameter_um.length; i++) {
      const h = Math.log10(c.diameter_um[i] / c.diameter_um[i - 1])
      n += 0.5 * h * (c.number[i] + c.number[i - 1])
      v += 0.5 * h * (c.volume[i] + c.volume[i - 1])
    }
    expect(rel(n, 2000)).toBeLessThan(1e-6)
    // V = (π/6) N D_g³ exp(4.5 ln²σ_g)
    expect(rel(v, (Math.PI / 6) * 2000 * 0.1 ** 3 * Math.exp(4.5 * Math.log(1.8) ** 2))).toBeLessThan(1e-6)
    expect(c.measured).toBe(false)
  })
})

describe('concentrations of a sample', () => {
  it('dry mass is the Hatch–Choate volume times density, and wet equals dry without uptake (Seinfeld & Pandis ch. 8)', () => {
    const s = oneModeStudy({ kind: 'modes', modes: [{ by: 'number', number_cm3: 1500, median_um: 0.08, gsd: 1.9 }] }, { components: [{ material: 'black-carbon', volume_fraction: 1 }], mixing: 'volume-average' }, [550], 90)
    const r = computeSampleOptics(s.sample, s.study, { angularWavelengthsNm: [] })
    const v = (Math.PI / 6) * 1500 * 0.08 ** 3 * Math.exp(4.5 * Math.log(1.9) ** 2)
    expect(rel(r.volume_um3_cm3, v)).toBeLessThan(1e-12)
    expect(rel(r.mass_ug_m3, 1.8 * v)).toBeLessThan(1e-12) // black carbon 1.8 g cm⁻³ (Bond & Bergstrom 2006)
    expect(r.wet_volume_um3_cm3).toBe(r.volume_um3_cm3) // κ = 0: no water even at 90 %
  })
})
