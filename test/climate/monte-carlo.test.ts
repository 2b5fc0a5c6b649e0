/**
 * Independent check of the delta-Eddington + adding code by Monte Carlo photon transport, written here
 * and sharing nothing with the library: a plane-parallel slab of optical depth τ with single-scattering
 * albedo ω and the Henyey–Greenstein phase function (Henyey, L. G. & Greenstein, J. L. (1941), Astrophys.
 * J. 93, 70–83), over a Lambertian floor of albedo R_s, lit by a parallel beam at cos(zenith) μ₀.
 * Analogue simulation: exponential free paths, absorption with probability 1 − ω at each collision,
 * HG deflection sampled by inverting its cumulative distribution, cosine-weighted (Lambertian) reflection
 * at the floor. Statistical 1σ error with N = 10⁵ photons is ≤ √(0.25/N) ≈ 0.0016.
 *
 * Measured (seeds as in the test), Monte Carlo vs. delta-Eddington, fractions of the incident flux:
 *   case (τ, ω, g, μ₀, R_s)      reflectance      surface absorptance   layer absorptance
 *   0.1, 0.9, 0.7, 0.866, 0.2    0.197 vs 0.199   0.787 vs 0.785        0.016 vs 0.015
 *   0.5, 1,   0.7, 0.5,   0.15   0.270 vs 0.260   0.730 vs 0.740        0     vs 0
 *   1,   0.9, 0.7, 0.5,   0.2    0.278 vs 0.282   0.495 vs 0.521        0.227 vs 0.198
 *   1,   0.8, 0.6, 1,     0.5    0.279 vs 0.296   0.379 vs 0.381        0.342 vs 0.322
 *   2,   0.95, 0.75, 0.7, 0.1    0.247 vs 0.250   0.571 vs 0.588        0.183 vs 0.162
 *   0.3, 0.3, 0.4, 0.6,   0.85   0.411 vs 0.421   0.103 vs 0.104        0.486 vs 0.475
 *   0.5, 0.9, 0,   0.5,   0      0.278 vs 0.282   0.616 vs 0.625        0.106 vs 0.093
 * Reflectance agrees within 0.018 (largest at overhead sun over a bright floor); delta-Eddington
 * absorbs less in the layer than the Monte Carlo, by up to 0.029 (≈ 13 % relative) for moderately thick
 * absorbing layers, and puts that energy into the surface. This is in line with the known accuracy of
 * two-stream methods (errors of a few percent in fluxes, larger relative errors in absorption; e.g.
 * King, M. D. & Harshvardhan (1986), J. Atmos. Sci. 43, 784–801, from memory). Hence the tolerances:
 * 0.02 in reflectance (which sets the TOA forcing) and 0.035 in the absorptances.
 */
import { describe, expect, it } from 'vitest'
import { layerOverLambertianSurface } from '../../src-core/index.ts'

/** mulberry32: a small seeded 32-bit generator (Tommy Ettinger, public domain; from memory). Returns [0, 1). */
function makeRandom(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Cosine of the HG deflection angle for a uniform deviate u (inverse CDF; Henyey & Greenstein 1941). */
function sampleHenyeyGreenstein(g: number, u: number): number {
  if (Math.abs(g) < 1e-9) return 2 * u - 1
  const q = (1 - g * g) / (1 - g + 2 * g * u)
  return Math.max(-1, Math.min(1, (1 + g * g - q * q) / (2 * g)))
}

interface Tally {
  reflectance: number
  surfaceAbsorptance: number
  layerAbsorptance: number
}

function photonTransport(tau: number, omega: number, g: number, mu0: number, Rs: number, photons: number, seed: number): Tally {
  const rnd = makeRandom(seed)
  let up = 0
  let floor = 0
  let layer = 0
  for (let p = 0; p < photons; p++) {
    let z = 0 // optical depth below the top
    let mu = mu0 // direction cosine, positive downward
    for (;;) {
      z += -Math.log(1 - rnd()) * mu
      if (z < 0) {
        up++
        break
      }
      if (z > tau) {
        if (rnd() < Rs) {
          z = tau
          mu = -Math.sqrt(rnd()) // Lambertian: cosine-weighted upward direction
          continue
        }
        floor++
        break
      }
      if (rnd() >= omega) {
        layer++
        break
      }
      const c = sampleHenyeyGreenstein(g, rnd())
      const s = Math.sqrt(Math.max(0, 1 - c * c))
      const phi = 2 * Math.PI * rnd()
      mu = mu * c + Math.sqrt(Math.max(0, 1 - mu * mu)) * s * Math.cos(phi)
    }
  }
  return { reflectance: up / photons, surfaceAbsorptance: floor / photons, layerAbsorptance: layer / photons }
}

const N = 100_000

describe('Monte Carlo photon transport (test-side, independent)', () => {
  it('is itself right where answers are exact: Beer–Lambert for ω = 0, the bare floor for τ = 0, and the HG mean cosine = g (closed forms)', () => {
    // closed form: a pure absorber absorbs 1 − e^{−τ/μ₀}
    const a = photonTransport(0.7, 0, 0.5, 0.6, 0, N, 11)
    expect(Math.abs(a.layerAbsorptance - (1 - Math.exp(-0.7 / 0.6)))).toBeLessThan(0.006)
    // closed form: no layer ⇒ reflectance = R_s
    const b = photonTransport(0, 0.9, 0.5, 0.6, 0.35, N, 12)
    expect(Math.abs(b.reflectance - 0.35)).toBeLessThan(0.006)
    // closed form: ⟨cos Θ⟩ = g for Henyey–Greenstein (Henyey & Greenstein 1941)
    const rnd = makeRandom(13)
    let s = 0
    for (let i = 0; i < N; i++) s += sampleHenyeyGreenstein(0.7, rnd())
    expect(Math.abs(s / N - 0.7)).toBeLessThan(0.005)
  })

  const cases: Array<[number, number, number, number, number]> = [
    // τ, ω, g, μ₀, R_s
    [0.1, 0.9, 0.7, 0.866, 0.2],
    [0.5, 1.0, 0.7, 0.5, 0.15],
    [1, 0.9, 0.7, 0.5, 0.2],
    [1, 0.8, 0.6, 1, 0.5],
    [2, 0.95, 0.75, 0.7, 0.1],
    [0.3, 0.3, 0.4, 0.6, 0.85],
    [0.5, 0.9, 0, 0.5, 0]
  ]
  it.each(cases)('delta-Eddington + adding agrees with Monte Carlo: τ=%s ω=%s g=%s μ₀=%s R_s=%s (two-stream accuracy a few percent, from memory)', (tau, omega, g, mu0, Rs) => {
    const seed = Math.round(1000 * tau + 100 * omega + 10 * g + mu0 * 7 + Rs * 13) + 1
    const mc = photonTransport(tau, omega, g, mu0, Rs, N, seed)
    const de = layerOverLambertianSurface({ tau, omega, asymmetry: g }, mu0, Rs)
    const msg = `MC R=${mc.reflectance.toFixed(4)} Asfc=${mc.surfaceAbsorptance.toFixed(4)} Alay=${mc.layerAbsorptance.toFixed(4)}; ` +
      `dE R=${de.reflectance.toFixed(4)} Asfc=${de.surfaceAbsorptance.toFixed(4)} Alay=${de.layerAbsorptance.toFixed(4)}`
    expect(Math.abs(de.reflectance - mc.reflectance), msg).toBeLessThan(0.02)
    expect(Math.abs(de.layerAbsorptance - mc.layerAbsorptance), msg).toBeLessThan(0.035)
    expect(Math.abs(de.surfaceAbsorptance - mc.surfaceAbsorptance), msg).toBeLessThan(0.035)
    // and the sign of the TOA forcing (R_sys − R_s) is the same
    expect(Math.sign(de.reflectance - Rs), msg).toBe(Math.sign(mc.reflectance - Rs))
  })
})
