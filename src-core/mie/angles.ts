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
 */
export class AngularTable {
  readonly mu: Float64Array
  private pi: Float64Array = new Float64Array(0)
  private tau: Float64Array = new Float64Array(0)
  private nMax = 0
  private s1r: Float64Array
  private s1i: Float64Array
  private s2r: Float64Array
  private s2i: Float64Array

  constructor(mu: ArrayLike<number>) {
    this.mu = Float64Array.from(mu)
    const m = this.mu.length
    this.s1r = new Float64Array(m)
    this.s1i = new Float64Array(m)
    this.s2r = new Float64Array(m)
    this.s2i = new Float64Array(m)
  }

  /** Makes sure pi_n, tau_n are tabulated up to n = nTerms. */
  private grow(nTerms: number): void {
    if (nTerms <= this.nMax) return
    const nMax = Math.max(nTerms, Math.ceil(this.nMax * 1.5), 32)
    const m = this.mu.length
    const pi = new Float64Array((nMax + 1) * m)
    const tau = new Float64Array((nMax + 1) * m)
    for (let j = 0; j < m; j++) {
      const mu = this.mu[j]
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
    const m = this.mu.length
    const { s1r, s1i, s2r, s2i, pi, tau } = this
    s1r.fill(0)
    s1i.fill(0)
    s2r.fill(0)
    s2i.fill(0)
    const aRe = ws.aRe
    const aIm = ws.aIm
    const bRe = ws.bRe
    const bIm = ws.bIm
    for (let n = 1; n <= nTerms; n++) {
      const f = (2 * n + 1) / (n * (n + 1))
      const ar = f * aRe[n]
      const ai = f * aIm[n]
      const br = f * bRe[n]
      const bi = f * bIm[n]
      const base = n * m
      for (let j = 0; j < m; j++) {
        const p = pi[base + j]
        const t = tau[base + j]
        s1r[j] += ar * p + br * t
        s1i[j] += ai * p + bi * t
        s2r[j] += ar * t + br * p
        s2i[j] += ai * t + bi * p
      }
    }
    for (let j = 0; j < m; j++) {
      const i1 = s1r[j] * s1r[j] + s1i[j] * s1i[j]
      const i2 = s2r[j] * s2r[j] + s2i[j] * s2i[j]
      acc11[j] += weight * 0.5 * (i2 + i1)
      if (acc12) acc12[j] += weight * 0.5 * (i2 - i1)
    }
  }
}
