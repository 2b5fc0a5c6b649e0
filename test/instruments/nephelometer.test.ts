// Nephelometer truncation correction: closed forms for isotropic and Rayleigh scatterers, the full range, and
// the size dependence.
import { describe, expect, it } from 'vitest'
import { demoStudy, InputError, nephelometerTruncation, truncationCorrectionForPhase, type Sample } from '../../src-core/index.ts'

const rad = (d: number) => (d * Math.PI) / 180

/** A dry single-mode ammonium-sulfate sample of a given count median diameter (µm). */
function mode(median: number, gsd = 1.6): Sample {
  return {
    name: `mode ${median} µm`,
    size: { kind: 'modes', modes: [{ by: 'number', number_cm3: 100, median_um: median, gsd }] },
    composition: { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' },
    rh_percent: 0,
    rh_history: 'rising',
    layer: { kind: 'depth', depth_m: 1 }
  }
}

describe('nephelometer truncation', () => {
  it('an isotropic scatterer needs C = 2/(cos θ1 − cos θ2) with an ideal sin θ response (closed form)', () => {
    for (const [a, b] of [[7, 170], [10, 160], [1, 179]]) {
      const c = truncationCorrectionForPhase(() => 1, { lowDeg: a, highDeg: b })
      expect(c.total).toBeCloseTo(2 / (Math.cos(rad(a)) - Math.cos(rad(b))), 12)
      // backscatter: 90°–180° holds half the light, 90°–θ2 the share −cos θ2 of that half (closed form)
      expect(c.backscatter).toBeCloseTo(1 / -Math.cos(rad(b)), 12)
    }
  })

  it('a Rayleigh scatterer, p ∝ 1 + cos²θ, needs the closed-form factor', () => {
    const F = (mu: number) => mu + (mu * mu * mu) / 3 // ∫ (1 + μ²) dμ
    const c = truncationCorrectionForPhase((d) => 0.75 * (1 + Math.cos(rad(d)) ** 2), { lowDeg: 7, highDeg: 170 })
    expect(c.total).toBeCloseTo((F(1) - F(-1)) / (F(Math.cos(rad(7))) - F(Math.cos(rad(170)))), 10)
  })

  it('a response table of constant weight ½ doubles the factor (closed form: the signal halves)', () => {
    const ideal = truncationCorrectionForPhase(() => 1, { lowDeg: 7, highDeg: 170 })
    const half = truncationCorrectionForPhase(() => 1, { lowDeg: 7, highDeg: 170, response: { angles_deg: [0, 180], weight: [0.5, 0.5] } })
    expect(half.total).toBeCloseTo(2 * ideal.total, 12)
    expect(half.ideal_response).toBe(false)
  })

  it('C → 1 for the full range 0°–180°', () => {
    const s = demoStudy()
    const c = nephelometerTruncation(mode(0.3), s, { lowDeg: 0, highDeg: 180 }, { wavelengthNm: 550 })
    expect(c.total).toBeCloseTo(1, 12)
    expect(c.backscatter).toBeCloseTo(1, 12)
    // the phase function from the size integration is normalised to 4π on these nodes
    expect(c.phase_normalisation).toBeCloseTo(1, 3)
  })

  it('small particles approach the Rayleigh factor; large particles need larger corrections (common practice)', () => {
    const s = demoStudy()
    const g = { lowDeg: 7, highDeg: 170 }
    const rayleigh = truncationCorrectionForPhase((d) => 1 + Math.cos(rad(d)) ** 2, g).total
    const tiny = nephelometerTruncation(mode(0.02, 1.3), s, g, { wavelengthNm: 550, tolerance: 3e-3 })
    const fine = nephelometerTruncation(mode(0.15), s, g, { wavelengthNm: 550, tolerance: 3e-3 })
    const large = nephelometerTruncation(mode(1.0), s, g, { wavelengthNm: 550, tolerance: 3e-3 })
    expect(Math.abs(tiny.total - rayleigh)).toBeLessThan(2e-3)
    expect(fine.total).toBeGreaterThan(tiny.total)
    expect(large.total).toBeGreaterThan(fine.total)
    // forward-peaked scattering escapes through the near-forward gap: a correction of 20 % or more for µm particles
    expect(large.total).toBeGreaterThan(1.2)
    expect(large.sca_measured_mm).toBeCloseTo(large.sca_true_mm / large.total, 10)
  })

  it('refuses impossible geometries and responses that do not cover the angles', () => {
    expect(() => truncationCorrectionForPhase(() => 1, { lowDeg: 170, highDeg: 7 })).toThrow(InputError)
    expect(() => truncationCorrectionForPhase(() => 1, { lowDeg: 7, highDeg: 170, response: { angles_deg: [10, 170], weight: [1, 1] } })).toThrow(/covers/)
  })
})
