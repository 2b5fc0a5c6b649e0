import { describe, expect, it } from 'vitest'
import {
  InputError,
  SOLAR_CONSTANT_WM2,
  dailyMeanTwoStreamForcing,
  deltaEddingtonDiffuse,
  deltaEddingtonDirectBeam,
  deltaEddingtonScaling,
  layerOverLambertianSurface,
  thinLayerForcing,
  twoStreamEquivalentUpscatter,
  twoStreamForcing
} from '../../src-core/index.ts'

const taus = [0.001, 0.01, 0.1, 0.5, 1, 3, 10, 50]
const omegas = [0, 0.3, 0.8, 0.95, 0.999999, 1]
const gs = [0, 0.5, 0.7, 0.85]
const mus = [0.05, 0.2, 0.5, 0.8165, 1]

describe('delta-Eddington layer (Joseph, Wiscombe & Weinman 1976; Meador & Weaver 1980)', () => {
  it('delta scaling: f = g², τ′ = (1 − ωf)τ, ω′ = (1 − f)ω/(1 − ωf), g′ = g/(1 + g) (Joseph et al. 1976)', () => {
    // Joseph et al. (1976): the scaled absorption optical depth (1 − ω′)τ′ equals the true one (1 − ω)τ
    const s = deltaEddingtonScaling({ tau: 2, omega: 0.9, asymmetry: 0.7 })
    expect(s.tau).toBeCloseTo(2 * (1 - 0.9 * 0.49), 12)
    expect((1 - s.omega) * s.tau).toBeCloseTo((1 - 0.9) * 2, 12)
    expect(s.asymmetry).toBeCloseTo(0.7 / 1.7, 12)
  })
  it('R + T + A = 1 for the direct beam, with A computed independently from the flux divergence (energy conservation)', () => {
    for (const tau of taus) for (const omega of omegas) for (const asymmetry of gs) for (const mu of mus) {
      const r = deltaEddingtonDirectBeam({ tau, omega, asymmetry }, mu)
      const sum = r.reflectance + r.diffuseTransmittance + r.directTransmittance + r.absorptance
      expect(Math.abs(sum - 1)).toBeLessThan(1e-9)
      expect(r.absorptance).toBeGreaterThanOrEqual(-1e-12)
    }
  })
  it('R + T + A = 1 for diffuse illumination and for layer + Lambertian surface (energy conservation)', () => {
    for (const tau of [0.01, 0.3, 2, 20]) for (const omega of [0.3, 0.9, 1]) for (const asymmetry of [0, 0.7]) {
      const d = deltaEddingtonDiffuse({ tau, omega, asymmetry })
      expect(Math.abs(d.reflectance + d.transmittance + d.absorptance - 1)).toBeLessThan(1e-9)
      for (const Rs of [0, 0.2, 0.85, 1]) {
        const s = layerOverLambertianSurface({ tau, omega, asymmetry }, 0.6, Rs)
        expect(Math.abs(s.reflectance + s.surfaceAbsorptance + s.layerAbsorptance - 1)).toBeLessThan(1e-9)
      }
    }
  })
  it('ω = 1 absorbs nothing: direct, diffuse and over a surface (energy conservation)', () => {
    for (const tau of taus) for (const asymmetry of gs) {
      for (const mu of mus) expect(Math.abs(deltaEddingtonDirectBeam({ tau, omega: 1, asymmetry }, mu).absorptance)).toBeLessThan(1e-12)
      expect(Math.abs(deltaEddingtonDiffuse({ tau, omega: 1, asymmetry }).absorptance)).toBeLessThan(1e-12)
      expect(Math.abs(layerOverLambertianSurface({ tau, omega: 1, asymmetry }, 0.5, 0.6).layerAbsorptance)).toBeLessThan(1e-12)
      const f = twoStreamForcing({ tau, omega: 1, asymmetry, cosZenith: 0.5, surfaceAlbedo: 0.3 })
      expect(Math.abs(f.atmosphereWm2)).toBeLessThan(1e-9)
    }
  })
  it('ω = 0 is pure Beer–Lambert attenuation: R = 0, T = e^{−τ/μ₀} (closed form)', () => {
    for (const tau of [0.1, 1, 5]) for (const mu of [0.2, 0.7, 1]) {
      const r = deltaEddingtonDirectBeam({ tau, omega: 0, asymmetry: 0.6 }, mu)
      expect(Math.abs(r.reflectance)).toBeLessThan(1e-14)
      expect(Math.abs(r.diffuseTransmittance)).toBeLessThan(1e-14)
      expect(r.directTransmittance).toBeCloseTo(Math.exp(-tau / mu), 14)
    }
  })
  it('limits: τ → 0 leaves the beam untouched; a thick conservative layer reflects nearly everything (limits)', () => {
    const z = deltaEddingtonDirectBeam({ tau: 0, omega: 0.9, asymmetry: 0.7 }, 0.5)
    expect(z.directTransmittance).toBe(1)
    expect(Math.abs(z.reflectance)).toBeLessThan(1e-15)
    expect(deltaEddingtonDirectBeam({ tau: 1000, omega: 1, asymmetry: 0.7 }, 0.5).reflectance).toBeGreaterThan(0.99)
    // layer over a white surface with ω = 1: everything comes back out (conservation)
    expect(layerOverLambertianSurface({ tau: 2, omega: 1, asymmetry: 0.7 }, 0.5, 1).reflectance).toBeCloseTo(1, 9)
  })
  it('is smooth across the removable singularity k μ₀ = 1 (continuity)', () => {
    // ω = 0.5, g = 0 (unscaled since f = 0): k = √(3 · 0.5 · 1) ⇒ μ₀ = 1/k
    const k = Math.sqrt(1.5)
    const at = (mu: number) => deltaEddingtonDirectBeam({ tau: 1, omega: 0.5, asymmetry: 0 }, mu)
    const c = at(1 / k)
    const lo = at(1 / k - 1e-3)
    const hi = at(1 / k + 1e-3)
    expect(Number.isFinite(c.reflectance)).toBe(true)
    expect(Math.abs(c.reflectance - 0.5 * (lo.reflectance + hi.reflectance))).toBeLessThan(1e-5)
    expect(Math.abs(c.diffuseTransmittance - 0.5 * (lo.diffuseTransmittance + hi.diffuseTransmittance))).toBeLessThan(1e-5)
  })
  it('thin limit of the direct-beam reflectance is ωτ β_eff(μ₀)/μ₀ with β_eff = (1 − g²)(2 − 3μ₀g/(1 + g))/4 (first-order expansion of the two-stream equations)', () => {
    for (const g of [0, 0.5, 0.8]) for (const mu of [0.3, 0.6, 1]) {
      const tau = 1e-5
      const r = deltaEddingtonDirectBeam({ tau, omega: 0.9, asymmetry: g }, mu)
      expect(r.reflectance / ((0.9 * tau * twoStreamEquivalentUpscatter(g, mu)) / mu)).toBeCloseTo(1, 3)
    }
  })
})

describe('two-stream forcing vs. the thin-layer form at small τ', () => {
  /*
   * Measured agreement (τ = 0.01, μ₀ = 0.5, incident flux S₀/4, β̄ = β_eff(0.5) = 0.2813 for g = 0.5 and
   * 0.1762 for g = 0.7). With μ₀ = 0.5 the mean slant path is 2 and β_eff is linear in μ, so both forms
   * agree to first order in τ; the residual is O(τ). Relative differences of ΔF_TOA (two-stream vs thin):
   *   ω=0.8:  g=0.5: +0.7 %, −1.1 %, −2.4 %   g=0.7: +0.5 %, −7.2 %*, −1.6 %   (R_s = 0.05, 0.2, 0.5)
   *   ω=0.9:  g=0.5: +0.6 %, −0.2 %, −5.6 %*  g=0.7: +0.4 %, −0.5 %, −2.3 %
   *   ω=0.95: g=0.5: +0.6 %, −0.0 %, −9.1 %*  g=0.7: +0.4 %, −0.2 %, −11.2 %*
   *   ω=1:    g=0.5: +0.5 %, +0.0 %, −1.5 %   g=0.7: +0.3 %, −0.0 %, −1.3 %
   * (* near a sign change, where ΔF itself is small.) Measured against the size of the scattering term
   * (S₀/4)T²(1−A_c)·2β̄ωτ(1−R_s)² + 4R_s(1−ω)τ, every difference is below 2 %.
   */
  it('agrees within 3 % of the forcing scale over ω ∈ {0.8, 0.9, 0.95, 1}, g ∈ {0.5, 0.7}, R_s ∈ {0.05, 0.2, 0.5} (Chylek & Wong 1995 vs Joseph et al. 1976)', () => {
    const rows: string[] = []
    for (const omega of [0.8, 0.9, 0.95, 1]) for (const g of [0.5, 0.7]) for (const Rs of [0.05, 0.2, 0.5]) {
      const beta = twoStreamEquivalentUpscatter(g, 0.5)
      const thin = thinLayerForcing({ tau: 0.01, omega, upscatter: beta, surfaceAlbedo: Rs }).forcingWm2
      const ts = twoStreamForcing({ tau: 0.01, omega, asymmetry: g, cosZenith: 0.5, surfaceAlbedo: Rs, incidentFluxWm2: SOLAR_CONSTANT_WM2 / 4 }).toaWm2
      const scale = (SOLAR_CONSTANT_WM2 / 4) * 0.76 ** 2 * 0.4 * 0.01 * (2 * beta * omega * (1 - Rs) ** 2 + 4 * Rs * (1 - omega))
      const d = Math.abs(ts - thin) / scale
      rows.push(`ω=${omega} g=${g} Rs=${Rs}: thin ${thin.toFixed(4)} two-stream ${ts.toFixed(4)} W m⁻² (${(100 * d).toFixed(2)} % of scale)`)
      expect(d, rows.join('\n')).toBeLessThan(0.03)
      expect(Math.sign(ts), rows.join('\n')).toBe(Math.sign(thin))
    }
  })
  it('the relative difference vanishes as τ → 0 (first-order agreement, convergence check)', () => {
    // (ΔF_2s − ΔF_thin)/ΔF_thin is O(τ ln(1/τ)) here: the grazing-angle part of the diffuse transmittance
    // behaves like the exponential integral 2E₃(τ) = 1 − 2τ + O(τ² ln τ) (Chandrasekhar 1950, from memory)
    const rel = (tau: number) => {
      const beta = twoStreamEquivalentUpscatter(0.7, 0.5)
      const thin = thinLayerForcing({ tau, omega: 0.9, upscatter: beta, surfaceAlbedo: 0.2 }).forcingWm2
      const ts = twoStreamForcing({ tau, omega: 0.9, asymmetry: 0.7, cosZenith: 0.5, surfaceAlbedo: 0.2, incidentFluxWm2: SOLAR_CONSTANT_WM2 / 4 }).toaWm2
      return Math.abs((ts - thin) / thin)
    }
    const seq = [0.04, 0.01, 0.0025, 1e-4, 1e-5].map(rel)
    for (let i = 1; i < seq.length; i++) expect(seq[i], seq.join(', ')).toBeLessThan(seq[i - 1])
    expect(seq[3]).toBeLessThan(1e-3)
    expect(seq[4]).toBeLessThan(1e-4)
  })
})

describe('two-stream forcing signs (common practice)', () => {
  it('scattering aerosol (ω = 1) cools over every R_s < 1 at the global-mean sun μ₀ = 0.5, dims the surface, heats nothing (common practice)', () => {
    for (const Rs of [0, 0.06, 0.35, 0.85, 0.99]) for (const tau of [0.05, 0.5, 2]) {
      const f = twoStreamForcing({ tau, omega: 1, asymmetry: 0.7, cosZenith: 0.5, surfaceAlbedo: Rs })
      expect(f.toaWm2).toBeLessThan(0)
      expect(f.surfaceWm2).toBeLessThan(0)
      expect(Math.abs(f.atmosphereWm2)).toBeLessThan(1e-9)
    }
  })
  it('at high sun over a near-white surface a conservative layer can lower the system reflectance exactly when R(μ₀) < R_s R̄ (adding identity, closed form)', () => {
    // adding with T = 1 − R and T̄ = 1 − R̄ (ω = 1): 1 − R_sys = (1 − R)(1 − R_s)/(1 − R_s R̄), so R_sys < R_s ⇔ R(μ₀) < R_s R̄
    const signs = new Set<number>()
    for (const mu of [0.3, 0.6, 0.9]) for (const Rs of [0.5, 0.9, 0.99]) {
      const layer = { tau: 0.3, omega: 1, asymmetry: 0.7 }
      const R = deltaEddingtonDirectBeam(layer, mu).reflectance
      const Rbar = deltaEddingtonDiffuse(layer).reflectance
      const f = twoStreamForcing({ ...layer, cosZenith: mu, surfaceAlbedo: Rs })
      expect(Math.sign(f.toaWm2)).toBe(Math.sign(Rs * Rbar - R))
      signs.add(Math.sign(f.toaWm2))
    }
    expect(signs.has(1) && signs.has(-1)).toBe(true) // both regimes occur in this grid
  })
  it('black-carbon-like aerosol (ω ≈ 0.3) warms over fresh snow, heats the layer, dims the surface', () => {
    const f = twoStreamForcing({ tau: 0.05, omega: 0.3, asymmetry: 0.4, cosZenith: 0.5, surfaceAlbedo: 0.85 })
    expect(f.toaWm2).toBeGreaterThan(0)
    expect(f.atmosphereWm2).toBeGreaterThan(0)
    expect(f.surfaceWm2).toBeLessThan(0)
    expect(f.atmosphereWm2).toBeCloseTo(f.toaWm2 - f.surfaceWm2, 12)
  })
  it('daily mean two-stream forcing at low latitude is negative for sulfate-like aerosol over ocean (common practice)', () => {
    const d = dailyMeanTwoStreamForcing({ latitudeDeg: 10, dayOfYear: 100, tau: 0.1, omega: 0.99, asymmetry: 0.7, surfaceAlbedo: 0.06 })
    expect(d.toaWm2).toBeLessThan(0)
    expect(d.insolationWm2).toBeGreaterThan(350)
  })
  it('rejects bad input with InputError', () => {
    expect(() => deltaEddingtonDirectBeam({ tau: 1, omega: 0.9, asymmetry: 1 }, 0.5)).toThrow(InputError)
    expect(() => deltaEddingtonDirectBeam({ tau: 1, omega: 0.9, asymmetry: 0.5 }, 0)).toThrow(InputError)
    expect(() => twoStreamForcing({ tau: 1, omega: 0.9, asymmetry: 0.5, cosZenith: 0.5, surfaceAlbedo: 1.1 })).toThrow(InputError)
  })
})
