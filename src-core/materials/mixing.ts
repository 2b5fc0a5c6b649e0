/**
 * Effective refractive index of a mixture of components, from their indices m_j = n_j + i k_j and volume
 * fractions f_j. All rules except the first work on the permittivity ε = m² = (n² − k²) + i·2nk and return
 * m = sqrt(ε) with Im m >= 0.
 *
 * - 'volume-average': m = Σ f_j m_j (linear in m; common practice).
 * - 'volume-average-permittivity': ε = Σ f_j ε_j.
 * - 'maxwell-garnett': inclusions dispersed in a host (the FIRST component). With β_j = (ε_j − ε_h)/(ε_j + 2ε_h)
 *   and S = Σ_{j>=1} f_j β_j:  ε = ε_h (1 + 2S)/(1 − S). For one inclusion this is
 *   ε = ε_h (ε_i + 2ε_h + 2f(ε_i − ε_h)) / (ε_i + 2ε_h − f(ε_i − ε_h)).
 *   Maxwell Garnett, J. C. (1904), Phil. Trans. R. Soc. A 203:385; multi-inclusion form e.g. Sihvola, A. (1999),
 *   Electromagnetic Mixing Formulas and Applications, IEE (from memory).
 * - 'bruggeman': effective-medium condition Σ f_j (ε_j − ε)/(ε_j + 2ε) = 0, symmetric in the components.
 *   Bruggeman, D. A. G. (1935), Ann. Phys. 416:636. Two components: the quadratic 2ε² − bε − ε₁ε₂ = 0 with
 *   b = (3f₁ − 1)ε₁ + (3f₂ − 1)ε₂, root with Im ε >= 0 (the one nearest the volume-averaged ε if both qualify).
 *   More components: damped Newton iteration from the volume-averaged ε, residual checked.
 */
import { InputError } from '../errors.ts'
import { sqrtPair, type Pair } from './complex.ts'
import type { ComplexRefractiveIndex } from './material.ts'

export type MixingRule = 'volume-average' | 'volume-average-permittivity' | 'maxwell-garnett' | 'bruggeman'

/** The mixing rules `mixRefractiveIndices` accepts. */
export const MIXING_RULES: readonly MixingRule[] = Object.freeze(['volume-average', 'volume-average-permittivity', 'maxwell-garnett', 'bruggeman'] as MixingRule[])

const FRACTION_SUM_TOLERANCE = 1e-6

/**
 * Checks indices and volume fractions for a mixing rule; returns the fractions divided by their sum (which is
 * within 1e-6 of 1). Throws InputError naming the fractions if any is negative or non-finite, if the counts differ,
 * or if they do not sum to 1 within 1e-6.
 */
export function checkVolumeFractions(where: string, volumeFractions: readonly number[], count: number): number[] {
  if (!Array.isArray(volumeFractions) || volumeFractions.length !== count || count === 0) {
    throw new InputError(`${where} volume fractions`, `${Array.isArray(volumeFractions) ? volumeFractions.length : 0} fractions for ${count} components`, 'Give one volume fraction per component.')
  }
  let sum = 0
  for (let i = 0; i < count; i++) {
    const f = volumeFractions[i]
    if (typeof f !== 'number' || !Number.isFinite(f) || f < 0) {
      throw new InputError(`${where} volume fractions [${volumeFractions.join(', ')}]`, `fraction ${i + 1} is ${f}, not a number >= 0`, 'Give volume fractions from 0 to 1.')
    }
    sum += f
  }
  if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) {
    throw new InputError(`${where} volume fractions [${volumeFractions.join(', ')}]`, `they sum to ${sum}, not 1`, 'Make the volume fractions add up to 1 (within 1e-6).')
  }
  return volumeFractions.map((f) => f / sum)
}

function checkIndices(where: string, indices: readonly ComplexRefractiveIndex[]): void {
  if (!Array.isArray(indices) || indices.length === 0) {
    throw new InputError(`${where} indices`, 'no component indices were given', 'Give at least one refractive index.')
  }
  for (let i = 0; i < indices.length; i++) {
    const m = indices[i]
    if (!m || !Number.isFinite(m.n) || m.n <= 0 || !Number.isFinite(m.k) || m.k < 0) {
      throw new InputError(`${where} component ${i + 1} index`, `${m ? `${m.n} + ${m.k}i` : String(m)} is not a refractive index with n > 0 and k >= 0`, 'Give each component an index n + ik with n > 0 and k >= 0.')
    }
  }
}

const root: Pair = { re: 0, im: 0 }

function indexFromPermittivity(re: number, im: number): ComplexRefractiveIndex {
  sqrtPair(re, im, root)
  let k = root.im
  // Im ε may come out a rounding error below zero for non-absorbing mixtures.
  if (k < 0 && k > -1e-12 * Math.max(1, root.re)) k = 0
  if (k < 0) throw new Error(`mixing produced Im ε = ${im} < 0 (internal error)`)
  return { n: root.re, k }
}

/** Bruggeman residual F(ε) = Σ f_j (ε_j − ε)/(ε_j + 2ε) and its derivative F'(ε) = −3 Σ f_j ε_j/(ε_j + 2ε)². */
function bruggemanResidual(er: readonly number[], ei: readonly number[], f: readonly number[], xr: number, xi: number, out: { fr: number; fi: number; dr: number; di: number }): void {
  let fr = 0
  let fi = 0
  let dr = 0
  let di = 0
  for (let j = 0; j < f.length; j++) {
    if (f[j] === 0) continue
    const ar = er[j] - xr
    const ai = ei[j] - xi
    const br = er[j] + 2 * xr
    const bi = ei[j] + 2 * xi
    const bb = br * br + bi * bi
    // a / b
    fr += (f[j] * (ar * br + ai * bi)) / bb
    fi += (f[j] * (ai * br - ar * bi)) / bb
    // ε_j / b²: b² = (br² − bi²) + i 2 br bi
    const b2r = br * br - bi * bi
    const b2i = 2 * br * bi
    const b2b = bb * bb
    dr += (-3 * f[j] * (er[j] * b2r + ei[j] * b2i)) / b2b
    di += (-3 * f[j] * (ei[j] * b2r - er[j] * b2i)) / b2b
  }
  out.fr = fr
  out.fi = fi
  out.dr = dr
  out.di = di
}

function bruggeman(where: string, er: number[], ei: number[], f: number[], avgR: number, avgI: number): ComplexRefractiveIndex {
  if (f.length === 2) {
    // 2ε² − bε − ε₁ε₂ = 0
    const br = (3 * f[0] - 1) * er[0] + (3 * f[1] - 1) * er[1]
    const bi = (3 * f[0] - 1) * ei[0] + (3 * f[1] - 1) * ei[1]
    const cr = er[0] * er[1] - ei[0] * ei[1]
    const ci = er[0] * ei[1] + ei[0] * er[1]
    sqrtPair(br * br - bi * bi + 8 * cr, 2 * br * bi + 8 * ci, root)
    const r1r = (br + root.re) / 4
    const r1i = (bi + root.im) / 4
    const r2r = (br - root.re) / 4
    const r2i = (bi - root.im) / 4
    const tol = 1e-12 * Math.max(1, Math.hypot(r1r, r1i), Math.hypot(r2r, r2i))
    const ok1 = r1i >= -tol
    const ok2 = r2i >= -tol
    let pick1: boolean
    if (ok1 && ok2) pick1 = Math.hypot(r1r - avgR, r1i - avgI) <= Math.hypot(r2r - avgR, r2i - avgI)
    else pick1 = ok1 || !ok2
    return pick1 ? indexFromPermittivity(r1r, Math.max(r1i, 0)) : indexFromPermittivity(r2r, Math.max(r2i, 0))
  }
  // Damped Newton from the volume-averaged permittivity.
  let xr = avgR
  let xi = avgI
  const s = { fr: 0, fi: 0, dr: 0, di: 0 }
  bruggemanResidual(er, ei, f, xr, xi, s)
  let res = Math.hypot(s.fr, s.fi)
  for (let it = 0; it < 200 && res > 1e-15; it++) {
    const dd = s.dr * s.dr + s.di * s.di
    if (dd === 0) break
    // δ = −F/F'
    let dxr = -(s.fr * s.dr + s.fi * s.di) / dd
    let dxi = -(s.fi * s.dr - s.fr * s.di) / dd
    let accepted = false
    for (let h = 0; h < 40; h++) {
      const tr = xr + dxr
      const ti = xi + dxi
      bruggemanResidual(er, ei, f, tr, ti, s)
      const r = Math.hypot(s.fr, s.fi)
      if (r < res) {
        xr = tr
        xi = ti
        res = r
        accepted = true
        break
      }
      dxr /= 2
      dxi /= 2
    }
    if (!accepted) {
      bruggemanResidual(er, ei, f, xr, xi, s)
      break
    }
  }
  const scale = Math.max(1, Math.hypot(xr, xi))
  if (!(res <= 1e-10) || xi < -1e-10 * scale) {
    throw new InputError(`${where} (Bruggeman)`, `the effective-medium equation did not converge to a physical root (residual ${res}, ε = ${xr} + ${xi}i)`, 'Use the Maxwell Garnett or volume-average rule for these components.')
  }
  return indexFromPermittivity(xr, Math.max(xi, 0))
}

/**
 * mixRefractiveIndices([a, b], [fa, fb], 'volume-average') without its arrays, into `out` (the same operations on
 * the same numbers, so the same n and k to the bit): for the water mixed into every node of a size integration,
 * where the arrays and checks of the general function were about 3 % of an uncertainty draw. Returns false, and
 * leaves `out` alone, where one of that function's checks fails: the caller then calls it, which throws.
 */
export function volumeAverageOfTwo(a: ComplexRefractiveIndex, b: ComplexRefractiveIndex, fa: number, fb: number, out: { n: number; k: number }): boolean {
  if (!(Number.isFinite(a.n) && a.n > 0 && Number.isFinite(a.k) && a.k >= 0 && Number.isFinite(b.n) && b.n > 0 && Number.isFinite(b.k) && b.k >= 0)) return false
  if (!(Number.isFinite(fa) && fa >= 0 && Number.isFinite(fb) && fb >= 0)) return false
  // the general function's sums start from 0, which adds nothing to a number >= 0
  const sum = fa + fb
  if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) return false
  const f0 = fa / sum
  const f1 = fb / sum
  out.n = f0 * a.n + f1 * b.n
  out.k = f0 * a.k + f1 * b.k
  return true
}

/**
 * Effective refractive index of a mixture by `rule` (see the module comment for each rule and its reference).
 * `indices[j]` has volume fraction `volumeFractions[j]`; fractions must be >= 0 and sum to 1 within 1e-6 (they are
 * then rescaled to sum exactly to 1). For 'maxwell-garnett' the first component is the host. Returns n + ik with
 * k >= 0. Throws InputError for bad fractions or indices (n <= 0, k < 0) or an unknown rule.
 */
export function mixRefractiveIndices(indices: readonly ComplexRefractiveIndex[], volumeFractions: readonly number[], rule: MixingRule): ComplexRefractiveIndex {
  const where = `mixing rule ${rule}`
  if (!MIXING_RULES.includes(rule)) {
    throw new InputError('mixing rule', `"${rule}" is not a known mixing rule`, `Use one of: ${MIXING_RULES.join(', ')}.`)
  }
  checkIndices(where, indices)
  const f = checkVolumeFractions(where, volumeFractions, indices.length)
  const N = indices.length

  if (rule === 'volume-average') {
    let n = 0
    let k = 0
    for (let j = 0; j < N; j++) {
      n += f[j] * indices[j].n
      k += f[j] * indices[j].k
    }
    return { n, k }
  }

  const er: number[] = new Array(N)
  const ei: number[] = new Array(N)
  let avgR = 0
  let avgI = 0
  for (let j = 0; j < N; j++) {
    const { n, k } = indices[j]
    er[j] = n * n - k * k
    ei[j] = 2 * n * k
    avgR += f[j] * er[j]
    avgI += f[j] * ei[j]
  }

  switch (rule) {
    case 'volume-average-permittivity':
      return indexFromPermittivity(avgR, avgI)
    case 'maxwell-garnett': {
      const hr = er[0]
      const hi = ei[0]
      let sr = 0
      let si = 0
      for (let j = 1; j < N; j++) {
        if (f[j] === 0) continue
        const ar = er[j] - hr
        const ai = ei[j] - hi
        const br = er[j] + 2 * hr
        const bi = ei[j] + 2 * hi
        const bb = br * br + bi * bi
        sr += (f[j] * (ar * br + ai * bi)) / bb
        si += (f[j] * (ai * br - ar * bi)) / bb
      }
      // ε = ε_h (1 + 2S)/(1 − S)
      const pr = 1 + 2 * sr
      const pi = 2 * si
      const qr = 1 - sr
      const qi = -si
      const qq = qr * qr + qi * qi
      const ur = (pr * qr + pi * qi) / qq
      const ui = (pi * qr - pr * qi) / qq
      return indexFromPermittivity(hr * ur - hi * ui, hr * ui + hi * ur)
    }
    case 'bruggeman': {
      return bruggeman(where, er, ei, f, avgR, avgI)
    }
  }
  throw new Error(`unhandled mixing rule ${rule}`)
}
