import { describe, expect, it } from 'vitest'
import {
  InputError,
  SOLAR_CONSTANT_WM2,
  STEFAN_BOLTZMANN_WM2K4,
  dailyMeanInsolation,
  dailyMeanThinLayerForcing,
  dailyMeanTwoStreamForcing,
  earthSunDistanceFactor,
  rayleighOpticalDepth,
  solarBandFractions,
  solarBandWeights,
  solarDeclinationRad,
  solarFractionBelow,
  solarSpectralIrradiance,
  sunlitDayQuadrature,
  thinLayerForcing
} from '../../src-core/index.ts'

const DEG = Math.PI / 180

/** Composite Simpson rule of the spectrum on a log-λ grid (independent numerical integral). */
function integrateSpectrum(lo: number, hi: number, n = 4000): number {
  const a = Math.log(lo)
  const b = Math.log(hi)
  const h = (b - a) / n
  let s = 0
  for (let i = 0; i <= n; i++) {
    const lam = Math.exp(a + i * h)
    const f = solarSpectralIrradiance(lam) * lam // dλ = λ d(ln λ)
    s += f * (i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2)
  }
  return (s * h) / 3
}

describe('constants', () => {
  it('S₀ = 1361 W m⁻² (Kopp & Lean 2011) and σ equals 2π⁵k⁴/(15h³c²) (CODATA 2018 / SI 2019, closed form)', () => {
    expect(SOLAR_CONSTANT_WM2).toBe(1361)
    const h = 6.62607015e-34
    const c = 299792458
    const k = 1.380649e-23
    const sigma = (2 * Math.PI ** 5 * k ** 4) / (15 * h ** 3 * c ** 2)
    expect(Math.abs(STEFAN_BOLTZMANN_WM2K4 / sigma - 1)).toBeLessThan(1e-9)
  })
})

describe('blackbody approximation of the solar spectrum (5772 K, IAU 2015)', () => {
  it('integrates to S₀ over all wavelengths (numerical quadrature vs. scaling)', () => {
    // closed form: the spectrum is scaled so that its integral is S₀; checked by independent Simpson integration
    expect(integrateSpectrum(0.05, 2000) / SOLAR_CONSTANT_WM2).toBeCloseTo(1, 5)
  })
  it('peaks at Wien’s λ_max = b/T = 2897.77 µm K / 5772 K ≈ 0.502 µm (CODATA Wien constant)', () => {
    let best = 0
    let bestLam = 0
    for (let lam = 0.4; lam < 0.6; lam += 0.0001) {
      const e = solarSpectralIrradiance(lam)
      if (e > best) {
        best = e
        bestLam = lam
      }
    }
    expect(Math.abs(bestLam - 2897.771955 / 5772)).toBeLessThan(0.0002)
  })
  it('fraction below λ (series) matches direct numerical integration, on both sides of the series switch (numerical check)', () => {
    const below0 = solarFractionBelow(0.05) // essentially zero; integrate from there
    for (const lam of [0.25, 0.3, 0.5, 0.7, 1, 2, 2.45, 2.55, 4, 10, 50]) {
      const num = integrateSpectrum(0.05, lam) / SOLAR_CONSTANT_WM2
      expect(Math.abs(solarFractionBelow(lam) - below0 - num)).toBeLessThan(2e-6)
    }
  })
  it('25.0 % of blackbody energy lies below the Wien peak, λT = 2898 µm K (Incropera & DeWitt blackbody table, from memory)', () => {
    expect(solarFractionBelow(2898 / 5772)).toBeCloseTo(0.2501, 3)
  })
  it('band weights: fractions + remainder outside 0.3–4 µm add up to 1, edges at midpoints (closed form bookkeeping)', () => {
    const w = solarBandWeights([0.35, 0.44, 0.55, 0.67, 0.87, 1.02, 1.64, 2.13])
    const edges = [0.3, 0.395, 0.495, 0.61, 0.77, 0.945, 1.33, 1.885, 4]
    edges.forEach((e, i) => expect(w.edgesUm[i]).toBeCloseTo(e, 12))
    const sum = w.fractions.reduce((a, b) => a + b, 0)
    expect(sum + w.fractionBelowRange + w.fractionAboveRange).toBeCloseTo(1, 12)
    // remainder outside 0.3–4 µm is a few percent for a 5772 K blackbody (numerical check)
    expect(w.fractionBelowRange).toBeCloseTo(integrateSpectrum(0.01, 0.3) / SOLAR_CONSTANT_WM2, 5)
    expect(w.fractionAboveRange).toBeCloseTo(integrateSpectrum(4, 5000, 8000) / SOLAR_CONSTANT_WM2, 5)
    expect(w.fractionBelowRange + w.fractionAboveRange).toBeLessThan(0.05)
    for (let i = 0; i < w.fractions.length; i++) expect(w.irradianceWm2[i]).toBeCloseTo(w.fractions[i] * SOLAR_CONSTANT_WM2, 9)
    // a single band over all wavelengths holds everything
    expect(solarBandFractions([1e-3, Number.POSITIVE_INFINITY])[0]).toBeCloseTo(1, 12)
  })
  it('rejects bad band edges with InputError', () => {
    expect(() => solarBandFractions([0.5, 0.4])).toThrow(InputError)
    expect(() => solarBandWeights([0.2, 0.5])).toThrow(InputError)
    expect(() => solarSpectralIrradiance(-1)).toThrow(InputError)
  })
})

describe('Rayleigh optical depth', () => {
  it('is about 0.097 at 550 nm and sea-level pressure (Bodhaine et al. 1999 table, from memory)', () => {
    expect(rayleighOpticalDepth(0.55)).toBeCloseTo(0.0973, 3)
    expect(rayleighOpticalDepth(0.55, 1013.25, 'bodhaine-1999')).toBeCloseTo(0.0973, 3)
  })
  it('the two published fits agree within 1 % over 0.3–1 µm (Hansen & Travis 1974 vs Bodhaine et al. 1999)', () => {
    for (let i = 0; i <= 14; i++) {
      const lam = 0.3 + 0.05 * i
      const a = rayleighOpticalDepth(lam, 1013.25, 'hansen-travis-1974')
      const b = rayleighOpticalDepth(lam, 1013.25, 'bodhaine-1999')
      expect(Math.abs(a / b - 1)).toBeLessThan(0.01)
    }
  })
  it('follows roughly λ⁻⁴ (a bit steeper from the dispersion of air) and is proportional to surface pressure (hydrostatic column, common practice)', () => {
    const r = rayleighOpticalDepth(0.4) / rayleighOpticalDepth(0.8)
    expect(r).toBeGreaterThan(16)
    expect(r).toBeLessThan(18)
    expect(rayleighOpticalDepth(0.5, 500)).toBeCloseTo(rayleighOpticalDepth(0.5) * (500 / 1013.25), 12)
  })
})

describe('solar geometry and daily-mean insolation', () => {
  it('Spencer declination and distance factor agree with the simpler textbook formulas (Cooper 1969; Duffie & Beckman, from memory)', () => {
    for (let d = 1; d <= 365; d += 7) {
      const cooper = 23.45 * DEG * Math.sin((2 * Math.PI * (284 + d)) / 365)
      expect(Math.abs(solarDeclinationRad(d) - cooper)).toBeLessThan(1.5 * DEG)
      expect(Math.abs(earthSunDistanceFactor(d) - (1 + 0.033 * Math.cos((2 * Math.PI * d) / 365)))).toBeLessThan(0.003)
    }
    // June solstice declination ≈ +23.44° (obliquity, common practice)
    expect(Math.abs(solarDeclinationRad(172) / DEG - 23.44)).toBeLessThan(0.1)
  })
  it('equator at equinox: Q ≈ S₀/π ≈ 433 W m⁻² with distance factor ≈ 1 within ~1 % (closed form)', () => {
    // closed form: at φ = 0, δ ≈ 0 the sunset hour angle is π/2 and Q = (S₀/π)(d̄/d)² cos δ
    const d = 80 // ~20 March
    expect(Math.abs(earthSunDistanceFactor(d) - 1)).toBeLessThan(0.01)
    const q = dailyMeanInsolation(0, d)
    expect(Math.abs(q / (SOLAR_CONSTANT_WM2 / Math.PI) - 1)).toBeLessThan(0.01)
    expect(q).toBeCloseTo((SOLAR_CONSTANT_WM2 / Math.PI) * earthSunDistanceFactor(d) * Math.cos(solarDeclinationRad(d)), 10)
  })
  it('is exactly 0 in polar night (80°N, day 355), with an empty quadrature and zero forcing, never NaN (closed form)', () => {
    expect(dailyMeanInsolation(80, 355)).toBe(0)
    expect(dailyMeanInsolation(-90, 172)).toBe(0)
    const q = sunlitDayQuadrature(80, 355)
    expect(q.cosZenith.length).toBe(0)
    expect(q.insolationWm2).toBe(0)
    expect(q.dayLengthHours).toBe(0)
    const f = dailyMeanThinLayerForcing({ latitudeDeg: 80, dayOfYear: 355, tau: 0.1, omega: 0.9, upscatter: 0.25, surfaceAlbedo: 0.6 })
    expect(f.forcingWm2).toBe(0)
    const g = dailyMeanTwoStreamForcing({ latitudeDeg: 80, dayOfYear: 355, tau: 0.1, omega: 0.9, asymmetry: 0.7, surfaceAlbedo: 0.6 })
    expect(g.toaWm2).toBe(0)
    expect(g.surfaceWm2).toBe(0)
    expect(g.atmosphereWm2).toBe(0)
  })
  it('polar day at the pole: constant sun at elevation δ, Q = S₀(d̄/d)² sin δ (closed form)', () => {
    const d = 172
    const q = dailyMeanInsolation(90, d)
    expect(q).toBeCloseTo(SOLAR_CONSTANT_WM2 * earthSunDistanceFactor(d) * Math.sin(solarDeclinationRad(d)), 8)
    const quad = sunlitDayQuadrature(90, d)
    expect(quad.dayLengthHours).toBeCloseTo(24, 10)
    for (const mu of quad.cosZenith) expect(mu).toBeCloseTo(Math.sin(solarDeclinationRad(d)), 12)
  })
  it('annual mean: equator > pole, ≈ 417 and ≈ 173 W m⁻² (Hartmann 1994, Global Physical Climatology, from memory)', () => {
    let eq = 0
    let pole = 0
    for (let d = 1; d <= 365; d++) {
      eq += dailyMeanInsolation(0, d) / 365
      pole += dailyMeanInsolation(90, d) / 365
    }
    expect(eq).toBeGreaterThan(pole)
    expect(Math.abs(eq - 417)).toBeLessThan(6)
    expect(Math.abs(pole - 173)).toBeLessThan(6)
  })
  it('global mean over latitude on any day equals S₀(d̄/d)²/4 (closed form: sphere intercepts πa²S, spreads over 4πa²)', () => {
    for (const d of [1, 80, 172, 266, 355]) {
      const n = 2000
      let s = 0
      for (let i = 0; i < n; i++) {
        const x = -1 + (2 * (i + 0.5)) / n // sin φ, equal-area midpoints
        s += dailyMeanInsolation(Math.asin(x) / DEG, d) / n
      }
      expect(Math.abs(s / ((SOLAR_CONSTANT_WM2 * earthSunDistanceFactor(d)) / 4) - 1)).toBeLessThan(1e-5)
    }
  })
  it('hour-angle quadrature reproduces the closed-form daily mean and the mean μ₀ (closed form)', () => {
    for (const [lat, d] of [[0, 80], [45, 100], [-30, 10], [70, 172], [66, 355]]) {
      const q = sunlitDayQuadrature(lat, d)
      const closed = dailyMeanInsolation(lat, d)
      expect(Math.abs(q.insolationWm2 - closed)).toBeLessThan(1e-9 * SOLAR_CONSTANT_WM2 + 1e-12)
      const tw = q.timeWeights.reduce((a, b) => a + b, 0)
      expect(tw).toBeCloseTo(q.sunsetHourAngleRad / Math.PI, 12) // sunlit fraction of the day
    }
  })
})

describe('day-averaged thin-layer forcing (slant-path form)', () => {
  it('averaged over the globe with constant β it reduces to the Chylek & Wong S₀/4 form (derivation in insolation.ts; closed form)', () => {
    // closed form: ⟨S μ₀⟩ = S/4, sunlit fraction 1/2 ⇒ global mean equals −(S/4)T²(1−A_c)[2(1−R)²β̄ωτ − 4R(1−ω)τ], S = S₀(d̄/d)²
    for (const [omega, Rs] of [[1, 0.1], [0.9, 0.3], [0.7, 0.8]]) {
      const base = { tau: 0.02, omega, upscatter: 0.22, surfaceAlbedo: Rs }
      for (const d of [80, 172]) {
        const n = 400
        let s = 0
        for (let i = 0; i < n; i++) {
          const x = -1 + (2 * (i + 0.5)) / n
          s += dailyMeanThinLayerForcing({ ...base, latitudeDeg: Math.asin(x) / DEG, dayOfYear: d }).forcingWm2 / n
        }
        const cw = thinLayerForcing({ ...base, solarConstant: SOLAR_CONSTANT_WM2 * earthSunDistanceFactor(d) }).forcingWm2
        expect(Math.abs(s - cw)).toBeLessThan(2e-4 * Math.abs(cw) + 1e-6)
      }
    }
  })
  it('a sun-angle-dependent β(μ₀) and transmittance T(μ₀) are averaged with the flux weights (closed form for constant functions)', () => {
    const base = { latitudeDeg: 40, dayOfYear: 200, tau: 0.05, omega: 0.92, surfaceAlbedo: 0.2 }
    const c = dailyMeanThinLayerForcing({ ...base, upscatter: 0.25, transmittance: 0.8 })
    const f = dailyMeanThinLayerForcing({ ...base, upscatter: () => 0.25, transmittance: () => 0.8 })
    expect(f.forcingWm2).toBeCloseTo(c.forcingWm2, 10)
    // larger upscatter at low sun (common practice: β grows as μ₀ falls) gives more cooling
    const g = dailyMeanThinLayerForcing({ ...base, upscatter: (mu) => 0.25 + 0.2 * (1 - mu), transmittance: 0.8 })
    expect(g.forcingWm2).toBeLessThan(c.forcingWm2)
    expect(() => dailyMeanThinLayerForcing({ ...base, upscatter: () => 2 })).toThrow(InputError)
  })
})
