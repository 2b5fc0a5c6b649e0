// Figures that have no meaning are withheld (NaN, with the reason), by the thresholds of optics/metrics.ts.
import { describe, expect, it } from 'vitest'
import {
  ABSORPTION_FLOOR_MM,
  ABSORPTION_SHARE_MIN,
  absorptionWithheld,
  computeSampleOptics,
  deciviewWithheld,
  visibilityWithheld,
  VISIBLE_NM,
  withheldText,
  type Sample,
  type Study
} from '../../src-core/index.ts'

function oneModeStudy(mode: Sample['size'], material: string, wavelengths: number[]): { study: Study; sample: Sample } {
  const sample: Sample = { name: 'test', size: mode, composition: { components: [{ material, volume_fraction: 1 }], mixing: 'volume-average' }, rh_percent: 0, rh_history: 'falling', layer: { kind: 'depth', depth_m: 1000 } }
  const study: Study = {
    format: 'motebench-study', version: 2, name: 'test', wavelengths_nm: wavelengths, samples: [sample],
    site: { latitude_deg: 45, day_of_year: 172, cloud_fraction: 0.6, transmittance: 0.76, surface: 'cropland' }
  }
  return { study, sample }
}

describe('thresholds', () => {
  it('an absorption Ångström exponent needs σabs ≥ 0.1 Mm⁻¹ and ≥ 1 % of σext (detection limit of a filter photometer, ω ≤ 0.99; common practice)', () => {
    expect(ABSORPTION_FLOOR_MM).toBe(0.1)
    expect(ABSORPTION_SHARE_MIN).toBe(0.01)
    expect(absorptionWithheld(1e-4, 50)).toMatch(/below 0\.1 Mm⁻¹/) // the non-absorbing sample
    expect(absorptionWithheld(0.09, 1)).toMatch(/below 0\.1 Mm⁻¹/)
    expect(absorptionWithheld(0.5, 100)).toMatch(/below 1 % of σext/) // ω = 0.995
    expect(absorptionWithheld(2, 100)).toBeNull() // ω = 0.98
    expect(absorptionWithheld(0.1, 10)).toBeNull() // both limits reached exactly
  })

  it('visual range and haze index only for visible light, 400–700 nm (Koschmieder 1924: the eye’s contrast threshold; common practice)', () => {
    expect(VISIBLE_NM).toEqual([400, 700])
    expect(visibilityWithheld(550)).toBeNull()
    expect(visibilityWithheld(400)).toBeNull()
    expect(visibilityWithheld(700)).toBeNull()
    expect(visibilityWithheld(350)).toMatch(/visible light/)
    expect(visibilityWithheld(1064)).toMatch(/visible light/)
  })

  it('a haze index is never negative: under 10 Mm⁻¹ (its zero, Pitchford & Malm 1994) it is withheld', () => {
    expect(deciviewWithheld(550, 9.99)).toMatch(/clean-air zero/)
    expect(deciviewWithheld(550, 10)).toBeNull()
    expect(deciviewWithheld(1000, 500)).toMatch(/visible light/)
  })
})

describe('in a sample’s optics', () => {
  const wavelengths = [370, 450, 550, 700, 1064]

  it('a non-absorbing sample has no absorption Ångström exponent, at any wavelength or fitted, and says why', () => {
    const { study, sample } = oneModeStudy({ kind: 'modes', modes: [{ by: 'mass', mass_ug_m3: 10, median_um: 0.15, gsd: 1.6 }] }, 'ammonium-sulfate', wavelengths)
    const o = computeSampleOptics(sample, study)
    for (const w of o.wavelengths) {
      expect(w.angstrom_abs).toBeNaN()
      expect(w.withheld.angstrom_abs).toMatch(/σabs below/)
      expect(Number.isFinite(w.angstrom_ext)).toBe(true) // extinction's exponent stays
    }
    expect(o.angstrom_fit.abs).toBeNaN()
    expect(o.angstrom_fit.withheld?.abs).toMatch(/σabs below .* at \d+ nm/)
    expect(Number.isFinite(o.angstrom_fit.ext)).toBe(true)
  })

  it('small soot keeps its absorption exponent near 1 (small-particle limit with a flat index: σabs ∝ 1/λ; Bergstrom et al. 2007, Atmos. Chem. Phys. 7:5937)', () => {
    const { study, sample } = oneModeStudy({ kind: 'modes', modes: [{ by: 'mass', mass_ug_m3: 2, median_um: 0.03, gsd: 1.5 }] }, 'black-carbon', wavelengths)
    const o = computeSampleOptics(sample, study)
    for (const w of o.wavelengths) {
      expect(w.withheld.angstrom_abs).toBeUndefined()
      expect(w.angstrom_abs).toBeGreaterThan(0.7)
      expect(w.angstrom_abs).toBeLessThan(1.3)
    }
    expect(o.angstrom_fit.withheld).toBeUndefined()
  })

  it('visual range and deciviews only inside 400–700 nm; the others are NaN with the reason, in the export text too', () => {
    const { study, sample } = oneModeStudy({ kind: 'modes', modes: [{ by: 'mass', mass_ug_m3: 30, median_um: 0.2, gsd: 1.7 }] }, 'ammonium-sulfate', wavelengths)
    const o = computeSampleOptics(sample, study)
    for (const w of o.wavelengths) {
      const visible = w.wavelength_nm >= 400 && w.wavelength_nm <= 700
      expect(Number.isFinite(w.visual_range_km)).toBe(visible)
      expect(Number.isFinite(w.deciview)).toBe(visible)
      if (visible) {
        // Koschmieder: V = 3.912/(b_ext + b_Rayleigh) (Koschmieder 1924)
        expect(w.visual_range_km).toBeCloseTo(3912 / (w.ext + w.rayleigh_sca), 9)
        expect(w.deciview).toBeGreaterThanOrEqual(0)
      } else {
        expect(w.withheld.visual_range_km).toMatch(/400–700 nm/)
        expect(withheldText(w)).toMatch(/^.*visual_range_km: defined for visible light only.*deciview: defined for visible light only/)
      }
    }
  })

  it('a very clean sample at 700 nm has no haze index (below the scale’s zero) but keeps its visual range', () => {
    const { study, sample } = oneModeStudy({ kind: 'modes', modes: [{ by: 'mass', mass_ug_m3: 0.2, median_um: 0.15, gsd: 1.6 }] }, 'ammonium-sulfate', [550, 700])
    const o = computeSampleOptics(sample, study)
    const red = o.wavelengths[1]
    // Rayleigh scattering of sea-level air at 700 nm is about 5 Mm⁻¹ (13 Mm⁻¹ at 550 nm scaled by λ⁻⁴; Bucholtz 1995, from memory)
    expect(red.ext + red.rayleigh_sca).toBeLessThan(10)
    expect(red.deciview).toBeNaN()
    expect(red.withheld.deciview).toMatch(/clean-air zero/)
    expect(Number.isFinite(red.visual_range_km)).toBe(true)
  })
})
