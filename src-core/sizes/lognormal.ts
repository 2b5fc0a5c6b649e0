/**
 * Lognormal size modes.
 *
 * Canonical form of a mode: number concentration N (cm⁻³), count median diameter D_g (µm) and
 * geometric standard deviation σ_g (dimensionless, 1 < σ_g <= 5). The number distribution is
 *     dN/dlnD = N / (√(2π) ln σ_g) · exp(−(ln D − ln D_g)² / (2 ln² σ_g)).
 * Moments and the other median diameters follow the Hatch–Choate relations
 * (Seinfeld & Pandis, Atmospheric Chemistry and Physics, ch. 8):
 *     M_k = ∫ D^k dN = N D_g^k exp(k² ln² σ_g / 2),
 *     the D^k-weighted distribution is lognormal with the same σ_g and median D_g exp(k ln² σ_g),
 *     so the surface median is D_g exp(2 ln² σ_g) and the volume median D_g exp(3 ln² σ_g).
 * Units: diameters µm, number cm⁻³, surface µm² cm⁻³, volume µm³ cm⁻³, mass µg m⁻³, density g cm⁻³
 * (µm³ cm⁻³ × g cm⁻³ = 1e-12 g cm⁻³ = µg m⁻³).
 */
import { InputError } from '../errors.ts'
import { fmt, requireFinite, requireNonNegative, requirePositive } from './format.ts'

/** A lognormal mode in canonical (number) form. */
export interface LognormalMode {
  /** Number concentration N, cm⁻³ (>= 0). */
  readonly number: number
  /** Count median diameter D_g, µm (> 0). */
  readonly median: number
  /** Geometric standard deviation σ_g, 1 < σ_g <= MAX_GSD. */
  readonly gsd: number
  /** Optional name used in error messages, e.g. "accumulation". */
  readonly name?: string
}

/** The largest geometric standard deviation accepted. Wider modes are almost always a typo (e.g. ln σ_g given as σ_g). */
export const MAX_GSD = 5

/**
 * How a mode is named in error messages: "mode 2 (accumulation)" when its position in a list is known
 * (counted from 1), otherwise "mode (accumulation)" or "mode".
 */
export function modeLabel(mode: { name?: string } | undefined, index?: number): string {
  const pos = index === undefined ? 'mode' : `mode ${index + 1}`
  const name = mode && typeof mode.name === 'string' && mode.name !== '' ? ` (${mode.name})` : ''
  return pos + name
}

/** Throws InputError unless gsd is a finite number with 1 < gsd <= MAX_GSD. */
function checkGsd(label: string, gsd: number): void {
  const where = `${label}: gsd`
  requireFinite(where, gsd, 'the geometric standard deviation', `Give σ_g as a number greater than 1 and at most ${MAX_GSD}.`)
  if (gsd <= 1) {
    throw new InputError(
      where,
      `the geometric standard deviation is ${fmt(gsd)}; it must be greater than 1 (σ_g = 1 would be a single size, below 1 is meaningless)`,
      gsd > 0 && gsd < 1
        ? `If ${fmt(gsd)} is ln σ_g, give σ_g = ${fmt(Math.exp(gsd))}; otherwise use a value above 1 (typical 1.2 to 2.5).`
        : 'Use a value above 1 (typical 1.2 to 2.5).'
    )
  }
  if (gsd > MAX_GSD) {
    throw new InputError(
      where,
      `the geometric standard deviation is ${fmt(gsd)}, above the accepted maximum ${MAX_GSD} (such a mode spans many decades and is almost certainly a typo)`,
      `Check the value; atmospheric modes have σ_g between about 1.2 and 2.5. Give at most ${MAX_GSD}.`
    )
  }
}

/**
 * Checks a mode in canonical form and throws InputError naming the mode and field if it is bad:
 * N < 0 or non-finite, D_g <= 0 or non-finite, σ_g <= 1, σ_g > MAX_GSD or non-finite.
 * index (0-based position in a list) only changes the message ("mode 2 (...)").
 */
export function checkMode(mode: LognormalMode, index?: number): void {
  const label = modeLabel(mode, index)
  if (mode === null || typeof mode !== 'object') {
    throw new InputError(label, `expected an object { number, median, gsd } but got ${String(mode)}`, 'Build the mode with modeFromNumber, modeFromVolume or modeFromMass.')
  }
  requireNonNegative(`${label}: number`, mode.number, 'the number concentration', 'cm⁻³', 'Give N in cm⁻³ as a number >= 0.')
  requirePositive(`${label}: median`, mode.median, 'the count median diameter', 'µm', 'Give D_g in µm as a number > 0.')
  checkGsd(label, mode.gsd)
}

/**
 * A mode from its number form: N (cm⁻³), count median diameter D_g (µm), σ_g.
 * Validates and returns the canonical mode. Throws InputError on bad values.
 */
export function modeFromNumber(p: { number: number; median: number; gsd: number; name?: string }): LognormalMode {
  const mode: LognormalMode = p.name === undefined ? { number: p.number, median: p.median, gsd: p.gsd } : { number: p.number, median: p.median, gsd: p.gsd, name: p.name }
  checkMode(mode)
  return mode
}

/**
 * A mode from its volume form: total volume V (µm³ cm⁻³), volume median diameter D_vg (µm), σ_g.
 * Exact Hatch–Choate conversion (Seinfeld & Pandis ch. 8): D_g = D_vg exp(−3 ln² σ_g),
 * N = V / ((π/6) D_g³ exp(9 ln² σ_g / 2)).
 */
export function modeFromVolume(p: { volume: number; volumeMedian: number; gsd: number; name?: string }): LognormalMode {
  const label = modeLabel(p)
  checkGsd(label, p.gsd)
  requireNonNegative(`${label}: volume`, p.volume, 'the volume concentration', 'µm³ cm⁻³', 'Give V in µm³ cm⁻³ as a number >= 0.')
  requirePositive(`${label}: volumeMedian`, p.volumeMedian, 'the volume median diameter', 'µm', 'Give D_vg in µm as a number > 0.')
  const l2 = Math.log(p.gsd) ** 2
  const median = p.volumeMedian * Math.exp(-3 * l2)
  const number = p.volume / ((Math.PI / 6) * median ** 3 * Math.exp(4.5 * l2))
  return modeFromNumber({ number, median, gsd: p.gsd, name: p.name })
}

/**
 * A mode from its mass form: mass concentration (µg m⁻³), mass median diameter (µm), particle density
 * (g cm⁻³) and σ_g. The volume is mass/density (µg m⁻³ ÷ g cm⁻³ = µm³ cm⁻³), then as modeFromVolume.
 */
export function modeFromMass(p: { mass: number; massMedian: number; density: number; gsd: number; name?: string }): LognormalMode {
  const label = modeLabel(p)
  requireNonNegative(`${label}: mass`, p.mass, 'the mass concentration', 'µg m⁻³', 'Give the mass in µg m⁻³ as a number >= 0.')
  requirePositive(`${label}: density`, p.density, 'the particle density', 'g cm⁻³', 'Give the density in g cm⁻³ (e.g. 1.77 for ammonium sulfate).')
  return modeFromVolume({ volume: p.mass / p.density, volumeMedian: p.massMedian, gsd: p.gsd, name: p.name })
}

/**
 * The k-th moment M_k = ∫ D^k dN = N D_g^k exp(k² ln² σ_g / 2), in µm^k cm⁻³ (Hatch–Choate,
 * Seinfeld & Pandis ch. 8). k is any finite real (negative and fractional moments are allowed).
 */
export function moment(mode: LognormalMode, k: number): number {
  checkMode(mode)
  requireFinite(`${modeLabel(mode)}: moment order`, k, 'the moment order k', 'Give k as a finite number, e.g. 2 for surface or 3 for volume.')
  const l = Math.log(mode.gsd)
  return mode.number * Math.exp(k * Math.log(mode.median) + 0.5 * k * k * l * l)
}

/** Number concentration N, cm⁻³ (the 0th moment). */
export function numberConcentration(mode: LognormalMode): number {
  checkMode(mode)
  return mode.number
}

/** Surface concentration S = π M₂, µm² cm⁻³ (spheres). Seinfeld & Pandis ch. 8. */
export function surfaceConcentration(mode: LognormalMode): number {
  return Math.PI * moment(mode, 2)
}

/** Volume concentration V = (π/6) M₃, µm³ cm⁻³ (spheres). Seinfeld & Pandis ch. 8. */
export function volumeConcentration(mode: LognormalMode): number {
  return (Math.PI / 6) * moment(mode, 3)
}

/** Mass concentration ρ V in µg m⁻³ for particle density ρ in g cm⁻³. */
export function massConcentration(mode: LognormalMode, density: number): number {
  requirePositive(`${modeLabel(mode)}: density`, density, 'the particle density', 'g cm⁻³', 'Give the density in g cm⁻³.')
  return density * volumeConcentration(mode)
}

/**
 * Median diameter of the D^k-weighted distribution, D_g exp(k ln² σ_g), µm (Hatch–Choate,
 * Seinfeld & Pandis ch. 8). k = 0 count, 2 surface, 3 volume (and mass, for one density).
 */
export function momentMedianDiameter(mode: LognormalMode, k: number): number {
  checkMode(mode)
  requireFinite(`${modeLabel(mode)}: moment order`, k, 'the moment order k', 'Give k as a finite number.')
  return mode.median * Math.exp(k * Math.log(mode.gsd) ** 2)
}

/** Surface median diameter D_sg = D_g exp(2 ln² σ_g), µm (Hatch–Choate). */
export function surfaceMedianDiameter(mode: LognormalMode): number {
  return momentMedianDiameter(mode, 2)
}

/** Volume median diameter D_vg = D_g exp(3 ln² σ_g), µm (Hatch–Choate); also the mass median for one density. */
export function volumeMedianDiameter(mode: LognormalMode): number {
  return momentMedianDiameter(mode, 3)
}

/** The volume form { volume (µm³ cm⁻³), volumeMedian (µm), gsd } of a mode; inverse of modeFromVolume. */
export function toVolumeForm(mode: LognormalMode): { volume: number; volumeMedian: number; gsd: number } {
  return { volume: volumeConcentration(mode), volumeMedian: volumeMedianDiameter(mode), gsd: mode.gsd }
}

/**
 * Number distribution dN/dlnD at diameter D (µm), in cm⁻³:
 * N / (√(2π) ln σ_g) · exp(−(ln D − ln D_g)² / (2 ln² σ_g)). Seinfeld & Pandis ch. 8. D must be > 0.
 */
export function dNdlnD(mode: LognormalMode, diameter: number): number {
  checkMode(mode)
  requirePositive(`${modeLabel(mode)}: diameter`, diameter, 'the diameter', 'µm', 'Give D in µm as a number > 0.')
  return densityAtLnD(mode.number, Math.log(mode.median), Math.log(mode.gsd), Math.log(diameter))
}

/** The formula of dNdlnD, with ln D_g, ln σ_g and ln D given. */
function densityAtLnD(number: number, lnMedian: number, lnGsd: number, lnD: number): number {
  const z = (lnD - lnMedian) / lnGsd
  return (number / (Math.sqrt(2 * Math.PI) * lnGsd)) * Math.exp(-0.5 * z * z)
}

/**
 * dN/dlnD of a mode as a function of ln D (D in µm), for integration loops: the mode is checked once, here
 * (throws InputError on bad values), and each call is then plain arithmetic.
 */
export function dNdlnDOfLnD(mode: LognormalMode): (lnD: number) => number {
  checkMode(mode)
  const { number } = mode
  const lnMedian = Math.log(mode.median)
  const lnGsd = Math.log(mode.gsd)
  return (lnD) => densityAtLnD(number, lnMedian, lnGsd, lnD)
}

/** Number distribution dN/dlog₁₀D at D (µm), cm⁻³: ln(10) · dN/dlnD. */
export function dNdlogD(mode: LognormalMode, diameter: number): number {
  return Math.LN10 * dNdlnD(mode, diameter)
}
