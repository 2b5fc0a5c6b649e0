/**
 * The campaign at a glance: the median and 5–95 % range of each computed/measured ratio over the rows, and the
 * notes an output file states about how the measured figures were made comparable.
 *
 * Percentiles: linear interpolation between order statistics, h = (n − 1)·p, the definition numbered 7 by
 * Hyndman & Fan (1996, The American Statistician 50:361), the default of R and NumPy.
 */
import { ASSUMED_ABSORPTION_ANGSTROM, planWavelengths, type ComparisonPlan } from './optical.ts'

/** The p-quantile (0 ≤ p ≤ 1) of ascending values, Hyndman & Fan type 7; NaN for none. */
export function percentileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length
  if (n === 0) return NaN
  const h = (n - 1) * p
  const lo = Math.floor(h)
  const hi = Math.min(n - 1, lo + 1)
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo])
}

export interface RatioSummary {
  column: string
  /** Rows with a ratio (measured data present and positive). */
  count: number
  median: number
  p5: number
  p95: number
}

/** Collects the ratio columns of the comparison row by row (finite values only) in growing typed arrays. */
export class RatioCollector {
  private readonly index: number[]
  private readonly names: string[]
  private readonly store: Float64Array[]
  private readonly counts: number[]

  /** columns: the comparison's columns; the ones whose name holds "_ratio_" are collected. */
  constructor(columns: readonly string[]) {
    this.index = []
    this.names = []
    columns.forEach((c, i) => {
      if (c.includes('_ratio_')) {
        this.index.push(i)
        this.names.push(c)
      }
    })
    this.store = this.names.map(() => new Float64Array(256))
    this.counts = this.names.map(() => 0)
  }

  /** Adds one row's comparison cells (the array RowComparer filled). */
  add(cells: ArrayLike<number>): void {
    for (let r = 0; r < this.index.length; r++) {
      const v = cells[this.index[r]]
      if (!Number.isFinite(v)) continue
      let a = this.store[r]
      if (this.counts[r] === a.length) {
        const b = new Float64Array(a.length * 2)
        b.set(a)
        this.store[r] = a = b
      }
      a[this.counts[r]++] = v
    }
  }

  summary(): RatioSummary[] {
    return this.names.map((column, r) => {
      const v = this.store[r].slice(0, this.counts[r]).sort()
      return { column, count: v.length, median: percentileSorted(v, 0.5), p5: percentileSorted(v, 0.05), p95: percentileSorted(v, 0.95) }
    })
  }
}

/** The comment lines an output with a comparison starts with (without the leading "# "). */
export function comparisonNotes(plan: ComparisonPlan, o: { intervalText: string; files: string[]; humidity?: string }): string[] {
  const notes = [
    `measured: ${o.files.join(', ')}; coefficients in Mm-1; each sizer row's measured value is the mean of the records stamped inside [row time, row time + ${o.intervalText}) (cut at the next row); an empty cell: no measured record in that interval (never filled)`,
    'ratio: computed/measured (computed from the row at the sample composition and humidity, at the instrument wavelengths); empty where the measured value is missing or not above 0'
  ]
  if (plan.truncation) {
    notes.push(
      `truncation: measured scattering multiplied by C = sigma_true/sigma_seen for a nephelometer seeing ${plan.truncation.lowDeg} to ${plan.truncation.highDeg} deg (ideal sin response; backscattering 90 to ${plan.truncation.highDeg} deg) from the row's own computed phase function (after Anderson & Ogren 1998); _meas_corr columns are the corrected values and the ratios use them`
    )
  } else notes.push('truncation: not corrected (the measured scattering is compared as it is; --truncation corrects it)')
  if (o.humidity) notes.push(o.humidity)
  if (planWavelengths(plan, 'absorption').length > 0 && planWavelengths(plan, 'scattering').length > 0) {
    const one = planWavelengths(plan, 'absorption').length === 1
    notes.push(
      `ssa_meas: measured scattering${plan.truncation ? ' (truncation-corrected)' : ''}/(scattering + absorption), the absorption carried to each scattering wavelength by its own Angstrom exponent (log-log between the two nearest absorption wavelengths, extrapolated beyond them)` +
        (one ? `; absorption is measured at one wavelength only, so an absorption Angstrom exponent of ${ASSUMED_ABSORPTION_ANGSTROM} is ASSUMED (common practice for black carbon)` : '')
    )
  }
  if (plan.closure) {
    notes.push(
      `closure: effective index n + ik of dry homogeneous spheres of the row's distribution that reproduces the measured coefficients (weighted least squares, 1 sd uncertainties; measurement sd ${plan.closure.scatteringSd * 100} % of scattering, ${plan.closure.absorptionSd * 100} % of absorption); closure_unique 1 = one minimum, 0 = not unique (another minimum or an unconstrained direction)`
    )
  }
  return notes
}
