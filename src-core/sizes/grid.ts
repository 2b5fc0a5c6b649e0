/**
 * Diameter range for numerical integration over lognormal modes (for the optics code).
 *
 * The D^k-weighted distribution of a lognormal mode is lognormal in ln D with the same ln σ_g and median
 * D_g exp(k ln² σ_g) (Hatch–Choate, Seinfeld & Pandis ch. 8). Its mass outside
 * ln D_g + k ln² σ_g ± z ln σ_g is erfc(z/√2); choosing z with erfc(z/√2) = tailFraction and taking the
 * union over k = 0..highestMoment and over all modes gives [min, max] that holds all but tailFraction of
 * every such moment of every mode.
 */
import { InputError } from '../errors.ts'
import { twoSidedNormalQuantile } from './erf.ts'
import { checkMode, type LognormalMode } from './lognormal.ts'

/**
 * The diameter range [min, max] (µm) outside which each mode has at most `tailFraction` (default 1e-9)
 * of each of its moments M_0 … M_highestMoment (default 3, so number, surface and volume), counting both
 * tails together. Modes with N = 0 still count (their shape is known). Returns plain numbers and z, the
 * half-width in units of ln σ_g. Domain: 0 < tailFraction < 1, highestMoment an integer 0..6.
 */
export function integrationRange(
  modes: readonly LognormalMode[],
  options: { tailFraction?: number; highestMoment?: number } = {}
): { min: number; max: number; z: number; tailFraction: number } {
  if (!Array.isArray(modes) || modes.length === 0) throw new InputError('modes', 'no modes given', 'Give at least one lognormal mode.')
  const tail = options.tailFraction ?? 1e-9
  const kMax = options.highestMoment ?? 3
  if (!(typeof tail === 'number' && tail > 0 && tail < 1)) {
    throw new InputError('integration range: tailFraction', `${String(tail)} is not between 0 and 1`, 'Give a small positive fraction such as 1e-9.')
  }
  if (!Number.isInteger(kMax) || kMax < 0 || kMax > 6) {
    throw new InputError('integration range: highestMoment', `${String(kMax)} is not an integer from 0 to 6`, 'Give 3 for number, surface and volume.')
  }
  const z = twoSidedNormalQuantile(tail)
  let lnMin = Infinity
  let lnMax = -Infinity
  for (let i = 0; i < modes.length; i++) {
    const m = modes[i]
    checkMode(m, i)
    const l = Math.log(m.gsd)
    const c = Math.log(m.median)
    // k = 0 has the lowest centre and k = kMax the highest, since the shift k ln²σ_g grows with k.
    lnMin = Math.min(lnMin, c - z * l)
    lnMax = Math.max(lnMax, c + kMax * l * l + z * l)
  }
  return { min: Math.exp(lnMin), max: Math.exp(lnMax), z, tailFraction: tail }
}
