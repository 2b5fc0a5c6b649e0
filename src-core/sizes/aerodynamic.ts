/**
 * Cunningham slip correction and aerodynamic diameter.
 *
 * References: Seinfeld & Pandis, Atmospheric Chemistry and Physics, ch. 9 (slip correction, mean free path
 * of air, aerodynamic diameter in the Stokes regime); Hinds, Aerosol Technology, ch. 3 (from memory).
 */
import { InputError } from '../errors.ts'
import { solveIncreasing } from '../numeric/index.ts'
import { fmt, requirePositive } from './format.ts'

/**
 * Mean free path of air at 298 K and 1 atm, µm: λ = 0.0651 µm (Seinfeld & Pandis, ch. 9).
 */
export const MEAN_FREE_PATH_AIR_UM = 0.0651

/** Reference (unit) density of the aerodynamic diameter, g cm⁻³. */
export const UNIT_DENSITY = 1

/** Options of the aerodynamic-diameter functions. */
export interface AerodynamicOptions {
  /** Dynamic shape factor χ (1 for spheres), 1 <= χ <= 5. Default 1. */
  readonly shapeFactor?: number
  /** Mean free path of the gas in µm. Default MEAN_FREE_PATH_AIR_UM (air, 298 K, 1 atm). */
  readonly meanFreePath?: number
}

/**
 * Cunningham slip correction factor C_c(d) = 1 + (2λ/d)(1.257 + 0.4 exp(−1.1 d / (2λ))),
 * d and λ in µm (Seinfeld & Pandis ch. 9). Domain: d > 0, λ > 0. Dimensionless, >= 1;
 * → 1 for d ≫ λ and ≈ 1 + 2λ·1.657/d (free molecular) for d ≪ λ.
 */
export function cunninghamSlipCorrection(diameter: number, meanFreePath: number = MEAN_FREE_PATH_AIR_UM): number {
  requirePositive('Cunningham slip correction: diameter', diameter, 'the diameter', 'µm', 'Give the diameter in µm as a number > 0.')
  requirePositive('Cunningham slip correction: mean free path', meanFreePath, 'the mean free path', 'µm', `Give λ in µm (${MEAN_FREE_PATH_AIR_UM} for air at 298 K, 1 atm).`)
  const kn = (2 * meanFreePath) / diameter
  return 1 + kn * (1.257 + 0.4 * Math.exp(-1.1 / kn))
}

function readOptions(where: string, o: AerodynamicOptions | undefined): { chi: number; lambda: number } {
  const chi = o?.shapeFactor ?? 1
  const lambda = o?.meanFreePath ?? MEAN_FREE_PATH_AIR_UM
  requirePositive(`${where}: shapeFactor`, chi, 'the dynamic shape factor χ', '', 'Give χ = 1 for spheres, up to about 2 for irregular particles.')
  if (chi < 1 || chi > 5) {
    throw new InputError(`${where}: shapeFactor`, `the dynamic shape factor χ = ${fmt(chi)} is outside 1 to 5 (χ = 1 for spheres, larger for other shapes)`, 'Give χ between 1 and 5.')
  }
  requirePositive(`${where}: meanFreePath`, lambda, 'the mean free path', 'µm', `Give λ in µm (${MEAN_FREE_PATH_AIR_UM} for air at 298 K, 1 atm).`)
  return { chi, lambda }
}

/** d² C_c(d): strictly increasing in d for d > 0 (its derivative is >= 2.514λ − 0.8λe⁻² > 0). */
function squareTimesSlip(d: number, lambda: number): number {
  const kn = (2 * lambda) / d
  return d * d * (1 + kn * (1.257 + 0.4 * Math.exp(-1.1 / kn)))
}

/** Solves d² C_c(d) = target for d > 0 (the left side is monotone, so the root is unique; ~1e-15 relative). */
function solveSquareTimesSlip(target: number, lambda: number, guess: number): number {
  return solveIncreasing((d) => squareTimesSlip(d, lambda), target, guess)
}

/**
 * Aerodynamic diameter d_a (µm) of a particle of volume-equivalent diameter d_v (µm) and density
 * ρ_p (g cm⁻³), in the Stokes regime with slip correction (Seinfeld & Pandis ch. 9; Hinds ch. 3):
 *     d_a = d_v √( ρ_p C_c(d_v) / (ρ₀ χ C_c(d_a)) ),  ρ₀ = 1 g cm⁻³,
 * solved iteratively (as d_a² C_c(d_a) = d_v² C_c(d_v) ρ_p / (ρ₀ χ), monotone in d_a).
 */
export function aerodynamicDiameter(volumeDiameter: number, density: number, options?: AerodynamicOptions): number {
  const where = 'aerodynamic diameter'
  requirePositive(`${where}: diameter`, volumeDiameter, 'the volume-equivalent diameter', 'µm', 'Give it in µm as a number > 0.')
  requirePositive(`${where}: density`, density, 'the particle density', 'g cm⁻³', 'Give the density in g cm⁻³.')
  const { chi, lambda } = readOptions(where, options)
  const target = (squareTimesSlip(volumeDiameter, lambda) * density) / (UNIT_DENSITY * chi)
  return solveSquareTimesSlip(target, lambda, volumeDiameter)
}

/**
 * Inverse of aerodynamicDiameter: the volume-equivalent (geometric) diameter d_v (µm) whose aerodynamic
 * diameter is d_a (µm), for density ρ_p (g cm⁻³) and shape factor χ. Solves
 * d_v² C_c(d_v) = d_a² C_c(d_a) ρ₀ χ / ρ_p (monotone in d_v). References as aerodynamicDiameter.
 */
export function volumeDiameterFromAerodynamic(aerodynamic: number, density: number, options?: AerodynamicOptions): number {
  const where = 'geometric diameter from aerodynamic'
  requirePositive(`${where}: aerodynamic diameter`, aerodynamic, 'the aerodynamic diameter', 'µm', 'Give it in µm as a number > 0.')
  requirePositive(`${where}: density`, density, 'the particle density', 'g cm⁻³', 'Give the density in g cm⁻³.')
  const { chi, lambda } = readOptions(where, options)
  const target = (squareTimesSlip(aerodynamic, lambda) * UNIT_DENSITY * chi) / density
  return solveSquareTimesSlip(target, lambda, aerodynamic)
}

/** Internal: validated options, for callers that loop. */
export function aerodynamicOptionsChecked(where: string, o: AerodynamicOptions | undefined): { chi: number; lambda: number } {
  return readOptions(where, o)
}
