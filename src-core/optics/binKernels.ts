/**
 * Optics of many distributions on the same bins, such as a sizer's time series: the bulk coefficients are
 * linear in the bins' dN/dlogD, so each bin's contribution per unit dN/dlogD is integrated once
 * (σ_i = ∫_bin C(D) dlog₁₀D) and every distribution is then a dot product. Exact for bins that are flat in
 * log D, the reading `binsFromMeasurement` gives them.
 */
import { binPowerIntegral, binsFromMeasurement, type SizeBins } from '../sizes/index.ts'
import type { BinsSpec, Sample, Study } from '../study/model.ts'
import { bulkOpticsAt } from './bulkOptics.ts'
import type { Conditions } from './integrate.ts'
import { OpticsWorkspace } from './workspace.ts'
import { resolveComposition, type ParticleKind } from './particles.ts'
import { studyMaterials } from './sample.ts'

export interface BinKernels {
  /** Bin edges, µm. */
  edgesUm: Float64Array
  wavelengthsNm: number[]
  /** Per wavelength, per bin: σext, σsca, σabs and g·σsca for dN/dlogD = 1 cm⁻³ in that bin alone (Mm⁻¹). */
  ext: Float64Array[]
  sca: Float64Array[]
  abs: Float64Array[]
  gsca: Float64Array[]
  /** Per bin, for dN/dlogD = 1: the number (∫ dlog₁₀D) and dry volume ((π/6) ∫ D³ dlog₁₀D) it holds. */
  numberWeights: Float64Array
  volumeWeights: Float64Array
  kind: ParticleKind
}

/** A sizer's bins without their values: the same for every row of a series. */
export type BinLayout = Omit<BinsSpec, 'values' | 'source'>

/** The number of bins of a layout: one fewer than its diameters when they are edges, as many when midpoints. */
export const binCount = (layout: Pick<BinLayout, 'diameters' | 'edges'>): number => (layout.edges ? layout.diameters.length - 1 : layout.diameters.length)

/** How many figures packBinKernels gives for a layout at `wavelengths` wavelengths (binOpticsKernels' `integrated`). */
export const binKernelsLength = (layout: Pick<BinLayout, 'diameters' | 'edges'>, wavelengths: number): number => 4 * binCount(layout) * wavelengths

/**
 * Per-bin optical kernels of a sample's composition and humidity on a bin layout, at the study's wavelengths.
 * `integrated`: the integrated figures of an earlier call with the same inputs (packBinKernels; a cache kept
 * between runs, keyed by binKernelsInputs), taken instead of integrating them again; the rest (edges, weights,
 * the composition) is made as always.
 */
export function binOpticsKernels(
  sample: Pick<Sample, 'name' | 'composition' | 'rh_percent' | 'rh_history' | 'temperature_k'>,
  study: Pick<Study, 'user_materials' | 'wavelengths_nm'>,
  layout: BinLayout,
  options: { tolerance?: number; workspace?: OpticsWorkspace; integrated?: Float64Array } = {}
): BinKernels {
  const count = binCount(layout)
  const edgesUm = binsFromMeasurement({
    diameters: layout.diameters,
    diameterKind: layout.edges ? 'edges' : 'midpoints',
    diameterUnit: layout.diameter_unit,
    quantity: 'dN/dlogDp',
    values: new Float64Array(Math.max(count, 0)).fill(1)
  }).edges
  const kind = resolveComposition(sample.composition, studyMaterials(study), `sample "${sample.name}"`)
  const cond: Conditions = { rhPercent: sample.rh_percent, history: sample.rh_history, temperatureK: sample.temperature_k ?? 298.15 }
  const edges = Float64Array.from(edgesUm)
  const n = edges.length - 1
  const numberWeights = new Float64Array(n)
  const volumeWeights = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    numberWeights[i] = binPowerIntegral(edges[i], edges[i + 1], 0)
    volumeWeights[i] = (Math.PI / 6) * binPowerIntegral(edges[i], edges[i + 1], 3)
  }
  const out: BinKernels = { edgesUm: edges, wavelengthsNm: [...study.wavelengths_nm], ext: [], sca: [], abs: [], gsca: [], numberWeights, volumeWeights, kind }
  const unit = () => 1 / Math.LN10 // dN/dlnD for dN/dlogD = 1
  const given = options.integrated
  const ws = given ? undefined : (options.workspace ?? new OpticsWorkspace())
  if (given && given.length !== binKernelsLength(layout, study.wavelengths_nm.length)) {
    throw new Error(`integrated figures of ${given.length} values given for ${n} bins at ${study.wavelengths_nm.length} wavelengths`)
  }
  for (const [j, wl] of study.wavelengths_nm.entries()) {
    if (given) {
      const at = 4 * n * j
      out.ext.push(given.slice(at, at + n))
      out.sca.push(given.slice(at + n, at + 2 * n))
      out.abs.push(given.slice(at + 2 * n, at + 3 * n))
      out.gsca.push(given.slice(at + 3 * n, at + 4 * n))
      continue
    }
    const ext = new Float64Array(n)
    const sca = new Float64Array(n)
    const abs = new Float64Array(n)
    const gsca = new Float64Array(n)
    for (let i = 0; i < n; i++) {
      const pop = { label: `bin ${i + 1}`, kind, segments: [{ lo: Math.log(edges[i]), hi: Math.log(edges[i + 1]), flat: true, density: unit }] }
      // the kernels hold σext, σsca, σabs and g·σsca only: no angular sums
      const r = bulkOpticsAt([pop], wl / 1000, cond, { tolerance: options.tolerance, upscatter: false }, ws!)
      ext[i] = r.ext
      sca[i] = r.sca
      abs[i] = r.abs
      gsca[i] = r.g * r.sca
    }
    out.ext.push(ext)
    out.sca.push(sca)
    out.abs.push(abs)
    out.gsca.push(gsca)
  }
  return out
}

/** The kernels' integrated figures in one array (per wavelength: σext, σsca, σabs, g·σsca of every bin), as binOpticsKernels takes them back. */
export function packBinKernels(k: Pick<BinKernels, 'ext' | 'sca' | 'abs' | 'gsca'>): Float64Array {
  const n = k.ext.length > 0 ? k.ext[0].length : 0
  const packed = new Float64Array(4 * n * k.ext.length)
  for (let j = 0; j < k.ext.length; j++) {
    const at = 4 * n * j
    packed.set(k.ext[j], at)
    packed.set(k.sca[j], at + n)
    packed.set(k.abs[j], at + 2 * n)
    packed.set(k.gsca[j], at + 3 * n)
  }
  return packed
}

/**
 * Everything the integrated figures of binOpticsKernels depend on besides the code (the sample's composition,
 * humidity, its history and temperature; the study's own materials; the wavelengths; the bins; the tolerance), as
 * one text with every object's keys sorted: equal texts, equal figures. The key of a cache of packBinKernels.
 */
export function binKernelsInputs(
  sample: Pick<Sample, 'composition' | 'rh_percent' | 'rh_history' | 'temperature_k'>,
  study: Pick<Study, 'user_materials' | 'wavelengths_nm'>,
  layout: BinLayout,
  tolerance: number | undefined
): string {
  return canonicalJson({
    composition: sample.composition,
    rh_percent: sample.rh_percent,
    rh_history: sample.rh_history,
    temperature_k: sample.temperature_k,
    user_materials: study.user_materials ?? [],
    wavelengths_nm: study.wavelengths_nm,
    layout: { diameters: layout.diameters, diameter_unit: layout.diameter_unit, edges: layout.edges },
    tolerance: tolerance ?? 'default'
  })
}

/** JSON with the keys of every object sorted (undefined members left out, as JSON.stringify leaves them). */
function canonicalJson(v: unknown): string {
  return JSON.stringify(v, (_key, value: unknown) => {
    if (ArrayBuffer.isView(value)) return Array.from(value as Float64Array)
    if (value === null || typeof value !== 'object' || Array.isArray(value)) return value
    const sorted: Record<string, unknown> = {}
    for (const k of Object.keys(value).sort()) sorted[k] = (value as Record<string, unknown>)[k]
    return sorted
  })
}

/** Bulk figures of one distribution on the kernels' bins. */
export interface BinnedRow {
  /** Per wavelength: σext, σsca, σabs (Mm⁻¹), ω and g (NaN for an empty distribution). */
  wavelengths: { wavelength_nm: number; ext: number; sca: number; abs: number; ssa: number; g: number }[]
  number_cm3: number
  volume_um3_cm3: number
  mass_ug_m3: number
}

/**
 * Applies kernels to one distribution given as the sizer gives it (values in `layout.quantity` on the same
 * bins). Throws InputError for values binsFromMeasurement refuses (negative, non-finite).
 */
export function opticsFromBinKernels(k: BinKernels, layout: BinLayout, values: ArrayLike<number>): BinnedRow {
  const bins: SizeBins = binsFromMeasurement({
    diameters: layout.diameters,
    diameterKind: layout.edges ? 'edges' : 'midpoints',
    diameterUnit: layout.diameter_unit,
    quantity: layout.quantity,
    values,
    density: k.kind.densityGcm3
  })
  const v = bins.dNdlogD
  const wavelengths = k.wavelengthsNm.map((wl, j) => {
    let ext = 0
    let sca = 0
    let abs = 0
    let gsca = 0
    const e = k.ext[j]
    const s = k.sca[j]
    const a = k.abs[j]
    const gs = k.gsca[j]
    for (let i = 0; i < v.length; i++) {
      ext += v[i] * e[i]
      sca += v[i] * s[i]
      abs += v[i] * a[i]
      gsca += v[i] * gs[i]
    }
    return { wavelength_nm: wl, ext, sca, abs, ssa: ext > 0 ? sca / ext : NaN, g: sca > 0 ? gsca / sca : NaN }
  })
  let number = 0
  let volume = 0
  for (let i = 0; i < v.length; i++) {
    number += v[i] * k.numberWeights[i]
    volume += v[i] * k.volumeWeights[i]
  }
  return { wavelengths, number_cm3: number, volume_um3_cm3: volume, mass_ug_m3: volume * k.kind.densityGcm3 }
}

/** Figures per row written by a BinnedRowEvaluator: per wavelength ext, sca, abs, ssa, g; then number, volume, mass. */
export function binnedRowWidth(k: Pick<BinKernels, 'wavelengthsNm'>): number {
  return 5 * k.wavelengthsNm.length + 3
}

/**
 * Writes one distribution's figures (the values of opticsFromBinKernels, in the order of binnedRowWidth) into
 * `out` at `outAt`, from `values[at .. at + bins)`. Allocates nothing: for long series, e.g. rows packed in one
 * Float64Array.
 */
export type BinnedRowEvaluator = (values: ArrayLike<number>, at: number, out: Float64Array, outAt: number) => void

/**
 * Turns rows of the layout's quantity into dN/dlogD as binsFromMeasurement does, with the same arithmetic (the same
 * numbers to the last bit): per-bin constants computed once with its expressions, then per value v, v / dlog or
 * (v · dlog) / (...). A row with a non-finite or negative value is handed to binsFromMeasurement, which throws its
 * InputError. Writes into and returns one array of its own (allocates nothing per row).
 */
export function rowDNdlogD(edgesUm: ArrayLike<number>, layout: BinLayout, density: number): (values: ArrayLike<number>, at: number) => Float64Array {
  const n = edgesUm.length - 1
  const e = edgesUm
  const mul = new Float64Array(n).fill(1)
  const div = new Float64Array(n).fill(1)
  const q = layout.quantity
  for (let i = 0; i < n; i++) {
    const dlog = binPowerIntegral(e[i], e[i + 1], 0)
    if (q === 'dN') div[i] = dlog
    else if (q === 'dS/dlogDp') (mul[i] = dlog), (div[i] = Math.PI * binPowerIntegral(e[i], e[i + 1], 2))
    else if (q === 'dV/dlogDp') (mul[i] = dlog), (div[i] = (Math.PI / 6) * binPowerIntegral(e[i], e[i + 1], 3))
    else if (q === 'dM/dlogDp') (mul[i] = dlog), (div[i] = density * (Math.PI / 6) * binPowerIntegral(e[i], e[i + 1], 3))
    else if (q !== 'dN/dlogDp') binsFromMeasurement({ diameters: layout.diameters, diameterKind: layout.edges ? 'edges' : 'midpoints', diameterUnit: layout.diameter_unit, quantity: q, values: new Float64Array(n), density })
  }
  const v = new Float64Array(n)
  return (values, at) => {
    for (let i = 0; i < n; i++) {
      const x = values[at + i]
      if (!(x >= 0 && x < Infinity)) {
        binsFromMeasurement({ diameters: layout.diameters, diameterKind: layout.edges ? 'edges' : 'midpoints', diameterUnit: layout.diameter_unit, quantity: q, values: Array.from({ length: n }, (_, j) => values[at + j]), density })
        throw new Error(`bin ${i + 1}: the value ${x} was refused without a reason`)
      }
      // the same expressions as binsFromMeasurement: v, v / dlog, (v · dlog) / (...)
      v[i] = q === 'dN/dlogDp' ? x : q === 'dN' ? x / div[i] : (x * mul[i]) / div[i]
    }
    return v
  }
}

/**
 * opticsFromBinKernels for many rows on the same layout, with the same arithmetic in the same order (the same
 * numbers to the last bit): the conversion to dN/dlogD is rowDNdlogD's, then the same dot products.
 */
export function binnedRowEvaluator(k: BinKernels, layout: BinLayout): BinnedRowEvaluator {
  const n = k.edgesUm.length - 1
  const density = k.kind.densityGcm3
  const toDn = rowDNdlogD(k.edgesUm, layout, density)
  const nw = k.wavelengthsNm.length
  return (values, at, out, outAt) => {
    const v = toDn(values, at)
    let o = outAt
    for (let j = 0; j < nw; j++) {
      let ext = 0
      let sca = 0
      let abs = 0
      let gsca = 0
      const ke = k.ext[j]
      const ks = k.sca[j]
      const ka = k.abs[j]
      const kg = k.gsca[j]
      for (let i = 0; i < n; i++) {
        ext += v[i] * ke[i]
        sca += v[i] * ks[i]
        abs += v[i] * ka[i]
        gsca += v[i] * kg[i]
      }
      out[o++] = ext
      out[o++] = sca
      out[o++] = abs
      out[o++] = ext > 0 ? sca / ext : NaN
      out[o++] = sca > 0 ? gsca / sca : NaN
    }
    let number = 0
    let volume = 0
    for (let i = 0; i < n; i++) {
      number += v[i] * k.numberWeights[i]
      volume += v[i] * k.volumeWeights[i]
    }
    out[o++] = number
    out[o++] = volume
    out[o] = volume * density
  }
}
