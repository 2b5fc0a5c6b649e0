// The two forcing methods given the same scattering, and the warnings a figure carries outside its method's range
// (src-core/climate/validity.ts, twoStream.ts's upscatter, materials/saturation.ts).
import { describe, expect, it } from 'vitest'
import {
  asymmetryFromUpscatter,
  deltaEddingtonDirectBeam,
  deltaEddingtonDiffuse,
  gaussLegendreOn,
  growthFactor,
  growthSensitivityPerPercent,
  layerOverLambertianSurface,
  NEAR_SATURATION_RH,
  nearSaturationWarning,
  SOLAR_CONSTANT_WM2,
  THIN_LAYER_TRUSTED_SHARE,
  thinLayerCheck,
  thinLayerDepartureWarning,
  thinLayerForcing,
  twoStreamEquivalentUpscatter,
  twoStreamForcing
} from '../../src-core/index.ts'

const layers = [
  { omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1, asymmetry: 0.7 },
  { omega: 1, upscatter: 0.3, surfaceAlbedo: 0.3, asymmetry: 0.5 },
  { omega: 0.8, upscatter: 0.12, surfaceAlbedo: 0.6, asymmetry: 0.8 },
  { omega: 0.3, upscatter: 0.25, surfaceAlbedo: 0.85, asymmetry: 0.4 }
]
const globalMean = { cosZenith: 0.5, incidentFluxWm2: SOLAR_CONSTANT_WM2 / 4 }

describe('the two-stream layer given the thin-layer form’s upscatter fraction', () => {
  it('agrees with the thin-layer form as τ → 0: the difference is below 10τ of the forcing scale (1e-2 at τ = 1e-3, 1e-3 at τ = 1e-4), i.e. second order (first-order expansion in twoStream.ts; Chylek & Wong 1995 closed form; Coakley & Chýlek 1975)', () => {
    // the forcing scale (S₀/4) T² (1 − A_c) τ with the default T = 0.76, A_c = 0.6: the size of either term of the
    // thin-layer form, so that layers near ω_crit (whose forcing nearly cancels) are held to the same absolute bound
    const scale = (tau: number) => (SOLAR_CONSTANT_WM2 / 4) * 0.76 ** 2 * 0.4 * tau
    for (const l of layers) {
      for (const tau of [1e-3, 1e-4]) {
        const tol = 10 * tau
        const thin = thinLayerForcing({ tau, ...l }).forcingWm2
        const two = twoStreamForcing({ tau, ...l, ...globalMean }).toaWm2
        expect(Math.abs(two - thin), JSON.stringify({ tau, ...l })).toBeLessThan(tol * scale(tau))
      }
      // and the weakly absorbing layers (far from ω_crit) relative to their own forcing
      if (l.omega >= 0.9) {
        const thin = thinLayerForcing({ tau: 1e-3, ...l }).forcingWm2
        expect(Math.abs(twoStreamForcing({ tau: 1e-3, ...l, ...globalMean }).toaWm2 / thin - 1)).toBeLessThan(1e-3)
      }
    }
  })

  it('without it the delta-Eddington layer uses its own upscatter, (1 − g)(2 + g/2)/4 = 0.176 for g = 0.7 averaged over μ₀ (the issue’s figure; closed form)', () => {
    const { nodes, weights } = gaussLegendreOn(16, 0, 1)
    let mean = 0
    nodes.forEach((mu, i) => (mean += weights[i] * twoStreamEquivalentUpscatter(0.7, mu)))
    expect(mean).toBeCloseTo(0.3 * 2.35 / 4, 12)
    expect(mean).toBeCloseTo(0.176, 3)
    // asymmetryFromUpscatter inverts that mean
    expect(asymmetryFromUpscatter(mean)).toBeCloseTo(0.7, 10)
    expect(asymmetryFromUpscatter(0.5)).toBe(0) // isotropic: half goes up (closed form)
  })

  it('R + T + A = 1 with any given upscatter, direct, diffuse and over a surface (energy conservation: γ₃ only splits the scattered beam)', () => {
    for (const upscatter of [0, 0.05, 0.2, 0.5, 0.9]) {
      for (const tau of [0.01, 0.5, 5]) for (const omega of [0.3, 0.9, 1]) for (const asymmetry of [0, 0.7]) {
        const l = { tau, omega, asymmetry, upscatter }
        for (const mu of [0.1, 0.5, 1]) {
          const r = deltaEddingtonDirectBeam(l, mu)
          expect(Math.abs(r.reflectance + r.diffuseTransmittance + r.directTransmittance + r.absorptance - 1)).toBeLessThan(1e-9)
        }
        const d = deltaEddingtonDiffuse(l)
        expect(Math.abs(d.reflectance + d.transmittance + d.absorptance - 1)).toBeLessThan(1e-9)
        const s = layerOverLambertianSurface(l, 0.6, 0.3)
        expect(Math.abs(s.reflectance + s.surfaceAbsorptance + s.layerAbsorptance - 1)).toBeLessThan(1e-9)
      }
    }
  })

  it('refuses an upscatter fraction outside 0…1', () => {
    expect(() => twoStreamForcing({ tau: 0.1, omega: 0.9, asymmetry: 0.7, upscatter: 1.2, ...globalMean, surfaceAlbedo: 0.1 })).toThrow(/upscatter/)
  })
})

describe('the thin-layer warning', () => {
  it(`fires exactly where the two methods differ by more than THIN_LAYER_TRUSTED_SHARE = ${THIN_LAYER_TRUSTED_SHARE} of the two-stream figure`, () => {
    expect(THIN_LAYER_TRUSTED_SHARE).toBe(0.1) // the documented 10 %
    const two = -10
    expect(thinLayerDepartureWarning(two * (1 + 0.99 * THIN_LAYER_TRUSTED_SHARE), two, 0.3)).toBeNull()
    expect(thinLayerDepartureWarning(two * (1 + 1.01 * THIN_LAYER_TRUSTED_SHARE), two, 0.3)).toMatch(/Thin-layer forcing -11 W m⁻².*two-stream.*-10 W m⁻².*10\.1 %.*10 %.*τ = 0\.3.*Use the two-stream figure/)
    // near zero the share is of the verdict margin: 0.04 W m⁻² between 0.01 and 0.05 says nothing
    expect(thinLayerDepartureWarning(0.05, 0.01, 0.01, 0.5)).toBeNull()
  })

  it('the issue’s layer (τ 5, ω 0.9, β̄ 0.2, R_s 0.1) warns with both figures; a thin one (τ 0.01) does not; the switch lies near τ ≈ 0.2 (documented)', () => {
    const thick = thinLayerCheck({ tau: 5, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1 })
    // Chylek & Wong (1995): −(1361/4)·0.76²·0.4·(2·0.81·0.2·0.9·5 − 4·0.1·0.1·5) = −98.9 W m⁻²
    expect(thick.thinWm2).toBeCloseTo(-(1361 / 4) * 0.76 ** 2 * 0.4 * (2 * 0.81 * 0.2 * 0.9 * 5 - 4 * 0.1 * 0.1 * 5), 9)
    expect(thick.warning).toMatch(/-98\.9 W m⁻²/)
    expect(thick.warning).toContain(`${Number(thick.twoStreamWm2.toPrecision(3))} W m⁻²`)
    expect(Math.abs(thick.twoStreamWm2)).toBeLessThan(25) // the two-stream layer saturates (Joseph et al. 1976)
    expect(thinLayerCheck({ tau: 0.01, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1 }).warning).toBeNull()
    const first = [0.05, 0.1, 0.15, 0.2, 0.25, 0.3, 0.4].find((tau) => thinLayerCheck({ tau, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1 }).warning)
    expect(first).toBeGreaterThanOrEqual(0.15)
    expect(first).toBeLessThanOrEqual(0.3)
  })
})

describe('growth near saturation', () => {
  it(`warns from ${NEAR_SATURATION_RH} % RH for a particle that takes up water, not below and not for κ = 0`, () => {
    expect(nearSaturationWarning(NEAR_SATURATION_RH - 0.1, 0.61)).toBeNull()
    expect(nearSaturationWarning(97, 0)).toBeNull()
    expect(nearSaturationWarning(97, 0.61)).toMatch(/97 % RH.*κ-Köhler.*measured wet size distribution/)
  })

  it('the sensitivity it quotes is d ln gf/dRH of the κ-Köhler closed form (Petters & Kreidenweis 2007), checked by a central difference', () => {
    for (const [kappa, rh] of [
      [0.61, 95],
      [1.28, 98],
      [0.1, 80]
    ]) {
      const h = 1e-4
      const fd = (Math.log(growthFactor(0.1, kappa, rh + h, { kelvin: false })) - Math.log(growthFactor(0.1, kappa, rh - h, { kelvin: false }))) / (2 * h)
      expect(growthSensitivityPerPercent(kappa, rh) / fd).toBeCloseTo(1, 6)
    }
  })
})
