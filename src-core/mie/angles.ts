/**
 * Angular scattering of a sphere from its Mie coefficients: amplitude functions S1, S2, the Mueller
 * elements S11, S12, S33, S34, the phase function and the degree of linear polarisation.
 *
 * Angular functions by the usual upward recurrences (Bohren & Huffman 1983, eqs. 4.47):
 *   pi_n = ((2n−1)/(n−1)) μ pi_{n−1} − (n/(n−1)) pi_{n−2},  tau_n = n μ pi_n − (n+1) pi_{n−1};
 * S1 = Σ (2n+1)/(n(n+1)) (a_n pi_n + b_n tau_n), S2 = Σ (2n+1)/(n(n+1)) (a_n tau_n + b_n pi_n)
 * (eq. 4.74); S11 = (|S2|² + |S1|²)/2, S12 = (|S2|² − |S1|²)/2, S33 = Re(S2 S1*), S34 = Im(S2 S1*)
 * (eq. 4.77).
 *
 * The phase function is normalised to 4π: p(θ) = 4 S11 / (x² Q_sca), so that ∫ p dΩ = 4π
 * (its mean over the sphere is 1). Degree of linear polarisation: −S12/S11.
 */
import type { MieWorkspace, SphereEfficiencies } from './sphere.ts'

/** Angular results at the requested scattering angles (degrees). */
export interface AngularScattering {
  angles: Float64Array
  s1Re: Float64Array
  s1Im: Float64Array
  s2Re: Float64Array
  s2Im: Float64Array
  s11: Float64Array
  s12: Float64Array
  s33: Float64Array
  s34: Float64Array
  /** Phase function normalised so that its integral over the sphere is 4π. */
  phase: Float64Array
  /** Degree of linear polarisation −S12/S11. */
  polarization: Float64Array
}

/** Allocates an empty result for `count` angles (reuse it across calls of angularFromCoefficients). */
export function newAngularScattering(anglesDeg: ArrayLike<number>): AngularScattering {
  const m = anglesDeg.length
  const f = () => new Float64Array(m)
  return {
    angles: Float64Array.from(anglesDeg),
    s1Re: f(), s1Im: f(), s2Re: f(), s2Im: f(),
    s11: f(), s12: f(), s33: f(), s34: f(), phase: f(), polarization: f()
  }
}

/**
 * Fills `out` from the coefficients a_n, b_n in `ws` (as left by sphereEfficiencies or
 * coatedSphereEfficiencies with that workspace). `eff` supplies Q_sca for the phase-function
 * normalisation; x is the (outer) size parameter.
 */
export function angularFromCoefficients(x: number, ws: MieWorkspace, eff: SphereEfficiencies, out: AngularScattering): AngularScattering {
  const nTerms = ws.terms
  const aRe = ws.aRe
  const aIm = ws.aIm
  const bRe = ws.bRe
  const bIm = ws.bIm
  const norm = eff.qsca > 0 ? 4 / (x * x * eff.qsca) : 0
  for (let j = 0; j < out.angles.length; j++) {
    const mu = Math.cos((out.angles[j] * Math.PI) / 180)
    let piPrev = 0
    let piN = 1
    let s1r = 0
    let s1i = 0
    let s2r = 0
    let s2i = 0
    for (let n = 1; n <= nTerms; n++) {
      const tau = n * mu * piN - (n + 1) * piPrev
      const f = (2 * n + 1) / (n * (n + 1))
      s1r += f * (aRe[n] * piN + bRe[n] * tau)
      s1i += f * (aIm[n] * piN + bIm[n] * tau)
      s2r += f * (aRe[n] * tau + bRe[n] * piN)
      s2i += f * (aIm[n] * tau + bIm[n] * piN)
      const piNext = ((2 * n + 1) / n) * mu * piN - ((n + 1) / n) * piPrev
      piPrev = piN
      piN = piNext
    }
    const i1 = s1r * s1r + s1i * s1i
    const i2 = s2r * s2r + s2i * s2i
    const s11 = 0.5 * (i2 + i1)
    const s12 = 0.5 * (i2 - i1)
    out.s1Re[j] = s1r
    out.s1Im[j] = s1i
    out.s2Re[j] = s2r
    out.s2Im[j] = s2i
    out.s11[j] = s11
    out.s12[j] = s12
    out.s33[j] = s2r * s1r + s2i * s1i
    out.s34[j] = s2i * s1r - s2r * s1i
    out.phase[j] = norm * s11
    out.polarization[j] = s11 > 0 ? -s12 / s11 : 0
  }
  return out
}

/**
 * Angular functions pi_n(μ_j), tau_n(μ_j) tabulated once for a fixed set of cosines and reused for every
 * sphere: summing S1, S2 is then a pair of dot products per angle. For population phase functions, where
 * the same angles serve thousands of sizes.
 *
 * Mirrored cosines (μ and −μ, such as θ and 180° − θ, or Gauss nodes on both hemispheres) share one pass:
 * pi_n(−μ) = (−1)^(n−1) pi_n(μ) and tau_n(−μ) = (−1)^n tau_n(μ) (Bohren & Huffman 1983, §4.4.2), so each sum
 * splits into the terms that keep their sign under reflection (E) and those that change it (O), and
 * S(μ) = E + O, S(−μ) = E − O. A set made of mirrored pairs costs half as much as the same number of
 * unrelated cosines.
 */
export class AngularTable {
  readonly mu: Float64Array
  /** The cosines actually tabulated (one of each mirrored pair, the larger). */
  private readonly base: Float64Array
  /** For each requested cosine: its base index, and whether it is the mirror image (−μ) of that base. */
  private readonly baseOf: Int32Array
  private readonly mirrored: Uint8Array
  private pi: Float64Array = new Float64Array(0)
  private tau: Float64Array = new Float64Array(0)
  private nMax = 0
  /** Per base cosine: E and O sums of S1 and S2, real and imaginary (8 running sums). */
  private readonly sums: Float64Array

  constructor(mu: ArrayLike<number>) {
    this.mu = Float64Array.from(mu)
    const m = this.mu.length
    this.baseOf = new Int32Array(m)
    this.mirrored = new Uint8Array(m)
    const bases: number[] = []
    const taken = new Uint8Array(m)
    for (let j = 0; j < m; j++) {
      if (taken[j]) continue
      const b = bases.length
      bases.push(Math.abs(this.mu[j]))
      taken[j] = 1
      this.baseOf[j] = b
      this.mirrored[j] = this.mu[j] < 0 ? 1 : 0
      // its mirror image, if the set holds one (to rounding: Gauss nodes and cos θ are mirrored to an ulp or so)
      for (let i = j + 1; i < m; i++) {
        if (!taken[i] && Math.abs(this.mu[i] + this.mu[j]) <= 1e-15 && this.mu[j] !== 0) {
          taken[i] = 1
          this.baseOf[i] = b
          this.mirrored[i] = this.mu[i] < 0 ? 1 : 0
          break
        }
      }
    }
    this.base = Float64Array.from(bases)
    this.sums = new Float64Array(8 * bases.length)
  }

  /** Makes sure pi_n, tau_n are tabulated up to n = nTerms. */
  private grow(nTerms: number): void {
    if (nTerms <= this.nMax) return
    const nMax = Math.max(nTerms, Math.ceil(this.nMax * 1.5), 32)
    const m = this.base.length
    const pi = new Float64Array((nMax + 1) * m)
    const tau = new Float64Array((nMax + 1) * m)
    for (let j = 0; j < m; j++) {
      const mu = this.base[j]
      let piPrev = 0
      let piN = 1
      for (let n = 1; n <= nMax; n++) {
        pi[n * m + j] = piN
        tau[n * m + j] = n * mu * piN - (n + 1) * piPrev
        const piNext = ((2 * n + 1) / n) * mu * piN - ((n + 1) / n) * piPrev
        piPrev = piN
        piN = piNext
      }
    }
    this.pi = pi
    this.tau = tau
    this.nMax = nMax
  }

  /**
   * Adds weight·S11(μ_j) into acc11 and, if given, weight·S12(μ_j) into acc12, for the sphere whose
   * coefficients are in `ws`.
   */
  accumulate(ws: MieWorkspace, weight: number, acc11: Float64Array, acc12: Float64Array | null): void {
    const nTerms = ws.terms
    this.grow(nTerms)
    const m = this.base.length
    const { pi, tau, sums } = this
    sums.fill(0)
    const aRe = ws.aRe
    const aIm = ws.aIm
    const bRe = ws.bRe
    const bIm = ws.bIm
    // sums per base j at 8j: E1r, E1i, O1r, O1i, E2r, E2i, O2r, O2i.
    // Odd n: a·pi and b·pi keep their sign (E), a·tau and b·tau change it (O); even n the other way round.
    for (let n = 1; n <= nTerms; n++) {
      const f = (2 * n + 1) / (n * (n + 1))
      const ar = f * aRe[n]
      const ai = f * aIm[n]
      const br = f * bRe[n]
      const bi = f * bIm[n]
      const base = n * m
      const odd = n & 1
      // S1 = Σ a pi + b tau, S2 = Σ a tau + b pi; the pi terms go to E when n is odd, to O when even.
      const piTo1 = odd ? 0 : 2
      const tauTo1 = odd ? 2 : 0
      for (let j = 0; j < m; j++) {
        const p = pi[base + j]
        const t = tau[base + j]
        const k = 8 * j
        sums[k + piTo1] += ar * p
        sums[k + piTo1 + 1] += ai * p
        sums[k + tauTo1] += br * t
        sums[k + tauTo1 + 1] += bi * t
        sums[k + 4 + piTo1] += br * p
        sums[k + 5 + piTo1] += bi * p
        sums[k + 4 + tauTo1] += ar * t
        sums[k + 5 + tauTo1] += ai * t
      }
    }
    const out = this.mu.length
    for (let j = 0; j < out; j++) {
      const k = 8 * this.baseOf[j]
      const sgn = this.mirrored[j] ? -1 : 1
      const s1r = sums[k] + sgn * sums[k + 2]
      const s1i = sums[k + 1] + sgn * sums[k + 3]
      const s2r = sums[k + 4] + sgn * sums[k + 6]
      const s2i = sums[k + 5] + sgn * sums[k + 7]
      const i1 = s1r * s1r + s1i * s1i
      const i2 = s2r * s2r + s2i * s2i
      acc11[j] += weight * 0.5 * (i2 + i1)
      if (acc12) acc12[j] += weight * 0.5 * (i2 - i1)
    }
  }
}
