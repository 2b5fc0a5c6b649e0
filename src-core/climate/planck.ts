/**
 * Blackbody (Planck) emission integrated over wavelength bands: the one place the band integrals of B live, for
 * the solar spectrum's blackbody approximation (spectrum.ts) and the thermal-infrared bands (longwave.ts).
 */
import { BOLTZMANN_CONSTANT_JK, PLANCK_CONSTANT_JS, SPEED_OF_LIGHT_MS, STEFAN_BOLTZMANN_WM2K4 } from './constants.ts'
import { checkRangeOpenLow } from './validate.ts'

/** Second radiation constant c₂ = hc/k in µm K. */
export const C2_UM_K = ((PLANCK_CONSTANT_JS * SPEED_OF_LIGHT_MS) / BOLTZMANN_CONSTANT_JK) * 1e6

// Bernoulli numbers B_m with m = 0, 1, 2, 4, …, 14 (the odd ones beyond B_1 vanish)
const BERNOULLI: ReadonlyArray<readonly [number, number]> = [
  [0, 1], [1, -0.5], [2, 1 / 6], [4, -1 / 30], [6, 1 / 42], [8, -1 / 30], [10, 5 / 66], [12, -691 / 2730], [14, 7 / 6]
]

/**
 * Fraction of a blackbody's emission at wavelengths below λ (0..1), at temperature T.
 * With x = c₂/(λT): for x ≥ 1 the exponential series
 *   f = (15/π⁴) Σₙ e^{−nx} (x³/n + 3x²/n² + 6x/n³ + 6/n⁴)
 * (Widger, W. K. & Woodall, M. P. (1976), Bull. Am. Meteorol. Soc. 57, 1217–1219); for x < 1 the
 * complement 1 − (15/π⁴) ∫₀ˣ t³/(eᵗ − 1) dt with the Bernoulli-number series
 *   ∫₀ˣ t³/(eᵗ − 1) dt = Σₘ Bₘ x^{m+3} / (m! (m + 3))   (converges for x < 2π).
 * Checked against scipy and mpmath quadrature (test/reference/make_planck_reference.py).
 * Domain: λ > 0 µm (Infinity gives 1), T > 0 K.
 */
export function blackbodyFractionBelow(wavelengthUm: number, temperatureK: number): number {
  if (wavelengthUm === Number.POSITIVE_INFINITY) return 1
  checkRangeOpenLow('wavelengthUm', wavelengthUm, 0, Number.MAX_VALUE, 'µm')
  checkRangeOpenLow('temperatureK', temperatureK, 0, 1e5, 'K')
  return fractionBelow(C2_UM_K / (wavelengthUm * temperatureK))
}

const FRACTION_SCALE = 15 / Math.PI ** 4

/** The blackbody fraction below λ as a function of x = c₂/(λT) (see blackbodyFractionBelow); x > 0. */
function fractionBelow(x: number): number {
  const c = FRACTION_SCALE
  if (x >= 1) {
    // e^{−nx} as powers of e^{−x}: one exponential for the whole series
    const nMax = Math.ceil(45 / x) + 1
    const q = Math.exp(-x)
    const x2 = x * x
    const x3 = x2 * x
    let qn = 1
    let s = 0
    for (let n = 1; n <= nMax; n++) {
      qn *= q
      const i = 1 / n
      const i2 = i * i
      s += qn * i * (x3 + 3 * x2 * i + 6 * x * i2 + 6 * i2 * i)
    }
    return Math.min(1, c * s)
  }
  let s = 0
  let fact = 1
  let lastM = 0
  for (const [m, b] of BERNOULLI) {
    for (let j = lastM + 1; j <= m; j++) fact *= j
    lastM = m
    s += (b * x ** (m + 3)) / (fact * (m + 3))
  }
  return 1 - c * s
}

/**
 * Hemispheric blackbody flux in each of the bands between consecutive `edgesUm` (ascending, µm) at one
 * temperature, W m⁻², into `out` (length edgesUm.length − 1): one fraction per edge, so that neighbouring bands
 * share theirs. Equal to planckBandFlux band by band.
 */
export function planckBandFluxes(edgesUm: readonly number[], temperatureK: number, out: Float64Array): Float64Array {
  checkRangeOpenLow('temperatureK', temperatureK, 0, 1e5, 'K')
  const total = STEFAN_BOLTZMANN_WM2K4 * temperatureK ** 4
  let below = edgesUm[0] === Number.POSITIVE_INFINITY ? 1 : fractionBelow(C2_UM_K / (edgesUm[0] * temperatureK))
  for (let i = 1; i < edgesUm.length; i++) {
    const e = edgesUm[i]
    if (!(e > edgesUm[i - 1])) throw new RangeError(`planckBandFluxes: edges must ascend (${edgesUm[i - 1]}, ${e} µm)`)
    const f = e === Number.POSITIVE_INFINITY ? 1 : fractionBelow(C2_UM_K / (e * temperatureK))
    out[i - 1] = total * (f - below)
    below = f
  }
  return out
}

/**
 * Hemispheric blackbody flux emitted between two wavelengths, π ∫ B_λ(T) dλ over [lo, hi] µm, in W m⁻²:
 * σT⁴ times the difference of the fractions below hi and lo. Domain: 0 < lo < hi (hi may be Infinity).
 */
export function planckBandFlux(loUm: number, hiUm: number, temperatureK: number): number {
  if (!(hiUm > loUm)) throw new RangeError(`planckBandFlux: band ${loUm}–${hiUm} µm is empty`)
  return STEFAN_BOLTZMANN_WM2K4 * temperatureK ** 4 * (blackbodyFractionBelow(hiUm, temperatureK) - blackbodyFractionBelow(loUm, temperatureK))
}

/**
 * Spectral hemispheric blackbody flux π B_λ(T), W m⁻² µm⁻¹, with B_λ = 2hc² λ⁻⁵ / (exp(c₂/λT) − 1).
 */
export function planckSpectralFlux(wavelengthUm: number, temperatureK: number): number {
  const x = C2_UM_K / (wavelengthUm * temperatureK)
  if (x > 700) return 0
  const lam = wavelengthUm * 1e-6
  return ((2 * Math.PI * PLANCK_CONSTANT_JS * SPEED_OF_LIGHT_MS ** 2) / lam ** 5 / Math.expm1(x)) * 1e-6
}
