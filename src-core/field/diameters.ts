/**
 * Equivalent diameters of the sizers a station runs, and their conversion to the volume-equivalent diameter d_ve
 * (the diameter of a sphere of the particle's volume), after DeCarlo, Slowik, Worsnop, Davidovits & Jimenez
 * (2004), Aerosol Sci. Technol. 38:1185 (their eqs. for d_m and d_a in the transition regime):
 *
 *   mobility d_m:      d_m / C_c(d_m) = χ d_ve / C_c(d_ve)
 *   aerodynamic d_a:   ρ₀ d_a² C_c(d_a) = (ρ_p/χ) d_ve² C_c(d_ve),  ρ₀ = 1 g cm⁻³
 *
 * with χ the dynamic shape factor (1 for spheres), ρ_p the particle density and C_c the Cunningham slip
 * correction (src-core/sizes/aerodynamic.ts). Both are implicit and solved by bisection in ln d: d/C_c(d) and
 * d² C_c(d) are strictly increasing (C_c falls with d), so each root is unique.
 * Optical (PSL-calibrated) diameters go through the counter re-binning of src-core/instruments/opc.ts.
 * Diameters in µm, density g cm⁻³.
 */
import { InputError } from '../errors.ts'
import { solveIncreasing } from '../numeric/index.ts'
import { aerodynamicDiameter, aerodynamicOptionsChecked, cunninghamSlipCorrection, volumeDiameterFromAerodynamic, type AerodynamicOptions } from '../sizes/aerodynamic.ts'
import { rebinOpcEdges, type OpcGeometry } from '../instruments/opc.ts'

/** d / C_c(d), strictly increasing in d. */
function mobilityTerm(d: number, lambda: number): number {
  return d / cunninghamSlipCorrection(d, lambda)
}

/** Solves d / C_c(d) = target for d > 0 (unique root; ~1e-15 relative). */
function solveMobilityTerm(target: number, lambda: number, guess: number): number {
  return solveIncreasing((d) => mobilityTerm(d, lambda), target, guess)
}

function positive(where: string, v: number, what: string): void {
  if (!(Number.isFinite(v) && v > 0)) throw new InputError(where, `${what} is ${v}; it must be a number greater than 0`, `Give ${what} in µm.`)
}

/**
 * Electrical-mobility diameter d_m (µm) of a particle of volume-equivalent diameter d_ve (µm) and dynamic shape
 * factor χ (DeCarlo et al. 2004): d_m / C_c(d_m) = χ d_ve / C_c(d_ve). χ = 1 gives d_m = d_ve; for d ≫ λ,
 * d_m → χ d_ve.
 */
export function mobilityDiameter(volumeDiameter: number, options?: AerodynamicOptions): number {
  positive('mobility diameter: volume-equivalent diameter', volumeDiameter, 'the volume-equivalent diameter')
  const { chi, lambda } = aerodynamicOptionsChecked('mobility diameter', options)
  if (chi === 1) return volumeDiameter
  return solveMobilityTerm(chi * mobilityTerm(volumeDiameter, lambda), lambda, volumeDiameter * chi)
}

/** Inverse of mobilityDiameter: d_ve (µm) from d_m (µm), solving d_ve / C_c(d_ve) = d_m / (χ C_c(d_m)). */
export function volumeDiameterFromMobility(mobility: number, options?: AerodynamicOptions): number {
  positive('volume-equivalent diameter from mobility: mobility diameter', mobility, 'the mobility diameter')
  const { chi, lambda } = aerodynamicOptionsChecked('volume-equivalent diameter from mobility', options)
  if (chi === 1) return mobility
  return solveMobilityTerm(mobilityTerm(mobility, lambda) / chi, lambda, mobility / chi)
}

/** The diameter a sizer reports. */
export type SizerKind = 'mobility' | 'aerodynamic' | 'optical'

export const SIZER_KINDS: readonly SizerKind[] = ['mobility', 'aerodynamic', 'optical']

/** What the conversions to d_ve need. */
export interface ConversionSettings {
  /** Dynamic shape factor χ, 1 to 5 (1 for spheres). Mobility and aerodynamic diameters. */
  shapeFactor: number
  /** Particle density ρ_p, g cm⁻³. Aerodynamic diameters. */
  density?: number
  /** Mean free path of air, µm (default 0.0651, air at 298 K and 1 atm). */
  meanFreePath?: number
  /** Optical counters: the sample's refractive index at the laser wavelength, and the counter's optics. */
  optical?: { index: { n: number; k: number }; geometry: OpcGeometry }
}

export interface ConvertedEdges {
  /** Volume-equivalent bin edges, µm, ascending. */
  edges: Float64Array
  /** Bins (0-based) whose conversion is doubtful (optical counters: a non-monotonic response), with the reason. */
  flagged: { bin: number; reason: string }[]
}

/**
 * Volume-equivalent edges (µm) of a sizer's bins given by their native edges (µm, ascending). Each edge maps
 * through the monotonic conversion of its kind, so each bin keeps its particles: dN per bin is conserved and
 * dN/dlog d_ve = dN/dlog d_native · Δlog d_native / Δlog d_ve (the Jacobian, taken bin by bin).
 */
export function volumeEquivalentEdges(kind: SizerKind, nativeEdges: ArrayLike<number>, s: ConversionSettings, label: string = kind): ConvertedEdges {
  const n = nativeEdges.length
  const opts = { shapeFactor: s.shapeFactor, meanFreePath: s.meanFreePath }
  const out = new Float64Array(n)
  const flagged: { bin: number; reason: string }[] = []
  if (kind === 'mobility') {
    for (let i = 0; i < n; i++) out[i] = volumeDiameterFromMobility(nativeEdges[i], opts)
  } else if (kind === 'aerodynamic') {
    if (s.density === undefined) throw new InputError(`${label}: density`, 'aerodynamic diameters need the particle density to become volume-equivalent', 'Give --density (g cm⁻³), or --fit-density to fit it in the overlap with the mobility sizer.')
    for (let i = 0; i < n; i++) out[i] = volumeDiameterFromAerodynamic(nativeEdges[i], s.density, opts)
  } else {
    if (!s.optical) throw new InputError(`${label}: index`, "an optical counter's diameters need the sample's refractive index and the counter's wavelength and angles", 'Give --m N+Ki, --wavelength and --angles A:B.')
    const r = rebinOpcEdges(Array.from(nativeEdges), s.optical.index, s.optical.geometry)
    for (let i = 0; i < n; i++) out[i] = r.edges[i].true_um
    r.bins.forEach((b, i) => {
      if (b.flagged) flagged.push({ bin: i, reason: b.reasons.join('; ') })
    })
  }
  for (let i = 1; i < n; i++) {
    if (!(out[i] > out[i - 1])) {
      throw new InputError(
        `${label} bin ${i} (${nativeEdges[i - 1]}–${nativeEdges[i]} µm as measured)`,
        `its volume-equivalent edges ${out[i - 1].toPrecision(4)} and ${out[i].toPrecision(4)} µm do not ascend (the conversion is not monotonic there)`,
        'Leave this bin out with the instrument range option (e.g. --optical-range), or check the refractive index.'
      )
    }
  }
  return { edges: out, flagged }
}

/** Forward conversion (for checks and synthetic data): native diameter (µm) of a particle of volume-equivalent d (µm). */
export function fromVolumeEquivalent(kind: 'mobility' | 'aerodynamic', d: number, s: ConversionSettings): number {
  const opts = { shapeFactor: s.shapeFactor, meanFreePath: s.meanFreePath }
  if (kind === 'mobility') return mobilityDiameter(d, opts)
  if (s.density === undefined) throw new InputError('aerodynamic: density', 'no particle density given', 'Give --density (g cm⁻³).')
  return aerodynamicDiameter(d, s.density, opts)
}
