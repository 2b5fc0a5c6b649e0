/**
 * Scattering and absorption by a coated sphere (a core of index m1 and size parameter x inside a shell of
 * index m2 whose outer size parameter is y).
 *
 * Coefficients: Bohren & Huffman (1983) §8.1. They are rewritten here in a form that never forms the
 * exponentially large Riccati–Bessel functions of a strongly absorbing core or shell, in the spirit of
 * Toon & Ackerman (1981), Appl. Opt. 20:3657: only logarithmic derivatives and bounded ratios appear.
 *
 * With D_n = psi_n'/psi_n and G_n = chi_n'/chi_n (chi_n = −z y_n(z)), Bohren & Huffman's A_n and B_n are
 *   A_n = rho_n(m2 x) (m2 D_n(m1x) − m1 D_n(m2x)) / (m2 D_n(m1x) − m1 G_n(m2x)),
 *   B_n = rho_n(m2 x) (m2 D_n(m2x) − m1 D_n(m1x)) / (m2 G_n(m2x) − m1 D_n(m1x)),
 * with rho_n = psi_n/chi_n, and a_n, b_n take exactly the homogeneous form (m = m2, size y) with D_n(m2 y)
 * replaced by the effective logarithmic derivatives
 *   D̃_n = (D_n(m2y) − R_n G_n(m2y)) / (1 − R_n),  R_n = A_n chi_n(m2y)/psi_n(m2y) (B_n for b_n).
 * R_n needs only Q_n = rho_n(m2x)/rho_n(m2y), carried upward as a product of ratios
 *   rho_n/rho_{n−1} = (G_n + n/z)/(D_n + n/z),  Q_0 = tan(m2x)/tan(m2y),
 * which stays bounded (it may underflow to 0 for a tiny core: the shell-only limit, correctly).
 * Equal indices give R_n = 0 and the homogeneous sphere exactly.
 */
import { InputError } from '../errors.ts'
import {
  checkSphereDomain,
  efficienciesFromCoefficients,
  fillLogDerivative,
  fillLogDerivativeAndPsi,
  MieWorkspace,
  seriesFromLogDerivatives,
  seriesLength,
  sphereEfficiencies,
  type SphereEfficiencies
} from './sphere.ts'

/** Extra buffers a coated sphere needs beyond the homogeneous workspace. */
export class CoatedWorkspace extends MieWorkspace {
  d1Re = new Float64Array(64)
  d1Im = new Float64Array(64)
  d2xRe = new Float64Array(64)
  d2xIm = new Float64Array(64)
  d2yRe = new Float64Array(64)
  d2yIm = new Float64Array(64)
  dbRe = new Float64Array(64)
  dbIm = new Float64Array(64)

  override ensure(size: number): void {
    super.ensure(size)
    if (this.d1Re.length >= size) return
    const len = Math.max(size, this.d1Re.length * 2)
    this.d1Re = new Float64Array(len)
    this.d1Im = new Float64Array(len)
    this.d2xRe = new Float64Array(len)
    this.d2xIm = new Float64Array(len)
    this.d2yRe = new Float64Array(len)
    this.d2yIm = new Float64Array(len)
    this.dbRe = new Float64Array(len)
    this.dbIm = new Float64Array(len)
  }
}

const sharedCoated = new CoatedWorkspace()

/** Im(m_shell)·x beyond which the shell's Riccati–Bessel functions outgrow double precision (e^18 ≈ 1/ε). */
const UNSTABLE_SHELL_GROWTH = 18

/** tan(a + ib) without overflow, into out[0], out[1]. */
function complexTan(a: number, b: number, out: Float64Array): void {
  // tan(a+ib) = (sin 2a + i sinh 2b) / (cos 2a + cosh 2b); divide through by cosh 2|b| via t = e^{−2|b|}
  const t = Math.exp(-2 * Math.abs(b))
  const den = 2 * t * Math.cos(2 * a) + 1 + t * t
  out[0] = (2 * t * Math.sin(2 * a)) / den
  out[1] = (Math.sign(b) * (1 - t * t)) / den
}

const tanX = new Float64Array(2)
const tanY = new Float64Array(2)

/**
 * Efficiencies of a coated sphere. `xCore` and `xShell` are the core and outer size parameters
 * (2π a/λ and 2π b/λ, 0 < xCore ≤ xShell); (nCore, kCore) and (nShell, kShell) the relative indices.
 * Domain: as the homogeneous sphere for the outer size and both indices. A core equal to the whole
 * particle (xCore = xShell) is the homogeneous core sphere; the coefficients a_n, b_n stay in `ws`.
 */
export function coatedSphereEfficiencies(
  xCore: number, nCore: number, kCore: number,
  xShell: number, nShell: number, kShell: number,
  ws: CoatedWorkspace = sharedCoated
): SphereEfficiencies {
  checkSphereDomain(xShell, nShell, kShell, 'coated sphere (shell)')
  checkSphereDomain(xShell, nCore, kCore, 'coated sphere (core)')
  if (!(xCore > 0 && xCore <= xShell)) {
    throw new InputError('coated sphere: core size parameter', `${xCore} is not between 0 and the outer size parameter ${xShell}`, 'The core must be smaller than the whole particle: give 0 < core ≤ outer size.')
  }
  // Equal indices: a homogeneous sphere, exactly (and the ratio R_n would be 0/0 where both
  // logarithmic derivatives of a strongly absorbing shell round to −i).
  if (nCore === nShell && kCore === kShell) return sphereEfficiencies(xShell, nShell, kShell, ws)
  // Where the shell absorbs so strongly that its functions at the core's surface grow beyond ~e^18 while
  // the shell itself stays optically thin, the ratio form loses the small differences that carry the core's
  // effect (1 − R_n and D − G cancel to below double precision): refuse rather than answer wrongly.
  if (kShell * xCore > UNSTABLE_SHELL_GROWTH && kShell * (xShell - xCore) < UNSTABLE_SHELL_GROWTH) {
    throw new InputError(
      'coated sphere: shell',
      `an absorbing shell (k = ${kShell}) around a large core (x = ${xCore}) with a thin shell (${(xShell - xCore).toPrecision(3)} in size parameter) is outside the range this engine computes stably (k·x_core must stay below ${UNSTABLE_SHELL_GROWTH} unless k·(x_shell − x_core) exceeds it)`,
      'Treat the particle as homogeneous with a mixed index, or use a longer wavelength.'
    )
  }
  const nTerms = seriesLength(xShell)
  ws.ensure(nTerms + 2)
  const m1r = nCore
  const m1i = kCore
  const m2r = nShell
  const m2i = kShell
  // z for the three logarithmic derivatives
  const axr = m2r * xCore
  const axi = m2i * xCore
  const ayr = m2r * xShell
  const ayi = m2i * xShell
  fillLogDerivative(nTerms, m1r * xCore, m1i * xCore, ws.d1Re, ws.d1Im)
  fillLogDerivative(nTerms, axr, axi, ws.d2xRe, ws.d2xIm)
  fillLogDerivativeAndPsi(nTerms, xShell, ayr, ayi, ws.d2yRe, ws.d2yIm, ws.psi)

  // 1/z for z = m2 x and m2 y
  const ax2 = axr * axr + axi * axi
  const iaxr = axr / ax2
  const iaxi = -axi / ax2
  const ay2 = ayr * ayr + ayi * ayi
  const iayr = ayr / ay2
  const iayi = -ayi / ay2

  // G_0 = −tan z; Q_0 = tan(m2 x)/tan(m2 y)
  complexTan(axr, axi, tanX)
  complexTan(ayr, ayi, tanY)
  let gxr = -tanX[0]
  let gxi = -tanX[1]
  let gyr = -tanY[0]
  let gyi = -tanY[1]
  let qr: number
  let qi: number
  {
    const d = tanY[0] * tanY[0] + tanY[1] * tanY[1]
    qr = (tanX[0] * tanY[0] + tanX[1] * tanY[1]) / d
    qi = (tanX[1] * tanY[0] - tanX[0] * tanY[1]) / d
  }

  const d1Re = ws.d1Re, d1Im = ws.d1Im, d2xRe = ws.d2xRe, d2xIm = ws.d2xIm, d2yRe = ws.d2yRe, d2yIm = ws.d2yIm
  const daRe = ws.dRe, daIm = ws.dIm, dbRe = ws.dbRe, dbIm = ws.dbIm
  for (let n = 1; n <= nTerms; n++) {
    // G_n = −n/z + 1/(n/z − G_{n−1}) (upward: chi grows), for z = m2 x and m2 y
    let tr = n * iaxr - gxr
    let ti = n * iaxi - gxi
    let inv = 1 / (tr * tr + ti * ti)
    gxr = -n * iaxr + tr * inv
    gxi = -n * iaxi - ti * inv
    tr = n * iayr - gyr
    ti = n * iayi - gyi
    inv = 1 / (tr * tr + ti * ti)
    gyr = -n * iayr + tr * inv
    gyi = -n * iayi - ti * inv

    const dxr = d2xRe[n], dxi = d2xIm[n], dyr = d2yRe[n], dyi = d2yIm[n], d1r = d1Re[n], d1i = d1Im[n]
    // Q_n = Q_{n−1} · [(G+n/z)/(D+n/z)](m2x) / [(G+n/z)/(D+n/z)](m2y)
    {
      // u = (Gx + n/zx)(Dy + n/zy), v = (Dx + n/zx)(Gy + n/zy); Q *= u/v
      const gxn = gxr + n * iaxr, gxni = gxi + n * iaxi
      const dyn = dyr + n * iayr, dyni = dyi + n * iayi
      const dxn = dxr + n * iaxr, dxni = dxi + n * iaxi
      const gyn = gyr + n * iayr, gyni = gyi + n * iayi
      const ur = gxn * dyn - gxni * dyni
      const ui = gxn * dyni + gxni * dyn
      const vr = dxn * gyn - dxni * gyni
      const vi = dxn * gyni + dxni * gyn
      const vv = vr * vr + vi * vi
      const wr = (ur * vr + ui * vi) / vv
      const wi = (ui * vr - ur * vi) / vv
      const nqr = qr * wr - qi * wi
      qi = qr * wi + qi * wr
      qr = nqr
    }
    // m2 D1, m1 D2x, m1 Gx, m2 D2x, m1 D1, m2 Gx
    const m2d1r = m2r * d1r - m2i * d1i, m2d1i = m2r * d1i + m2i * d1r
    const m1dxr = m1r * dxr - m1i * dxi, m1dxi = m1r * dxi + m1i * dxr
    const m1gxr = m1r * gxr - m1i * gxi, m1gxi = m1r * gxi + m1i * gxr
    const m2dxr = m2r * dxr - m2i * dxi, m2dxi = m2r * dxi + m2i * dxr
    const m1d1r = m1r * d1r - m1i * d1i, m1d1i = m1r * d1i + m1i * d1r
    const m2gxr = m2r * gxr - m2i * gxi, m2gxi = m2r * gxi + m2i * gxr
    // R_a = Q (m2 D1 − m1 Dx)/(m2 D1 − m1 Gx); R_b = Q (m2 Dx − m1 D1)/(m2 Gx − m1 D1)
    effectiveLogDerivative(qr, qi, m2d1r - m1dxr, m2d1i - m1dxi, m2d1r - m1gxr, m2d1i - m1gxi, dyr, dyi, gyr, gyi)
    daRe[n] = effOut[0]
    daIm[n] = effOut[1]
    effectiveLogDerivative(qr, qi, m2dxr - m1d1r, m2dxi - m1d1i, m2gxr - m1d1r, m2gxi - m1d1i, dyr, dyi, gyr, gyi)
    dbRe[n] = effOut[0]
    dbIm[n] = effOut[1]
  }
  seriesFromLogDerivatives(xShell, m2r, m2i, nTerms, ws, daRe, daIm, dbRe, dbIm)
  return efficienciesFromCoefficients(xShell, ws)
}

const effOut = new Float64Array(2)

/** D̃ = (Dy − R Gy)/(1 − R) with R = Q · num/den, into effOut. */
function effectiveLogDerivative(
  qr: number, qi: number, numr: number, numi: number, denr: number, deni: number,
  dyr: number, dyi: number, gyr: number, gyi: number
): void {
  const dd = denr * denr + deni * deni
  const fr = (numr * denr + numi * deni) / dd
  const fi = (numi * denr - numr * deni) / dd
  const rr = qr * fr - qi * fi
  const ri = qr * fi + qi * fr
  const tr = dyr - (rr * gyr - ri * gyi)
  const ti = dyi - (rr * gyi + ri * gyr)
  const br = 1 - rr
  const bi = -ri
  const bb = br * br + bi * bi
  effOut[0] = (tr * br + ti * bi) / bb
  effOut[1] = (ti * br - tr * bi) / bb
}
