/**
 * A sample's optics warnings: figures that come from a method outside its range of validity, each saying which
 * figure, why and what to use instead. (The forcing's own warning is worded in climate/validity.ts. A refractive
 * index is never extrapolated: a table asked outside its wavelengths is refused with an InputError, as is a size
 * distribution that reaches beyond the sphere engine's size parameter 2e4.)
 */
import { nearSaturationWarning } from '../materials/saturation.ts'

export interface OpticsWarningInput {
  /** The sample's humidity, percent. */
  rhPercent: number
  /** The largest κ among its populations. */
  kappa: number
  /** Wavelengths (nm) whose size integration reached its finest grid before it settled. */
  unsettledNm: readonly number[]
}

export function opticsWarnings(w: OpticsWarningInput): string[] {
  const out: string[] = []
  const wet = nearSaturationWarning(w.rhPercent, w.kappa, 'The wet figures of this sample (coefficients, ω, g, b, β̄, wet mass, forcing)')
  if (wet) out.push(wet)
  if (w.unsettledNm.length) {
    out.push(
      `σext, σsca, σabs, g, b and β̄ at ${w.unsettledNm.join(', ')} nm may be less accurate than the tolerance: the size integration ` +
        'reached its finest grid before two successive refinements agreed (narrow resonances of weakly absorbing large particles). ' +
        'Read them as estimates and check them against the neighbouring wavelengths, whose spectra should be smooth.'
    )
  }
  return out
}

/** Every warning of a sample's results, its optics' first, then its forcing's. */
export function sampleWarnings(r: { optics: { warnings: readonly string[] }; forcing: { warnings: readonly string[] } }): string[] {
  return [...r.optics.warnings, ...r.forcing.warnings]
}
