/**
 * Two-stream fluxes with thermal emission through a stack of plane-parallel layers over an emitting, Lambertian
 * surface, in one band: the hemispheric-mean two-stream with a Planck source linear in optical depth of
 * Toon, O. B., McKay, C. P., Ackerman, T. P. & Santhanam, K. (1989), "Rapid calculation of radiative heating
 * rates and photodissociation rates in inhomogeneous multiple scattering atmospheres", J. Geophys. Res. 94(D13),
 * 16287–16301 (their Table 1, hemispheric mean: γ₁ = 2 − ω(1 + g), γ₂ = ω(1 − g), μ₁ = 1/2; eqs. 21–27).
 *
 * With τ counted downward from a layer's top, the fluxes obey
 *   dF↑/dτ = γ₁F↑ − γ₂F↓ − D(1 − ω)πB(τ),   dF↓/dτ = γ₂F↑ − γ₁F↓ + D(1 − ω)πB(τ),
 * where D = 1/μ₁ is the diffusivity factor (2 for the hemispheric mean; γ₁ = D(1 − ω(1 + g)/2), γ₂ = Dω(1 − g)/2
 * in general) and πB(τ) = πB₀ + πB₁τ is the band's blackbody flux, linear in τ across the layer. The particular
 * solution is F↑,↓ = π[B₀ + B₁(τ ± 1/(γ₁ + γ₂))] (Toon et al. eq. 27, with 2πμ₁ = π for μ₁ = 1/2; written with π
 * here for any D, so that a deep isothermal layer emits exactly πB). The homogeneous modes are (Γ, 1)e^{−λτ} and
 * (1, Γ)e^{−λ(τₙ−τ)} with λ = √(γ₁² − γ₂²) and Γ = γ₂/(γ₁ + λ) (Toon et al. eqs. 21–22), each 1 at the face it
 * decays from, so no exponential overflows; a conservative layer (ω = 1, λ = 0) takes the modes (1, 1) and
 * ((γ₁ + γ₂)τ ± 1)/2 instead. No delta scaling (the thermal infrared's particles are small against the wavelength).
 * The layers' coefficients follow from continuity of F↑ and F↓ at each interface, F↓ = 0 at the top (no thermal
 * radiation from space) and F↑ = επB_s + (1 − ε)F↓ at the surface: a 2N × 2N linear system, solved by Gaussian
 * elimination with partial pivoting (N is a dozen or so).
 */
import { InputError } from '../errors.ts'

/** One layer in one band. */
export interface ThermalLayer {
  /** Optical depth (extinction: gas absorption and particle extinction together), ≥ 0. */
  tau: number
  /** Single-scattering albedo, 0..1. */
  omega: number
  /** Asymmetry parameter, −1..1. */
  g: number
  /** Band blackbody flux πB at the layer's top and bottom temperatures, W m⁻² (linear in τ between them). */
  emissionTop: number
  emissionBottom: number
}

export interface ThermalStackInput {
  /** Layers from the top down. */
  layers: readonly ThermalLayer[]
  /** Surface emissivity in the band, 0..1 (the rest is reflected, Lambertian). */
  surfaceEmissivity: number
  /** Band blackbody flux πB of the surface at its temperature, W m⁻². */
  surfaceEmission: number
  /** Diffusivity factor D = 1/μ₁; default 2 (the hemispheric mean of Toon et al. 1989). */
  diffusivity?: number
}

export interface ThermalStackFluxes {
  /** Upward and downward flux at each level from the top (N + 1 values), W m⁻². */
  up: Float64Array
  down: Float64Array
}

/** The hemispheric-mean diffusivity factor, 1/μ₁ with μ₁ = 1/2 (Toon et al. 1989, Table 1). */
export const HEMISPHERIC_MEAN_DIFFUSIVITY = 2

/** Below this 1 − ω a layer is solved as conservative (the two modes of λ → 0 merge). */
const CONSERVATIVE_GAP = 1e-12

/** Solves the stack; see the module note for the equations. */
export function thermalTwoStream(input: ThermalStackInput): ThermalStackFluxes {
  const { layers, surfaceEmissivity: eps, surfaceEmission: es } = input
  const D = input.diffusivity ?? HEMISPHERIC_MEAN_DIFFUSIVITY
  const n = layers.length
  if (!(D > 0 && Number.isFinite(D))) throw new InputError('diffusivity', `${D} is not a positive number`, 'Give a diffusivity factor such as 2 (hemispheric mean) or 1.66.')
  if (!(eps >= 0 && eps <= 1)) throw new InputError('surfaceEmissivity', `${eps} is outside 0 to 1`, 'Give an emissivity from 0 to 1.')
  if (!(es >= 0 && Number.isFinite(es))) throw new InputError('surfaceEmission', `${es} is not a non-negative flux`, 'Give the band blackbody flux in W m⁻².')
  // per layer: mode values at top and bottom [Aup, Adn, Bup, Bdn] and particular values [up, dn]; these and the
  // system below in scratch arrays kept between calls (an uncertainty run solves a stack per band in every draw)
  const { top, bot, ptop, pbot, a, rhs } = scratchFor(n)
  for (let i = 0; i < n; i++) {
    const L = layers[i]
    const t = L.tau
    if (!(t >= 0 && Number.isFinite(t))) throw new InputError(`layer ${i + 1}: tau`, `${t} is not a non-negative optical depth`, 'Give a finite optical depth ≥ 0.')
    if (!(L.omega >= 0 && L.omega <= 1)) throw new InputError(`layer ${i + 1}: omega`, `${L.omega} is outside 0 to 1`, 'Give ω from 0 to 1.')
    if (!(L.g >= -1 && L.g <= 1)) throw new InputError(`layer ${i + 1}: g`, `${L.g} is outside −1 to 1`, 'Give g from −1 to 1.')
    const w = 1 - L.omega < CONSERVATIVE_GAP ? 1 : L.omega
    const g1 = D * (1 - (w * (1 + L.g)) / 2)
    const g2 = (D * w * (1 - L.g)) / 2
    const j = 4 * i
    if (w === 1) {
      // F↑ − F↓ constant, F↑ + F↓ linear in τ: modes (1, 1) and ((γ₁ + γ₂)τ ± 1)/2; no emission
      const s = g1 + g2
      set4(top, j, 1, 1, 0.5, -0.5)
      set4(bot, j, 1, 1, (s * t + 1) / 2, (s * t - 1) / 2)
      ptop[2 * i] = ptop[2 * i + 1] = pbot[2 * i] = pbot[2 * i + 1] = 0
      continue
    }
    const lam = Math.sqrt(Math.max(0, g1 * g1 - g2 * g2))
    const G = g2 / (g1 + lam)
    const e = Math.exp(-lam * t)
    set4(top, j, G, 1, e, G * e)
    set4(bot, j, G * e, e, 1, G)
    const b0 = L.emissionTop
    const b1 = t > 0 ? (L.emissionBottom - L.emissionTop) / t : 0
    const off = b1 / (g1 + g2)
    ptop[2 * i] = b0 + off
    ptop[2 * i + 1] = b0 - off
    pbot[2 * i] = b0 + b1 * t + off
    pbot[2 * i + 1] = b0 + b1 * t - off
  }
  // unknowns x = [A₁, B₁, A₂, B₂, …]; rows: top, 2 per interface, surface
  const m = 2 * n
  if (n === 0) {
    return { up: Float64Array.of(eps * es), down: Float64Array.of(0) }
  }
  // top: F↓(0) of layer 1 = 0
  a[0] = top[1]
  a[1] = top[3]
  rhs[0] = -ptop[1]
  for (let i = 0; i < n - 1; i++) {
    const r = 1 + 2 * i
    const c = 2 * i
    for (let k = 0; k < 2; k++) {
      // k = 0: F↑, k = 1: F↓; layer i's bottom equals layer i+1's top
      const row = (r + k) * m
      a[row + c] = bot[4 * i + k]
      a[row + c + 1] = bot[4 * i + 2 + k]
      a[row + c + 2] = -top[4 * (i + 1) + k]
      a[row + c + 3] = -top[4 * (i + 1) + 2 + k]
      rhs[r + k] = ptop[2 * (i + 1) + k] - pbot[2 * i + k]
    }
  }
  // surface: F↑ − (1 − ε)F↓ = εB_s at the bottom of layer n
  const last = n - 1
  const row = (m - 1) * m
  a[row + 2 * last] = bot[4 * last] - (1 - eps) * bot[4 * last + 1]
  a[row + 2 * last + 1] = bot[4 * last + 2] - (1 - eps) * bot[4 * last + 3]
  rhs[m - 1] = eps * es - pbot[2 * last] + (1 - eps) * pbot[2 * last + 1]
  solveInPlace(a, rhs, m)
  const up = new Float64Array(n + 1)
  const down = new Float64Array(n + 1)
  for (let i = 0; i < n; i++) {
    const A = rhs[2 * i]
    const B = rhs[2 * i + 1]
    up[i] = A * top[4 * i] + B * top[4 * i + 2] + ptop[2 * i]
    down[i] = A * top[4 * i + 1] + B * top[4 * i + 3] + ptop[2 * i + 1]
  }
  const A = rhs[2 * last]
  const B = rhs[2 * last + 1]
  up[n] = A * bot[4 * last] + B * bot[4 * last + 2] + pbot[2 * last]
  down[n] = A * bot[4 * last + 1] + B * bot[4 * last + 3] + pbot[2 * last + 1]
  return { up, down }
}

/** The scratch arrays of thermalTwoStream, room for n layers (grown when a stack has more); the m × m matrix (m = 2n) is
 * read from the start of `a`, zeroed here. */
let scratch = { top: new Float64Array(0), bot: new Float64Array(0), ptop: new Float64Array(0), pbot: new Float64Array(0), a: new Float64Array(0), rhs: new Float64Array(0) }
function scratchFor(n: number): typeof scratch {
  const m = 2 * n
  if (scratch.top.length < 4 * n) {
    scratch = { top: new Float64Array(4 * n), bot: new Float64Array(4 * n), ptop: new Float64Array(2 * n), pbot: new Float64Array(2 * n), a: new Float64Array(m * m), rhs: new Float64Array(m) }
  }
  scratch.a.fill(0, 0, m * m)
  scratch.rhs.fill(0, 0, m)
  return scratch
}

function set4(x: Float64Array, j: number, v0: number, v1: number, v2: number, v3: number): void {
  x[j] = v0
  x[j + 1] = v1
  x[j + 2] = v2
  x[j + 3] = v3
}

/**
 * Gaussian elimination with partial pivoting; a is m × m row-major, the solution replaces b. The system is banded
 * (each row touches at most two columns to the left of the diagonal and two to the right; pivoting among the
 * next two rows widens the upper band to four), so the loops stay within the band.
 */
function solveInPlace(a: Float64Array, b: Float64Array, m: number): void {
  for (let k = 0; k < m; k++) {
    const rowEnd = Math.min(m - 1, k + 2)
    const colEnd = Math.min(m - 1, k + 4)
    let p = k
    let best = Math.abs(a[k * m + k])
    for (let i = k + 1; i <= rowEnd; i++) {
      const v = Math.abs(a[i * m + k])
      if (v > best) {
        best = v
        p = i
      }
    }
    if (best === 0) throw new Error('thermalTwoStream: singular system')
    if (p !== k) {
      for (let j = k; j <= colEnd; j++) {
        const t = a[k * m + j]
        a[k * m + j] = a[p * m + j]
        a[p * m + j] = t
      }
      const t = b[k]
      b[k] = b[p]
      b[p] = t
    }
    const piv = a[k * m + k]
    for (let i = k + 1; i <= rowEnd; i++) {
      const f = a[i * m + k] / piv
      if (f === 0) continue
      for (let j = k; j <= colEnd; j++) a[i * m + j] -= f * a[k * m + j]
      b[i] -= f * b[k]
    }
  }
  for (let k = m - 1; k >= 0; k--) {
    let s = b[k]
    const colEnd = Math.min(m - 1, k + 4)
    for (let j = k + 1; j <= colEnd; j++) s -= a[k * m + j] * b[j]
    b[k] = s / a[k * m + k]
  }
}
