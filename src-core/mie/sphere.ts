/**
 * Scattering and absorption by a homogeneous sphere: the Mie series.
 *
 * Method: Bohren & Huffman (1983), "Absorption and Scattering of Light by Small Particles", ch. 4,
 * with the improvements of Wiscombe (1980), Appl. Opt. 19:1505:
 * - series length N = x + 4.05 x^(1/3) + 2, lengthened by ½ x^(1/3) for the backscatter sum;
 * - the logarithmic derivative D_n(mx) by downward recurrence from n = N, started from its exact value,
 *   which a continued fraction gives (Lentz 1976, Appl. Opt. 15:668, in the modified form of Thompson &
 *   Barnett 1986, J. Comput. Phys. 64:490): the start is right however weakly the sphere absorbs, and no
 *   steps above N are spent;
 * - the Riccati–Bessel function psi_n(x) from products of ratios taken by downward recurrence, which
 *   keeps full relative accuracy down to x = 1e-6 where the plain upward recurrence loses every digit.
 *
 * Each coefficient is written a_n = P / (P − iQ) with
 *   P = A psi_n − psi_{n−1},  Q = A chi_n − chi_{n−1},  A = D_n(mx)/m + n/x
 * (b_n likewise with B = m D_n(mx) + n/x), where xi_n = psi_n − i chi_n (Bohren & Huffman eq. 4.88).
 * Then |a_n|² = |P|²/|P − iQ|² and Re a_n − |a_n|² = −Im(P Q̄)/|P − iQ|², so the absorption efficiency
 * is summed directly from terms that vanish with k, rather than as the small difference Qext − Qsca.
 * That keeps Qabs accurate relative to itself, and Qext of a tiny non-absorbing sphere (where Re a_1 is
 * some 1e-18 of Im a_1 at x = 1e-6) accurate too.
 *
 * Hot path: plain numbers and Float64Array buffers kept in a workspace and reused between calls;
 * complex values are (re, im) pairs; nothing is allocated per term.
 */
import { InputError } from '../errors.ts'
import { readableBeside, readableNumber } from '../numberText.ts'

/** Valid domain, checked on every call (the accuracy tests cover it end to end). */
export const SPHERE_DOMAIN = {
  sizeParameter: { min: 1e-6, max: 2e4 },
  realIndex: { min: 0.05, max: 10 },
  imaginaryIndex: { min: 0, max: 10 }
} as const

/** Efficiencies and asymmetry parameter of one sphere. */
export interface SphereEfficiencies {
  /** Extinction efficiency Q_ext = C_ext / (π r²). */
  qext: number
  /** Scattering efficiency. */
  qsca: number
  /** Absorption efficiency (summed directly, not as Q_ext − Q_sca). */
  qabs: number
  /** Backscattering efficiency, Bohren & Huffman eq. 4.82 convention: (1/x²)|Σ(2n+1)(−1)^n(a_n − b_n)|². */
  qback: number
  /** Radiation-pressure efficiency Q_pr = Q_ext − g Q_sca. */
  qpr: number
  /** Asymmetry parameter g = <cos θ>; 0 when the sphere does not scatter. */
  g: number
  /** Number of series terms used. */
  terms: number
}

/**
 * Series length: Wiscombe's (1980) N = x + 4.05 x^(1/3) + 2, which settles Qext and Qsca, plus ½ x^(1/3)
 * terms for the backscatter sum, whose (2n+1)(−1)^n weights need a longer tail at large x to reach 1e-6
 * (at x = 1000 Wiscombe's length leaves 2.3e-6 in Qback; five more terms leave 1e-8).
 */
export function seriesLength(x: number): number {
  const c = Math.cbrt(x)
  return Math.max(1, Math.floor(x + 4.55 * c + 2))
}

/** Size parameter x = π D n_medium / λ (D and λ in the same unit). */
export function sizeParameter(diameter: number, wavelength: number, mediumIndex = 1): number {
  return (Math.PI * diameter * mediumIndex) / wavelength
}

/** Throws an InputError unless (x, n, k) lies in SPHERE_DOMAIN. `label` names the call site for the message. */
export function checkSphereDomain(x: number, n: number, k: number, label = 'sphere'): void {
  const d = SPHERE_DOMAIN
  if (!(x >= d.sizeParameter.min && x <= d.sizeParameter.max)) rangeError(label, 'size parameter x', x, d.sizeParameter)
  if (!(n >= d.realIndex.min && n <= d.realIndex.max)) rangeError(label, 'real index n', n, d.realIndex)
  if (!(k >= d.imaginaryIndex.min && k <= d.imaginaryIndex.max)) rangeError(label, 'imaginary index k', k, d.imaginaryIndex)
}

function rangeError(label: string, name: string, v: number, range: { min: number; max: number }): never {
  const [lo, hi] = [readableNumber(range.min), readableNumber(range.max)]
  throw new InputError(`${label}: ${name}`, `${readableBeside(v, range.min, range.max)} is outside the valid range ${lo} to ${hi}`, `Give ${name} from ${lo} to ${hi}.`)
}

/**
 * Reusable buffers for the series. One workspace serves any number of calls; it grows as needed.
 * After a call it holds the coefficients a_n, b_n (n = 1..terms) for the angular functions.
 */
export class MieWorkspace {
  /** a_n and b_n, index n (0 unused). */
  aRe = new Float64Array(64)
  aIm = new Float64Array(64)
  bRe = new Float64Array(64)
  bIm = new Float64Array(64)
  /** Logarithmic derivative D_n(mx), index n. */
  dRe = new Float64Array(64)
  dIm = new Float64Array(64)
  /** psi_n(x) for n = 0..N. */
  psi = new Float64Array(64)
  /** Terms held in aRe..bIm after the last call. */
  terms = 0
  /** Σ (2n+1)(Re a_n − |a_n|² + Re b_n − |b_n|²) of the last call: the absorption sum. */
  absorptionSum = 0

  ensure(size: number): void {
    if (this.aRe.length >= size) return
    const len = Math.max(size, this.aRe.length * 2)
    this.aRe = new Float64Array(len)
    this.aIm = new Float64Array(len)
    this.bRe = new Float64Array(len)
    this.bIm = new Float64Array(len)
    this.psi = new Float64Array(len)
    this.dRe = new Float64Array(len)
    this.dIm = new Float64Array(len)
  }
}

const sharedWorkspace = new MieWorkspace()

/**
 * Exact start for the downward recurrence: D_n(z) for complex z = zr + i zi, by the continued fraction
 *   D_n(z) = −n/z + J_{n−1/2}(z)/J_{n+1/2}(z),
 *   J_{ν−1}/J_ν = 2ν/z − 1/(2(ν+1)/z − 1/(2(ν+2)/z − …)),
 * evaluated by the modified Lentz method. Writes the result into out[0], out[1].
 */
function logDerivativeByContinuedFraction(n: number, zr: number, zi: number, out: Float64Array): void {
  // 1/z
  const zz = zr * zr + zi * zi
  const izr = zr / zz
  const izi = -zi / zz
  const tiny = 1e-300
  const nu = n + 0.5
  // f = b0 + a1/(b1 + a2/(b2 + ...)), b_j = 2(nu + j)/z, a_j = −1
  let fr = 2 * nu * izr
  let fi = 2 * nu * izi
  if (fr === 0 && fi === 0) fr = tiny
  let cr = fr
  let ci = fi
  let dr = 0
  let di = 0
  for (let j = 1; j < 100000; j++) {
    const br = 2 * (nu + j) * izr
    const bi = 2 * (nu + j) * izi
    // d = 1 / (b + a d) with a = −1
    let tr = br - dr
    let ti = bi - di
    if (tr === 0 && ti === 0) tr = tiny
    const tt = tr * tr + ti * ti
    dr = tr / tt
    di = -ti / tt
    // c = b + a / c
    const cc = cr * cr + ci * ci
    cr = br - cr / cc
    ci = bi + ci / cc
    if (cr === 0 && ci === 0) cr = tiny
    // delta = c d; f *= delta
    const er = cr * dr - ci * di
    const ei = cr * di + ci * dr
    const nfr = fr * er - fi * ei
    fi = fr * ei + fi * er
    fr = nfr
    if (Math.abs(er - 1) + Math.abs(ei) < 1e-16) break
  }
  // D_n = −n/z + f
  out[0] = fr - n * izr
  out[1] = fi - n * izi
}

const cfOut = new Float64Array(2)

/**
 * D_n(z) for n = 1..nTerms into (re, im), by downward recurrence D_{n−1} = n/z − 1/(D_n + n/z) from the
 * exact D_N(z) of the continued fraction. Starting at N itself (not higher) is what an exact start allows;
 * the fraction's cost grows only as (|z| − N)/2.
 */
export function fillLogDerivative(nTerms: number, zr: number, zi: number, re: Float64Array, im: Float64Array): void {
  fillLogDerivativeAndPsi(nTerms, 1, zr, zi, re, im, null)
}

/**
 * D_n(z) as fillLogDerivative and, when `psi` is given, psi_n(x) = x j_n(x) for n = 0..nTerms into it: the
 * ratios psi_n/psi_{n−1} = 1/(D_n(x) + n/x) come from the real D_n(x) by the same downward recurrence
 * (exact start), then psi_n = psi_0 · Π ratios with psi_0 = sin x. No cancellation, so tiny x keeps full
 * relative accuracy. The two recurrences are independent chains of divisions, run in one loop so that
 * they overlap.
 */
export function fillLogDerivativeAndPsi(nTerms: number, x: number, zr: number, zi: number, re: Float64Array, im: Float64Array, psi: Float64Array | null): void {
  logDerivativeByContinuedFraction(nTerms, zr, zi, cfOut)
  let dr = cfOut[0]
  let di = cfOut[1]
  let dx = 0
  if (psi) {
    logDerivativeByContinuedFraction(nTerms, x, 0, cfOut)
    dx = cfOut[0]
  }
  const zz = zr * zr + zi * zi
  const izr = zr / zz
  const izi = -zi / zz
  const ix = 1 / x
  for (let n = nTerms; n >= 1; n--) {
    re[n] = dr
    im[n] = di
    const tr = dr + n * izr
    const ti = di + n * izi
    const inv = 1 / (tr * tr + ti * ti)
    dr = n * izr - tr * inv
    di = n * izi + ti * inv
    if (psi) {
      const shrink = 1 / (dx + n * ix)
      psi[n] = shrink
      dx = n * ix - shrink
    }
  }
  if (!psi) return
  psi[0] = Math.sin(x)
  for (let n = 1; n <= nTerms; n++) psi[n] *= psi[n - 1]
}

/**
 * The series coefficients of a sphere of (outer) size parameter x and (outer) index m = mr + i mi, given
 * the logarithmic derivatives that enter a_n (aD) and b_n (bD) at the outer surface. For a homogeneous
 * sphere both are D_n(mx); a coated sphere passes its effective values. Writes a_n, b_n and the
 * absorption sum into `ws`; psi_n(x) must already be in ws.psi.
 */
export function seriesFromLogDerivatives(
  x: number, mr: number, mi: number, nTerms: number, ws: MieWorkspace,
  aDRe: Float64Array, aDIm: Float64Array, bDRe: Float64Array, bDIm: Float64Array
): void {
  const psi = ws.psi
  // m = mr + i mi; 1/m
  const mm = mr * mr + mi * mi
  const imr = mr / mm
  const imi = -mi / mm
  // chi_n(x) = −x y_n(x) by upward recurrence (stable: it grows); chi_0 = cos x, chi_{−1} = −sin x.
  let chiPrev = -Math.sin(x)
  let chi = Math.cos(x)
  const aRe = ws.aRe
  const aIm = ws.aIm
  const bRe = ws.bRe
  const bIm = ws.bIm
  const ix = 1 / x
  let absSum = 0
  for (let n = 1; n <= nTerms; n++) {
    const chiNext = (2 * n - 1) * ix * chi - chiPrev
    chiPrev = chi
    chi = chiNext
    const psiN = psi[n]
    const psiM = psi[n - 1]
    const nx = n * ix
    // A = D_a/m + n/x
    const dar = aDRe[n]
    const dai = aDIm[n]
    const ar = dar * imr - dai * imi + nx
    const ai = dar * imi + dai * imr
    // B = m D_b + n/x
    const dbr = bDRe[n]
    const dbi = bDIm[n]
    const br = mr * dbr - mi * dbi + nx
    const bi = mr * dbi + mi * dbr
    // a_n = P/(P − iQ)
    let pr = ar * psiN - psiM
    let pi = ai * psiN
    let qr = ar * chi - chiPrev
    let qi = ai * chi
    // P − iQ = (pr + qi) + i (pi − qr)
    let er = pr + qi
    let ei = pi - qr
    let inv = 1 / (er * er + ei * ei)
    // a = P · conj(P − iQ) / |P − iQ|²; absorption part −Im(P Q̄)/|P − iQ|²
    aRe[n] = (pr * er + pi * ei) * inv
    aIm[n] = (pi * er - pr * ei) * inv
    let absA = (pr * qi - pi * qr) * inv
    pr = br * psiN - psiM
    pi = bi * psiN
    qr = br * chi - chiPrev
    qi = bi * chi
    er = pr + qi
    ei = pi - qr
    inv = 1 / (er * er + ei * ei)
    bRe[n] = (pr * er + pi * ei) * inv
    bIm[n] = (pi * er - pr * ei) * inv
    absA += (pr * qi - pi * qr) * inv
    absSum += (2 * n + 1) * absA
  }
  ws.terms = nTerms
  ws.absorptionSum = absSum
}

/** Mie coefficients of a homogeneous sphere into `ws` (n = 1..N); returns N. */
function computeCoefficients(x: number, mr: number, mi: number, ws: MieWorkspace): number {
  // small spheres: at least three terms, for g (from a_1 a_2 and a_1 b_1; with two, g lost 1e-11 at x = 0.01)
  const nTerms = x <= SMALL_X ? Math.max(3, seriesLength(x)) : seriesLength(x)
  ws.ensure(nTerms + 2)
  fillLogDerivativeAndPsi(nTerms, x, mr * x, mi * x, ws.dRe, ws.dIm, ws.psi)
  if (x <= SMALL_X) smallSphereSeries(x, mr, mi, nTerms, ws)
  else seriesFromLogDerivatives(x, mr, mi, nTerms, ws, ws.dRe, ws.dIm, ws.dRe, ws.dIm)
  return nTerms
}

/** Below this size parameter the numerators P of a_n, b_n are formed without cancellation (smallSphereSeries). */
const SMALL_X = 0.1
/** Steps of the downward recurrence for R_n beyond the series length (its error shrinks by (z/2n)² a step). */
const SMALL_X_DEPTH = 40

/**
 * a_n, b_n of a small sphere (x ≤ SMALL_X), as seriesFromLogDerivatives but with the numerators written so
 * that nothing cancels. With psi_{n−1} = psi_n (D_n(x) + n/x), the numerators are P_a = psi_n (D_n(mx)/m − D_n(x))
 * and P_b = psi_n (m D_n(mx) − D_n(x)), whose two terms both grow as (n+1)/z for small z and cancel to a
 * part in x² (b_1 and a_2, which give g ~ x², lost 3e-3 of g at x = 1e-6). With R_n(z) = (n+1)/z − D_n(z)
 * ≈ z/(2n+3), by the downward recurrence R_{n−1} = z/(2n+1 − z R_n) (no cancellation; from R = 0 some
 * SMALL_X_DEPTH steps above N, the start's error dies out as (z/2n)² a step):
 *   P_a = psi_n ((n+1)(1/m² − 1)/x + R_n(x) − R_n(mx)/m),  P_b = psi_n (R_n(x) − m R_n(mx)),
 * where the remaining difference is that of 1 and m², a physical one. This is the cancellation that
 * Wiscombe (1980, Appl. Opt. 19:1505) avoids with his small-particle expansion; the form here is exact at any
 * order in x. The denominators P − iQ are formed as usual (Q dominates and does not cancel).
 */
function smallSphereSeries(x: number, mr: number, mi: number, nTerms: number, ws: MieWorkspace): void {
  const psi = ws.psi
  const rx = ws.dRe // reused: D_n(mx) is recomputed below from R_n(mx)
  const rzRe = ws.bRe
  const rzIm = ws.bIm
  const zr = mr * x
  const zi = mi * x
  let r = 0
  let wr = 0
  let wi = 0
  for (let n = nTerms + SMALL_X_DEPTH; n >= 1; n--) {
    if (n <= nTerms) {
      rx[n] = r
      rzRe[n] = wr
      rzIm[n] = wi
    }
    // R_{n−1} = z/(2n+1 − z R_n)
    r = x / (2 * n + 1 - x * r)
    const dr = 2 * n + 1 - (zr * wr - zi * wi)
    const di = -(zr * wi + zi * wr)
    const inv = 1 / (dr * dr + di * di)
    const nwr = (zr * dr + zi * di) * inv
    wi = (zi * dr - zr * di) * inv
    wr = nwr
  }
  const mm = mr * mr + mi * mi
  const imr = mr / mm
  const imi = -mi / mm
  // 1/m² − 1
  const im2r = imr * imr - imi * imi - 1
  const im2i = 2 * imr * imi
  let chiPrev = -Math.sin(x)
  let chi = Math.cos(x)
  const ix = 1 / x
  let absSum = 0
  for (let n = 1; n <= nTerms; n++) {
    const chiNext = (2 * n - 1) * ix * chi - chiPrev
    chiPrev = chi
    chi = chiNext
    const psiN = psi[n]
    const nx = n * ix
    const rn = rx[n]
    const wRe = rzRe[n]
    const wIm = rzIm[n]
    // D_n(mx) = (n+1)/(mx) − R_n(mx); 1/(mx) = (1/m)/x
    const dmr = (n + 1) * imr * ix - wRe
    const dmi = (n + 1) * imi * ix - wIm
    // A = D_n(mx)/m + n/x, B = m D_n(mx) + n/x (for Q)
    const ar = dmr * imr - dmi * imi + nx
    const ai = dmr * imi + dmi * imr
    const br = mr * dmr - mi * dmi + nx
    const bi = mr * dmi + mi * dmr
    // P_a/psi_n = (n+1)(1/m² − 1)/x + R_n(x) − R_n(mx)/m
    let pr = psiN * ((n + 1) * im2r * ix + rn - (wRe * imr - wIm * imi))
    let pi = psiN * ((n + 1) * im2i * ix - (wRe * imi + wIm * imr))
    let qr = ar * chi - chiPrev
    let qi = ai * chi
    let er = pr + qi
    let ei = pi - qr
    let inv = 1 / (er * er + ei * ei)
    ws.aRe[n] = (pr * er + pi * ei) * inv
    ws.aIm[n] = (pi * er - pr * ei) * inv
    let absA = (pr * qi - pi * qr) * inv
    // P_b/psi_n = R_n(x) − m R_n(mx)
    pr = psiN * (rn - (mr * wRe - mi * wIm))
    pi = psiN * -(mr * wIm + mi * wRe)
    qr = br * chi - chiPrev
    qi = bi * chi
    er = pr + qi
    ei = pi - qr
    inv = 1 / (er * er + ei * ei)
    ws.bRe[n] = (pr * er + pi * ei) * inv
    ws.bIm[n] = (pi * er - pr * ei) * inv
    absA += (pr * qi - pi * qr) * inv
    absSum += (2 * n + 1) * absA
  }
  ws.terms = nTerms
  ws.absorptionSum = absSum
}

/**
 * Sums the efficiencies from the coefficients a_n, b_n held in `ws` (Bohren & Huffman eqs. 4.61, 4.62,
 * 4.82 and the g series of §4.5), with the absorption sum computed alongside the coefficients.
 * Shared by the homogeneous and the coated sphere.
 */
export function efficienciesFromCoefficients(x: number, ws: MieWorkspace): SphereEfficiencies {
  const nTerms = ws.terms
  const absSum = ws.absorptionSum
  const aRe = ws.aRe
  const aIm = ws.aIm
  const bRe = ws.bRe
  const bIm = ws.bIm
  let sca = 0
  let asym = 0
  let backRe = 0
  let backIm = 0
  let sign = -1
  for (let n = 1; n <= nTerms; n++) {
    const f = 2 * n + 1
    const ar = aRe[n]
    const ai = aIm[n]
    const br = bRe[n]
    const bi = bIm[n]
    sca += f * (ar * ar + ai * ai + br * br + bi * bi)
    asym += (f / (n * (n + 1))) * (ar * br + ai * bi)
    if (n < nTerms) {
      const ar1 = aRe[n + 1]
      const ai1 = aIm[n + 1]
      const br1 = bRe[n + 1]
      const bi1 = bIm[n + 1]
      asym += ((n * (n + 2)) / (n + 1)) * (ar * ar1 + ai * ai1 + br * br1 + bi * bi1)
    }
    backRe += sign * f * (ar - br)
    backIm += sign * f * (ai - bi)
    sign = -sign
  }
  const x2 = x * x
  const qsca = (2 / x2) * sca
  const qabs = Math.max(0, (2 / x2) * absSum)
  const qext = qsca + qabs
  const g = sca > 0 ? (2 * asym) / sca : 0
  const qback = (backRe * backRe + backIm * backIm) / x2
  return { qext, qsca, qabs, qback, qpr: qext - g * qsca, g, terms: nTerms }
}

/**
 * Efficiencies of a homogeneous sphere of size parameter x and relative index m = n + ik (k ≥ 0 absorbs).
 * Domain: SPHERE_DOMAIN (x 1e-6…2e4, n 0.05…10, k 0…10); outside it an InputError names the parameter.
 * Accuracy against 40-digit references: see test/mie. The coefficients a_n, b_n stay in `ws`
 * (n = 1..terms) for the angular functions of the same sphere.
 */
export function sphereEfficiencies(x: number, n: number, k: number, ws: MieWorkspace = sharedWorkspace): SphereEfficiencies {
  checkSphereDomain(x, n, k)
  computeCoefficients(x, n, k, ws)
  return efficienciesFromCoefficients(x, ws)
}
