/**
 * Optical instruments beside a sizer: measured scattering, hemispheric backscattering and absorption
 * coefficients, averaged onto the sizer's rows, against the same coefficients computed from each row's
 * distribution.
 *
 * - Alignment (`MeasuredAlignment`): one step per sizer row, [t_k, t_k + interval) cut at the next row
 *   (`stampTimeBase`); each measured record counts in the step that holds its time stamp, and a step's value is
 *   the plain mean of the records that have data for that quantity. A step without such records has none (an
 *   empty cell), never a filled one.
 * - Kernels (`instrumentKernels`): the coefficients are linear in the bins' dN/dlogD, so per bin (per unit
 *   dN/dlogD) σsca and σabs (binOpticsKernels, the same integrals as the series columns), and, from each bin's
 *   own phase function at the nephelometer quadrature's angles (truncationQuadrature): the hemispheric
 *   backscattering (90°–180°), the scattering seen between the instrument's angles θ1–θ2 and the
 *   backscattering seen between 90° and θ2. A row's truncation correction is then a ratio of two dot products,
 *   C = Σ v_i σsca_i / Σ v_i σseen_i, the same C the nephelometer tool gives from the row's whole phase
 *   function (Anderson & Ogren 1998, Aerosol Sci. Technol. 29:57, for the definition).
 * - Comparison (`RowComparer`): per row, the measured coefficients (truncation-corrected: measured × C), the
 *   ratios computed/measured, the measured single-scattering albedo ω = σsca/(σsca + σabs) at each scattering
 *   wavelength with σabs carried there by its own Ångström exponent (between the two nearest absorption
 *   wavelengths, log-log; with one wavelength an exponent of 1 is assumed and stated), and optionally the
 *   closure index (retrieveRefractiveIndex on the row's bins, dry particles as measured).
 */
import { retrieveRefractiveIndex } from '../closure/index.ts'
import { InputError } from '../errors.ts'
import { truncationQuadrature, type NephelometerGeometry, type TruncationQuadrature } from '../instruments/nephelometer.ts'
import { binCount, binKernelsInputs, binKernelsLength, binOpticsKernels, bulkOpticsAt, OpticsWorkspace, packBinKernels, resolveComposition, rowDNdlogD, studyMaterials, type BinKernels, type BinLayout, type Conditions } from '../optics/index.ts'
import type { Sample, Study } from '../study/model.ts'
import type { OpticalChannel, OpticalQuantity } from './optical-file.ts'
import { stampTimeBase, stepOf, TimeAverager, type TimeBase } from './timebase.ts'

/** A measured channel of any of the instrument files. */
export type MeasuredChannel = Omit<OpticalChannel, 'column'> & { file?: string }

/** The nephelometer angles used when none are given: a stated example pair, not any one instrument's. */
export const DEFAULT_NEPHELOMETER_ANGLES: readonly [number, number] = [7, 170]
/** The absorption Ångström exponent assumed when the absorption is measured at one wavelength only (common practice for black carbon). */
export const ASSUMED_ABSORPTION_ANGSTROM = 1

/** Measured records averaged onto a sizer's rows. */
export class MeasuredAlignment {
  readonly base: TimeBase
  readonly channels: MeasuredChannel[]
  private readonly averager: TimeAverager
  private readonly scratch: Float64Array
  private means: (Float64Array | undefined)[] | null = null
  /** Records used, and records outside every sizer row, per call of `add`'s `file`. */
  readonly used = new Map<string, number>()
  readonly outside = new Map<string, number>()

  /** sizerTimesMs: the sizer rows' times, ascending; intervalMs: each row's interval (default: the typical spacing). */
  constructor(sizerTimesMs: ArrayLike<number>, channels: MeasuredChannel[], intervalMs?: number) {
    this.base = stampTimeBase(sizerTimesMs, intervalMs)
    this.channels = channels
    // Per channel: the sum of its values and the count of records with a value, so that a record without data
    // for one quantity does not dilute it.
    this.averager = new TimeAverager(this.base, 2 * channels.length)
    this.scratch = new Float64Array(2 * channels.length)
  }

  /** Adds a record at t (ms) whose values belong to channels first … first + values.length − 1. Returns its step or −1. */
  add(t: number, first: number, values: ArrayLike<number>, file = ''): number {
    const s = this.scratch
    s.fill(0)
    for (let j = 0; j < values.length; j++) {
      const v = values[j]
      if (Number.isFinite(v)) {
        s[2 * (first + j)] = v
        s[2 * (first + j) + 1] = 1
      }
    }
    const k = this.averager.add(t, s)
    const m = k < 0 ? this.outside : this.used
    m.set(file, (m.get(file) ?? 0) + 1)
    return k
  }

  /** The step (row) that holds time t, or −1. */
  stepOf(t: number): number {
    return stepOf(this.base, t)
  }

  /** Each channel's mean in step k into out (NaN: no data). Call after every `add`. */
  measuredAt(k: number, out: Float64Array): Float64Array {
    this.means ??= this.averager.means()
    const m = k >= 0 ? this.means[k] : undefined
    for (let c = 0; c < this.channels.length; c++) out[c] = m && m[2 * c + 1] > 0 ? m[2 * c] / m[2 * c + 1] : NaN
    return out
  }
}

/** What is compared: the channels (in the order of the measured values) and whether to correct for truncation. */
export interface ComparisonPlan {
  channels: MeasuredChannel[]
  /** Nephelometer angles for the truncation correction; null: the measured scattering is compared as it is. */
  truncation: NephelometerGeometry | null
  /** Closure per row, with the relative standard deviations given to the measurements (e.g. 0.1 and 0.25). */
  closure: { scatteringSd: number; absorptionSd: number } | null
}

/** The wavelengths of a quantity in a plan, ascending. */
export function planWavelengths(plan: Pick<ComparisonPlan, 'channels'>, q: OpticalQuantity): number[] {
  return [...new Set(plan.channels.filter((c) => c.quantity === q).map((c) => c.wavelengthNm))].sort((a, b) => a - b)
}

/** Every instrument wavelength, for the computed set. */
export function instrumentWavelengths(plan: Pick<ComparisonPlan, 'channels'>): number[] {
  return [...new Set(plan.channels.map((c) => c.wavelengthNm))].sort((a, b) => a - b)
}

export interface InstrumentKernels {
  layout: BinLayout
  base: BinKernels
  /** Per wavelength of scattering or backscattering: per bin, the hemispheric backscattering, the scattering seen
   * between θ1 and θ2 and the backscattering seen between 90° and θ2 (Mm⁻¹ per unit dN/dlogD). */
  angular: Map<number, { back: Float64Array; seenTotal: Float64Array; seenBack: Float64Array }>
  quadrature: TruncationQuadrature | null
}

/** The wavelengths whose angular kernels instrumentKernels makes (scattering or backscattering), and their geometry; none without a truncation correction or backscattering. */
function angularPlan(plan: ComparisonPlan): { wavelengthsNm: number[]; geometry: NephelometerGeometry } | null {
  if (plan.truncation === null && planWavelengths(plan, 'backscattering').length === 0) return null
  const wavelengthsNm = [...new Set([...planWavelengths(plan, 'scattering'), ...planWavelengths(plan, 'backscattering')])].sort((a, b) => a - b)
  return { wavelengthsNm, geometry: plan.truncation ?? { lowDeg: DEFAULT_NEPHELOMETER_ANGLES[0], highDeg: DEFAULT_NEPHELOMETER_ANGLES[1] } }
}

/**
 * Per-bin kernels of everything the comparison needs, for a sample's composition and humidity on a bin layout.
 * `integrated`: the figures of an earlier call with the same inputs (packInstrumentKernels; a cache kept between
 * runs, keyed by instrumentKernelsInputs), taken instead of integrating: the same kernels to the bit.
 */
export function instrumentKernels(
  sample: Pick<Sample, 'name' | 'composition' | 'rh_percent' | 'rh_history' | 'temperature_k'>,
  study: Pick<Study, 'user_materials'>,
  layout: BinLayout,
  plan: ComparisonPlan,
  options: { tolerance?: number; workspace?: OpticsWorkspace; integrated?: Float64Array } = {}
): InstrumentKernels {
  const ws = options.workspace ?? new OpticsWorkspace()
  const wavelengths = instrumentWavelengths(plan)
  const given = options.integrated
  const n = binCount(layout)
  if (given && given.length !== instrumentKernelsLength(layout, plan)) throw new Error(`integrated instrument kernels of ${given.length} values given where ${instrumentKernelsLength(layout, plan)} are needed`)
  const baseLength = binKernelsLength(layout, wavelengths.length)
  const base = binOpticsKernels(sample, { user_materials: study.user_materials, wavelengths_nm: wavelengths }, layout, { tolerance: options.tolerance, workspace: ws, integrated: given?.subarray(0, baseLength) })
  const angular: InstrumentKernels['angular'] = new Map()
  const ap = angularPlan(plan)
  if (!ap) return { layout, base, angular, quadrature: null }
  const q = truncationQuadrature(ap.geometry)
  if (given) {
    ap.wavelengthsNm.forEach((wl, k) => {
      const at = baseLength + 3 * n * k
      angular.set(wl, { back: given.slice(at, at + n), seenTotal: given.slice(at + n, at + 2 * n), seenBack: given.slice(at + 2 * n, at + 3 * n) })
    })
    return { layout, base, angular, quadrature: q }
  }
  const kind = resolveComposition(sample.composition, studyMaterials({ user_materials: study.user_materials, wavelengths_nm: wavelengths }), `sample "${sample.name}"`)
  const cond: Conditions = { rhPercent: sample.rh_percent, history: sample.rh_history, temperatureK: sample.temperature_k ?? 298.15 }
  const edges = base.edgesUm
  const unit = () => 1 / Math.LN10 // dN/dlnD for dN/dlogD = 1
  for (const wl of ap.wavelengthsNm) {
    const j = base.wavelengthsNm.indexOf(wl)
    const back = new Float64Array(n)
    const seenTotal = new Float64Array(n)
    const seenBack = new Float64Array(n)
    for (let i = 0; i < n; i++) {
      const pop = { label: `bin ${i + 1}`, kind, segments: [{ lo: Math.log(edges[i]), hi: Math.log(edges[i + 1]), flat: true, density: unit }] }
      const r = bulkOpticsAt([pop], wl / 1000, cond, { tolerance: options.tolerance, anglesDeg: q.anglesDeg }, ws)
      const p = r.phase!
      let tt = 0
      let tm = 0
      let bt = 0
      let bm = 0
      for (let a = 0; a < p.length; a++) {
        tt += q.totalTrue[a] * p[a]
        tm += q.totalMeasured[a] * p[a]
        bt += q.backTrue[a] * p[a]
        bm += q.backMeasured[a] * p[a]
      }
      // fractions of the bin's own phase function on the same nodes (their sampling error cancels), times σsca
      const s = tt > 0 ? base.sca[j][i] / tt : 0
      back[i] = s * bt
      seenTotal[i] = s * tm
      seenBack[i] = s * bm
    }
    angular.set(wl, { back, seenTotal, seenBack })
  }
  return { layout, base, angular, quadrature: q }
}

/** How many figures packInstrumentKernels gives for a layout and plan. */
export function instrumentKernelsLength(layout: BinLayout, plan: ComparisonPlan): number {
  return binKernelsLength(layout, instrumentWavelengths(plan).length) + 3 * binCount(layout) * (angularPlan(plan)?.wavelengthsNm.length ?? 0)
}

/** The kernels' integrated figures in one array (the bins' kernels as packBinKernels, then each angular wavelength's three), as instrumentKernels takes them back. */
export function packInstrumentKernels(k: InstrumentKernels): Float64Array {
  const base = packBinKernels(k.base)
  const n = k.base.edgesUm.length - 1
  const wls = [...k.angular.keys()].sort((a, b) => a - b)
  const packed = new Float64Array(base.length + 3 * n * wls.length)
  packed.set(base)
  wls.forEach((wl, i) => {
    const a = k.angular.get(wl)!
    const at = base.length + 3 * n * i
    packed.set(a.back, at)
    packed.set(a.seenTotal, at + n)
    packed.set(a.seenBack, at + 2 * n)
  })
  return packed
}

/** Everything instrumentKernels' figures depend on besides the code (binKernelsInputs at the instruments' wavelengths, and the angular wavelengths and geometry): equal texts, equal figures. */
export function instrumentKernelsInputs(sample: Pick<Sample, 'composition' | 'rh_percent' | 'rh_history' | 'temperature_k'>, study: Pick<Study, 'user_materials'>, layout: BinLayout, plan: ComparisonPlan, tolerance: number | undefined): string {
  const ap = angularPlan(plan)
  const bins = binKernelsInputs(sample, { user_materials: study.user_materials, wavelengths_nm: instrumentWavelengths(plan) }, layout, tolerance)
  return JSON.stringify({ instrument_kernels: 1, angular: ap ? { wavelengths_nm: ap.wavelengthsNm, low_deg: ap.geometry.lowDeg, high_deg: ap.geometry.highDeg } : null, bins })
}

/** Column names of the comparison, in the order `RowComparer.compare` fills them. */
export function comparisonColumns(plan: ComparisonPlan): string[] {
  const cols: string[] = []
  const trunc = plan.truncation !== null
  for (const w of planWavelengths(plan, 'scattering')) {
    cols.push(`sca_meas_${w}nm_Mm-1`)
    if (trunc) cols.push(`truncation_C_${w}nm`, `sca_meas_corr_${w}nm_Mm-1`)
    cols.push(`sca_ratio_${w}nm`)
  }
  for (const w of planWavelengths(plan, 'backscattering')) {
    cols.push(`bsca_${w}nm_Mm-1`, `bsca_meas_${w}nm_Mm-1`)
    if (trunc) cols.push(`truncation_Cback_${w}nm`, `bsca_meas_corr_${w}nm_Mm-1`)
    cols.push(`bsca_ratio_${w}nm`)
  }
  for (const w of planWavelengths(plan, 'absorption')) cols.push(`abs_meas_${w}nm_Mm-1`, `abs_ratio_${w}nm`)
  if (planWavelengths(plan, 'absorption').length > 0) for (const w of planWavelengths(plan, 'scattering')) cols.push(`ssa_meas_${w}nm`)
  if (plan.closure) cols.push('closure_n', 'closure_n_sd', 'closure_k', 'closure_k_sd', 'closure_chi2', 'closure_unique')
  return cols
}

/** Absorption at λ from the positive measured values (wavelengths ascending) by their own Ångström exponent; NaN if none. */
export function absorptionAt(lambdaNm: number, wavelengthsNm: readonly number[], values: ArrayLike<number>): number {
  const wl: number[] = []
  const v: number[] = []
  for (let i = 0; i < wavelengthsNm.length; i++) {
    if (values[i] > 0) {
      wl.push(wavelengthsNm[i])
      v.push(values[i])
    }
  }
  if (wl.length === 0) return NaN
  const exact = wl.indexOf(lambdaNm)
  if (exact >= 0) return v[exact]
  if (wl.length === 1) return v[0] * Math.pow(lambdaNm / wl[0], -ASSUMED_ABSORPTION_ANGSTROM)
  // the bracketing pair, or the two nearest at the end the wavelength lies beyond
  let i = 0
  while (i < wl.length - 2 && wl[i + 1] < lambdaNm) i++
  const aae = -Math.log(v[i + 1] / v[i]) / Math.log(wl[i + 1] / wl[i])
  return v[i] * Math.pow(lambdaNm / wl[i], -aae)
}

/** Fills one row's comparison cells (NaN: empty) from its distribution and its measured means. */
export class RowComparer {
  readonly columns: string[]
  private readonly sca: { wl: number; ch: number; j: number }[]
  private readonly back: { wl: number; ch: number }[]
  private readonly abs: { wl: number; ch: number; j: number }[]
  private readonly absWl: number[]
  private readonly absVals: Float64Array
  private readonly corrSca: Float64Array
  /** The row's dN/dlogD, as binsFromMeasurement gives it (refusing what it refuses), without its per-row set-up. */
  private readonly toDn: (values: ArrayLike<number>, at: number) => Float64Array

  constructor(
    private readonly kernels: InstrumentKernels,
    private readonly plan: ComparisonPlan
  ) {
    this.columns = comparisonColumns(plan)
    const ch = (q: OpticalQuantity, w: number) => plan.channels.findIndex((c) => c.quantity === q && c.wavelengthNm === w)
    const j = (w: number) => kernels.base.wavelengthsNm.indexOf(w)
    this.sca = planWavelengths(plan, 'scattering').map((w) => ({ wl: w, ch: ch('scattering', w), j: j(w) }))
    this.back = planWavelengths(plan, 'backscattering').map((w) => ({ wl: w, ch: ch('backscattering', w) }))
    this.absWl = planWavelengths(plan, 'absorption')
    this.abs = this.absWl.map((w) => ({ wl: w, ch: ch('absorption', w), j: j(w) }))
    this.absVals = new Float64Array(this.abs.length)
    this.corrSca = new Float64Array(this.sca.length)
    this.toDn = rowDNdlogD(kernels.base.edgesUm, kernels.layout, kernels.base.kind.densityGcm3)
  }

  /**
   * values: the row's bins as the sizer gives them (layout's quantity); measured: one mean per plan channel (NaN:
   * no data). Throws InputError for a distribution the optics cannot use (as the series row itself does).
   */
  compare(values: ArrayLike<number>, measured: ArrayLike<number>, out: Float64Array): Float64Array {
    const k = this.kernels
    // dN/dlogD of the row (refused as the series row refuses it: negative or non-finite values)
    const v = this.toDn(values, 0)
    const trunc = this.plan.truncation !== null
    let o = 0
    const ratio = (calc: number, meas: number) => (meas > 0 && Number.isFinite(calc) ? calc / meas : NaN)
    const dot = (a: Float64Array) => {
      let s = 0
      for (let i = 0; i < v.length; i++) s += v[i] * a[i]
      return s
    }
    this.sca.forEach((s, i) => {
      const calc = dot(k.base.sca[s.j])
      const meas = measured[s.ch]
      out[o++] = meas
      let corr = meas
      if (trunc) {
        const ang = k.angular.get(s.wl)!
        const seen = dot(ang.seenTotal)
        const c = seen > 0 ? calc / seen : NaN
        corr = meas * c
        out[o++] = c
        out[o++] = corr
      }
      this.corrSca[i] = corr
      out[o++] = ratio(calc, corr)
    })
    for (const b of this.back) {
      const ang = k.angular.get(b.wl)!
      const calc = dot(ang.back)
      const meas = measured[b.ch]
      out[o++] = calc
      out[o++] = meas
      let corr = meas
      if (trunc) {
        const seen = dot(ang.seenBack)
        const c = seen > 0 ? calc / seen : NaN
        corr = meas * c
        out[o++] = c
        out[o++] = corr
      }
      out[o++] = ratio(calc, corr)
    }
    this.abs.forEach((a, i) => {
      const meas = measured[a.ch]
      this.absVals[i] = meas
      out[o++] = meas
      out[o++] = ratio(dot(k.base.abs[a.j]), meas)
    })
    if (this.abs.length > 0) {
      this.sca.forEach((s, i) => {
        const sca = this.corrSca[i]
        const abs = absorptionAt(s.wl, this.absWl, this.absVals)
        out[o++] = sca > 0 && abs > 0 ? sca / (sca + abs) : NaN
      })
    }
    if (this.plan.closure) {
      const c = this.closure(values)
      for (const x of c) out[o++] = x
    }
    return out
  }

  private closure(values: ArrayLike<number>): number[] {
    const none = [NaN, NaN, NaN, NaN, NaN, NaN]
    const { scatteringSd, absorptionSd } = this.plan.closure!
    const scattering = this.sca.map((s, i) => ({ wavelength_nm: s.wl, value: this.corrSca[i], sd: scatteringSd * this.corrSca[i] })).filter((m) => m.value > 0)
    const absorption = this.abs.map((a, i) => ({ wavelength_nm: a.wl, value: this.absVals[i], sd: absorptionSd * this.absVals[i] })).filter((m) => m.value > 0)
    if (scattering.length + absorption.length === 0) return none
    const l = this.kernels.layout
    try {
      const r = retrieveRefractiveIndex({
        size: { kind: 'bins', bins: { diameters: l.diameters.slice(), diameter_unit: l.diameter_unit, edges: l.edges, quantity: l.quantity, values: Array.from(values) } },
        density_g_cm3: this.kernels.base.kind.densityGcm3,
        scattering,
        absorption
      })
      const b = r.best
      return [b.n, b.sd_n ?? NaN, b.k, b.sd_k ?? NaN, b.chi2, r.unique ? 1 : 0]
    } catch (e) {
      if (e instanceof InputError) return none
      throw e
    }
  }
}

