import { describe, expect, it } from 'vitest'
import {
  InputError,
  SURFACE_TYPES,
  FORCING_CAUTION,
  criticalSingleScatteringAlbedo,
  effectiveEmissionTemperature,
  forcingMap,
  forcingVerdict,
  signFlipSurfaceAlbedo,
  surfaceTypeById,
  thinLayerForcing
} from '../../src-core/index.ts'

describe('effective emission temperature', () => {
  it('is about 255 K for planetary albedo 0.3 (common practice)', () => {
    // common practice: Earth's effective emission temperature ≈ 255 K for A = 0.3, S₀ ≈ 1361–1368 W m⁻²
    expect(Math.abs(effectiveEmissionTemperature(0.3) - 255)).toBeLessThan(1)
  })
  it('satisfies the energy balance σT⁴ = S₀(1 − A)/4 and scales as (1 − A)^¼ (closed form)', () => {
    // closed form: absorbed = emitted; σ = 5.670374419e-8 W m⁻² K⁻⁴ (CODATA 2018)
    const t = effectiveEmissionTemperature(0.3, 1361)
    expect(5.670374419e-8 * t ** 4).toBeCloseTo((1361 * 0.7) / 4, 6)
    expect(effectiveEmissionTemperature(0) / effectiveEmissionTemperature(0.5)).toBeCloseTo(2 ** 0.25, 12)
    expect(effectiveEmissionTemperature(1)).toBe(0)
  })
})

describe('thin-layer forcing (Chylek & Wong 1995; Haywood & Shine 1995)', () => {
  it('a purely scattering layer (ω = 1) cools over every surface with R_s < 1 (common practice)', () => {
    // common practice: non-absorbing aerosol always brightens the planet unless the surface is white
    for (const Rs of [0, 0.06, 0.2, 0.5, 0.85, 0.99]) {
      for (const beta of [0.1, 0.25, 0.4]) {
        expect(thinLayerForcing({ tau: 0.1, omega: 1, upscatter: beta, surfaceAlbedo: Rs }).forcingWm2).toBeLessThan(0)
      }
    }
  })
  it('black-carbon-like absorbing aerosol (ω ≈ 0.3) warms over fresh snow (common practice)', () => {
    // common practice: strongly absorbing aerosol over a bright surface darkens the planet
    const snow = surfaceTypeById('fresh-snow').albedo
    const r = thinLayerForcing({ tau: 0.05, omega: 0.3, upscatter: 0.25, surfaceAlbedo: snow })
    expect(r.forcingWm2).toBeGreaterThan(0)
    expect(forcingVerdict({ tau: 0.05, omega: 0.3, upscatter: 0.25, surfaceAlbedo: snow }).verdict).toBe('warms')
  })
  it('ω_crit for R_s = 0.15, β̄ = 0.25 follows 2R/(2R + β̄(1 − R)²) and the forcing changes sign there (Chylek & Wong 1995)', () => {
    // Chylek & Wong (1995) formula evaluated by hand: 0.30 / (0.30 + 0.25 × 0.85²) = 0.30 / 0.480625
    const wc = criticalSingleScatteringAlbedo(0.15, 0.25)
    expect(wc).toBeCloseTo(0.3 / 0.480625, 12)
    const at = (omega: number) => thinLayerForcing({ tau: 0.1, omega, upscatter: 0.25, surfaceAlbedo: 0.15 }).forcingWm2
    expect(at(wc + 0.01)).toBeLessThan(0) // just above: cools
    expect(at(wc - 0.01)).toBeGreaterThan(0) // just below: warms
    expect(Math.abs(at(wc))).toBeLessThan(1e-12)
  })
  it('the sign-flip albedo (quadratic root) and ω_crit (closed form) are inverses of each other (closed form)', () => {
    // closed form consistency: R_flip(ω_crit(R), β̄) = R for any R, β̄
    for (const beta of [0.1, 0.25, 0.5]) {
      for (const R of [0.02, 0.15, 0.4, 0.8]) {
        expect(signFlipSurfaceAlbedo(criticalSingleScatteringAlbedo(R, beta), beta)).toBeCloseTo(R, 10)
      }
    }
    // limits: ω = 1 never warms below a white surface; ω = 0 warms over any non-black surface (closed form)
    expect(signFlipSurfaceAlbedo(1, 0.25)).toBe(1)
    expect(signFlipSurfaceAlbedo(0, 0.25)).toBe(0)
  })
  it('is linear in τ and the efficiency is ΔF/τ (closed form)', () => {
    // closed form: the thin-layer expression is first order in τ
    const a = thinLayerForcing({ tau: 0.02, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.3 })
    const b = thinLayerForcing({ tau: 0.06, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.3 })
    expect(b.forcingWm2 / a.forcingWm2).toBeCloseTo(3, 12)
    expect(a.efficiencyWm2PerTau).toBeCloseTo(b.efficiencyWm2PerTau, 10)
  })
  it('sulfate-like example gives an efficiency of a few tens of W m⁻² per unit τ (from memory)', () => {
    // from memory: global-mean clear-sky efficiency of non-absorbing sulfate is of order −20 to −35 W m⁻² per unit τ
    const r = thinLayerForcing({ tau: 0.04, omega: 1, upscatter: 0.29, surfaceAlbedo: 0.15 })
    expect(r.efficiencyWm2PerTau).toBeLessThan(-15)
    expect(r.efficiencyWm2PerTau).toBeGreaterThan(-40)
  })
})

describe('verdict', () => {
  it('says cools / warms / too close to call against the margin and always carries the caution (common practice)', () => {
    // common practice: a sign is only called when |ΔF| exceeds the stated uncertainty
    const cool = forcingVerdict({ tau: 0.1, omega: 0.98, upscatter: 0.25, surfaceAlbedo: 0.06 })
    expect(cool.verdict).toBe('cools')
    expect(cool.omega).toBeGreaterThan(cool.omegaCritical)
    expect(cool.caution).toBe(FORCING_CAUTION)
    expect(cool.caution).toMatch(/screening estimate/)
    expect(cool.caution).toMatch(/not a climate projection/)
    expect(cool.caution).toMatch(/qualified review under the local occupational-health and environmental rules/)
    const wc = criticalSingleScatteringAlbedo(0.15, 0.25)
    const close = forcingVerdict({ tau: 0.1, omega: wc + 0.001, upscatter: 0.25, surfaceAlbedo: 0.15 })
    expect(close.verdict).toBe('too close to call')
    expect(close.caution).toBe(FORCING_CAUTION)
    // a tighter margin lets the same case be called
    expect(forcingVerdict({ tau: 0.1, omega: wc + 0.001, upscatter: 0.25, surfaceAlbedo: 0.15, marginWm2: 0 }).verdict).toBe('cools')
  })
  it('two-stream verdict agrees on the common-practice cases (common practice)', () => {
    // common practice: scattering aerosol cools over any surface darker than white; black carbon warms over snow
    for (const Rs of [0, 0.2, 0.6, 0.95]) {
      const v = forcingVerdict({ method: 'two-stream', tau: 0.2, omega: 1, asymmetry: 0.7, surfaceAlbedo: Rs, marginWm2: 0 })
      expect(v.verdict).toBe('cools')
    }
    const bc = forcingVerdict({ method: 'two-stream', tau: 0.05, omega: 0.3, asymmetry: 0.4, surfaceAlbedo: 0.85 })
    expect(bc.verdict).toBe('warms')
    expect(bc.omega).toBeLessThan(bc.omegaCritical)
    expect(bc.surfaceAlbedo).toBeGreaterThan(bc.flipSurfaceAlbedo)
  })
  it('two-stream ω_crit found by bisection is a sign change of the two-stream forcing (closed form: definition)', () => {
    // definition of ω_crit: the forcing is zero there and changes sign across it
    const v = forcingVerdict({ method: 'two-stream', tau: 0.1, omega: 0.9, asymmetry: 0.7, surfaceAlbedo: 0.3, marginWm2: 0 })
    const at = (omega: number) => forcingVerdict({ method: 'two-stream', tau: 0.1, omega, asymmetry: 0.7, surfaceAlbedo: 0.3, marginWm2: 0 }).forcingWm2
    expect(at(v.omegaCritical + 0.005)).toBeLessThan(0)
    expect(at(v.omegaCritical - 0.005)).toBeGreaterThan(0)
  })
  it('needs upscatter for thin-layer and asymmetry for two-stream (input rules)', () => {
    expect(() => forcingVerdict({ tau: 0.1, omega: 0.9, surfaceAlbedo: 0.2 })).toThrow(InputError)
    expect(() => forcingVerdict({ method: 'two-stream', tau: 0.1, omega: 0.9, surfaceAlbedo: 0.2 })).toThrow(InputError)
  })
})

describe('forcing map', () => {
  it('each cell is the thin-layer forcing at its ω and R_s; the inputs the cells share are still checked', () => {
    const shared = { tau: 0.3, upscatter: 0.2, transmittance: 0.8, cloudFraction: 0.4 }
    const m = forcingMap({ nSurfaceAlbedo: 6, nOmega: 4, ...shared })
    for (let j = 0; j < 4; j++) {
      for (let i = 0; i < 6; i++) {
        const one = thinLayerForcing({ tau: 0.3, upscatter: 0.2, transmittance: 0.8, cloudFraction: 0.4, omega: m.omega[j], surfaceAlbedo: m.surfaceAlbedo[i] })
        expect(m.forcingWm2[j * 6 + i]).toBe(one.forcingWm2)
      }
    }
    expect(() => forcingMap({ nSurfaceAlbedo: 6, nOmega: 4, ...shared, tau: -1 })).toThrow(InputError)
    expect(() => forcingMap({ nSurfaceAlbedo: 6, nOmega: 4, ...shared, transmittance: 1.5 })).toThrow(InputError)
    expect(() => forcingMap({ nSurfaceAlbedo: 6, nOmega: 4, ...shared, cloudFraction: -0.1 })).toThrow(InputError)
  })

  it('has the requested grid, the forcing changes sign across the zero line, which follows ω_crit(R_s) (Chylek & Wong 1995)', () => {
    const m = forcingMap({ nSurfaceAlbedo: 21, nOmega: 11, tau: 0.1, upscatter: 0.25 })
    expect(m.surfaceAlbedo.length).toBe(21)
    expect(m.omega.length).toBe(11)
    expect(m.forcingWm2.length).toBe(231)
    expect(m.surfaceAlbedo[0]).toBe(0)
    expect(m.surfaceAlbedo[20]).toBe(1)
    expect(m.omega[0]).toBe(0.5)
    expect(m.omega[10]).toBe(1)
    // every grid cell: sign of ΔF agrees with ω vs ω_crit(R_s) (first-order theory)
    for (let j = 0; j < 11; j++) {
      for (let i = 1; i < 20; i++) {
        const wc = criticalSingleScatteringAlbedo(m.surfaceAlbedo[i], 0.25)
        const f = m.forcingWm2[j * 21 + i]
        if (m.omega[j] > wc + 1e-9) expect(f).toBeLessThan(0)
        if (m.omega[j] < wc - 1e-9) expect(f).toBeGreaterThan(0)
      }
    }
    // zero line: starts at ω = 0.5, ends at (1, 1), ω increases along it, and ΔF is ~0 on it
    const z = m.zeroLine
    expect(z.omegaCritical[0]).toBeCloseTo(0.5, 12)
    expect(z.surfaceAlbedo[z.surfaceAlbedo.length - 1]).toBe(1)
    expect(z.omegaCritical[z.omegaCritical.length - 1]).toBeCloseTo(1, 12)
    for (let k = 0; k < z.surfaceAlbedo.length; k++) {
      if (k > 0) expect(z.omegaCritical[k]).toBeGreaterThan(z.omegaCritical[k - 1])
      const f = thinLayerForcing({ tau: 0.1, omega: z.omegaCritical[k], upscatter: 0.25, surfaceAlbedo: z.surfaceAlbedo[k] }).forcingWm2
      expect(Math.abs(f)).toBeLessThan(1e-10)
    }
  })
})

describe('surface albedo list', () => {
  it('has lowercase-hyphenated ids, albedos inside their ranges and a source for each (Oke 1987; Liou 2002, from memory)', () => {
    const want: Record<string, number> = { ocean: 0.06, forest: 0.13, cropland: 0.18, grassland: 0.2, 'desert-sand': 0.35, 'fresh-snow': 0.85, 'sea-ice': 0.6, urban: 0.15 }
    for (const [id, a] of Object.entries(want)) expect(surfaceTypeById(id).albedo).toBe(a)
    for (const s of SURFACE_TYPES) {
      expect(s.id).toMatch(/^[a-z]+(-[a-z]+)*$/)
      expect(s.albedo).toBeGreaterThanOrEqual(s.range[0])
      expect(s.albedo).toBeLessThanOrEqual(s.range[1])
      expect(s.source.length).toBeGreaterThan(10)
    }
    expect(() => surfaceTypeById('lava')).toThrow(InputError)
  })
})

describe('bad input', () => {
  it('throws InputError, never NaN', () => {
    expect(() => thinLayerForcing({ tau: Number.NaN, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1 })).toThrow(InputError)
    expect(() => thinLayerForcing({ tau: 0.1, omega: 1.2, upscatter: 0.2, surfaceAlbedo: 0.1 })).toThrow(InputError)
    expect(() => thinLayerForcing({ tau: -0.1, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1 })).toThrow(InputError)
    expect(() => criticalSingleScatteringAlbedo(0, 0)).toThrow(InputError)
    expect(() => effectiveEmissionTemperature(1.5)).toThrow(InputError)
    expect(() => forcingMap({ nSurfaceAlbedo: 1, nOmega: 5, tau: 0.1, upscatter: 0.2 })).toThrow(InputError)
    expect(() => forcingVerdict({ tau: 0.1, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.1, marginWm2: -1 })).toThrow(InputError)
  })
})

describe('degenerate but valid input', () => {
  it('zero optical depth gives zero forcing and "too close to call"; β̄ = 0 over a black surface gives zero forcing (limits)', () => {
    const v = forcingVerdict({ tau: 0, omega: 0.9, upscatter: 0.2, surfaceAlbedo: 0.3 })
    expect(v.forcingWm2 === 0).toBe(true)
    expect(v.verdict).toBe('too close to call')
    const w = forcingVerdict({ method: 'two-stream', tau: 0, omega: 0.9, asymmetry: 0.6, surfaceAlbedo: 0.3 })
    expect(Math.abs(w.forcingWm2)).toBeLessThan(1e-12)
    expect(Number.isFinite(w.omegaCritical) && Number.isFinite(w.flipSurfaceAlbedo)).toBe(true)
    const z = thinLayerForcing({ tau: 0.1, omega: 0.5, upscatter: 0, surfaceAlbedo: 0 })
    expect(z.forcingWm2 === 0).toBe(true)
    expect(Number.isFinite(z.omegaCritical)).toBe(true)
  })
})
