/**
 * Mass below a size cut (PM1, PM2.5, PM10) from lognormal modes or from bins.
 *
 * The cut is applied either to the geometric (volume-equivalent sphere) diameter or to the aerodynamic
 * diameter (Stokes regime with Cunningham slip correction, see aerodynamic.ts; Seinfeld & Pandis ch. 9,
 * Hinds ch. 3). An aerodynamic cut is first turned into the geometric diameter whose aerodynamic diameter
 * equals the cut (monotone, unique), then the geometric formula is used. The cut is sharp (an ideal
 * step at the cut diameter, not a real inlet's penetration curve).
 *
 * Lognormal mode, geometric cut D_c: mass below = ρ (π/6) N ∫₀^{D_c} D³ n(ln D) dln D
 *   = ρ V · ½ erfc( (ln D_vg − ln D_c) / (√2 ln σ_g) ),  D_vg = D_g exp(3 ln² σ_g) (Hatch–Choate,
 * Seinfeld & Pandis ch. 8): the D³-weighted distribution is lognormal about D_vg with the same σ_g.
 */
import { InputError } from '../errors.ts'
import { type AerodynamicOptions, aerodynamicOptionsChecked, MEAN_FREE_PATH_AIR_UM, volumeDiameterFromAerodynamic } from './aerodynamic.ts'
import { BIN_SHAPE, binPowerIntegral, checkSizeBins, type SizeBins } from './bins.ts'
import { erfc } from './erf.ts'
import { fmt, requirePositive } from './format.ts'
import { checkMode, type LognormalMode, modeLabel, volumeConcentration, volumeMedianDiameter } from './lognormal.ts'

/** Which diameter a size cut applies to. */
export type CutDiameter = 'geometric' | 'aerodynamic'

/** Options for the mass-below-cut functions on modes. */
export interface CutOptions extends AerodynamicOptions {
  /** 'geometric' (volume-equivalent sphere diameter) or 'aerodynamic'. */
  readonly diameter: CutDiameter
  /** Particle density in g cm⁻³: one for all modes, or one per mode. */
  readonly density: number | readonly number[]
}

/** Options for the mass-below-cut functions on bins (one density for all bins). */
export interface BinCutOptions extends AerodynamicOptions {
  readonly diameter: CutDiameter
  /** Particle density in g cm⁻³. */
  readonly density: number
}

/** Mass below one cut. */
export interface MassBelowCut {
  /** The cut, µm, as the diameter named in `diameter`. */
  readonly cut: number
  /** Which diameter the cut was applied to. */
  readonly diameter: CutDiameter
  /** Mass of particles below the cut, µg m⁻³. */
  readonly mass: number
  /** Total mass, µg m⁻³. */
  readonly total: number
  /** The geometric cut used for each mode (one value for bins), µm. Equal to `cut` for a geometric cut. */
  readonly geometricCuts: readonly number[]
  /** One sentence saying which diameter was used and how. */
  readonly basis: string
}

/** PM1, PM2.5 and PM10 in µg m⁻³ with the total and the basis of the cut. */
export interface ParticulateMatter {
  readonly pm1: number
  readonly pm2_5: number
  readonly pm10: number
  /** Total mass, µg m⁻³. */
  readonly total: number
  readonly diameter: CutDiameter
  readonly basis: string
}

function checkCutDiameter(d: unknown): CutDiameter {
  if (d === 'geometric' || d === 'aerodynamic') return d
  throw new InputError('size cut: diameter', `unknown diameter kind "${String(d)}"`, "Use 'geometric' (volume-equivalent diameter) or 'aerodynamic'.")
}

function basisText(diameter: CutDiameter, chi: number, lambda: number): string {
  if (diameter === 'geometric') return 'Sharp cut on the geometric (volume-equivalent sphere) diameter.'
  return (
    `Sharp cut on the aerodynamic diameter (Stokes regime with Cunningham slip correction, λ = ${fmt(lambda)} µm` +
    `${lambda === MEAN_FREE_PATH_AIR_UM ? ' for air at 298 K, 1 atm' : ''}, ρ₀ = 1 g cm⁻³, χ = ${fmt(chi)}); particle diameters are taken as volume-equivalent diameters.`
  )
}

/** Fraction of a mode's volume below geometric diameter c (µm). Exact; accurate in both tails. */
function volumeFractionBelow(mode: LognormalMode, c: number): number {
  const l = Math.log(mode.gsd)
  return 0.5 * erfc((Math.log(volumeMedianDiameter(mode)) - Math.log(c)) / (Math.SQRT2 * l))
}

/**
 * Mass (µg m⁻³) of particles with diameter below `cut` (µm) in a sum of lognormal modes.
 * options.diameter says whether the cut is geometric or aerodynamic; options.density is one density or
 * one per mode (g cm⁻³); for aerodynamic cuts also shapeFactor χ (default 1) and meanFreePath (µm).
 * Closed form with erfc per mode (see file comment). Throws InputError for bad modes, cut or options.
 */
export function massBelowCut(modes: readonly LognormalMode[], cut: number, options: CutOptions): MassBelowCut {
  if (!Array.isArray(modes) || modes.length === 0) throw new InputError('modes', 'no modes given', 'Give at least one lognormal mode.')
  requirePositive('size cut', cut, 'the cut diameter', 'µm', 'Give the cut in µm, e.g. 2.5.')
  if (!options) throw new InputError('size cut: options', 'no options given', "Give { diameter: 'geometric' | 'aerodynamic', density }.")
  const diameter = checkCutDiameter(options.diameter)
  const { chi, lambda } = aerodynamicOptionsChecked('size cut', options)
  const densities = options.density
  if (Array.isArray(densities) && densities.length !== modes.length) {
    throw new InputError('size cut: density', `${densities.length} densities given for ${modes.length} modes`, 'Give one density for all modes or one per mode.')
  }
  let mass = 0
  let total = 0
  const geometricCuts: number[] = []
  for (let i = 0; i < modes.length; i++) {
    const mode = modes[i]
    checkMode(mode, i)
    const rho = typeof densities === 'number' ? densities : (densities as readonly number[])[i]
    requirePositive(`${modeLabel(mode, i)}: density`, rho, 'the particle density', 'g cm⁻³', 'Give the density in g cm⁻³.')
    const c = diameter === 'geometric' ? cut : volumeDiameterFromAerodynamic(cut, rho, { shapeFactor: chi, meanFreePath: lambda })
    geometricCuts.push(c)
    const m = rho * volumeConcentration(mode)
    total += m
    mass += m * volumeFractionBelow(mode, c)
  }
  return { cut, diameter, mass, total, geometricCuts, basis: basisText(diameter, chi, lambda) }
}

/**
 * PM1, PM2.5 and PM10 (µg m⁻³) of a sum of lognormal modes: massBelowCut at 1, 2.5 and 10 µm.
 */
export function particulateMatter(modes: readonly LognormalMode[], options: CutOptions): ParticulateMatter {
  const a = massBelowCut(modes, 1, options)
  const b = massBelowCut(modes, 2.5, options)
  const c = massBelowCut(modes, 10, options)
  return { pm1: a.mass, pm2_5: b.mass, pm10: c.mass, total: a.total, diameter: a.diameter, basis: a.basis }
}

/**
 * Mass (µg m⁻³) of particles below `cut` (µm) in binned data, exact under BIN_SHAPE (number flat in
 * log D inside a bin): whole bins below the cut count fully, the bin holding the cut counts
 * dN/dlogD · ρ (π/6) ∫_{lo}^{cut} D³ dlog₁₀D. For an aerodynamic cut the geometric cut is found as for
 * modes (one density for all bins). The basis string includes BIN_SHAPE.
 */
export function massBelowCutBins(bins: SizeBins, cut: number, options: BinCutOptions): MassBelowCut {
  checkSizeBins(bins)
  requirePositive('size cut', cut, 'the cut diameter', 'µm', 'Give the cut in µm, e.g. 2.5.')
  if (!options) throw new InputError('size cut: options', 'no options given', "Give { diameter: 'geometric' | 'aerodynamic', density }.")
  const diameter = checkCutDiameter(options.diameter)
  const { chi, lambda } = aerodynamicOptionsChecked('size cut', options)
  requirePositive('size bins: density', options.density, 'the particle density', 'g cm⁻³', 'Give the density in g cm⁻³.')
  const rho = options.density
  const c = diameter === 'geometric' ? cut : volumeDiameterFromAerodynamic(cut, rho, { shapeFactor: chi, meanFreePath: lambda })
  let mass = 0
  let total = 0
  const k = rho * (Math.PI / 6)
  for (let i = 0; i < bins.dNdlogD.length; i++) {
    const lo = bins.edges[i]
    const hi = bins.edges[i + 1]
    const x = bins.dNdlogD[i]
    const whole = k * x * binPowerIntegral(lo, hi, 3)
    total += whole
    if (hi <= c) mass += whole
    else if (lo < c) mass += k * x * binPowerIntegral(lo, c, 3)
  }
  return { cut, diameter, mass, total, geometricCuts: [c], basis: `${basisText(diameter, chi, lambda)} ${BIN_SHAPE}` }
}

/** PM1, PM2.5 and PM10 (µg m⁻³) of binned data: massBelowCutBins at 1, 2.5 and 10 µm. */
export function particulateMatterBins(bins: SizeBins, options: BinCutOptions): ParticulateMatter {
  const a = massBelowCutBins(bins, 1, options)
  const b = massBelowCutBins(bins, 2.5, options)
  const c = massBelowCutBins(bins, 10, options)
  return { pm1: a.mass, pm2_5: b.mass, pm10: c.mass, total: a.total, diameter: a.diameter, basis: a.basis }
}
