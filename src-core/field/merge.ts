/**
 * Several sizers merged into one size distribution in volume-equivalent diameter.
 *
 * 1. Each sizer's bin edges become volume-equivalent (diameters.ts). Each bin keeps its particles, so its
 *    dN/dlog d_ve = dN/dlog d_native · Δlog d_native / Δlog d_ve (the Jacobian of the change of variable,
 *    taken over the bin). Inside a bin the number is taken as flat in log d_ve (BIN_SHAPE in sizes/bins.ts).
 * 2. Each sizer is trusted over a range of its own diameters (by default all its bins), converted the same way.
 * 3. The merged bins are log-spaced (`binsPerDecade`, default 32) from the lowest trusted diameter to the
 *    highest. A sizer's value in a merged bin is its mean dN/dlog d_ve over the part of the bin it covers.
 * 4. The overlap rule (OVERLAP_RULE): outside overlaps a bin takes the one sizer that covers it. Where two
 *    sizers' trusted ranges overlap, from a to b in log d_ve, the lower one's weight falls linearly in log d_ve
 *    from 1 at a to 0 at b and the upper one's rises from 0 to 1 (a smooth hand-over); the weights are taken at
 *    the merged bin's middle, and where three ranges meet they are normalised to sum 1. A sizer with no data
 *    at a time step drops out and the others' weights are normalised again; a bin no sizer with data covers
 *    has no value (NaN here; written empty), never filled.
 * 5. The effective density can be fitted (fitDensity) so that the mobility and aerodynamic sizers agree best
 *    in their overlap (Khlystov, Stanier & Pandis 2004, Aerosol Sci. Technol. 38(S1):229).
 */
import { InputError } from '../errors.ts'
import { volumeEquivalentEdges, type ConversionSettings, type SizerKind } from './diameters.ts'

export const OVERLAP_RULE =
  'Each sizer is trusted inside its own range. Where two ranges overlap the weights hand over linearly in log d_ve across the overlap (the lower sizer from 1 to 0 and the upper from 0 to 1 at each bin middle). A sizer without data at a step drops out and the others are renormalised. A bin that no sizer with data covers is left empty.'

/** One sizer, its bins in its own diameter. */
export interface SizerInput {
  kind: SizerKind
  /** For messages and the output's metadata (e.g. the file name). */
  label: string
  /** Native bin edges, µm, ascending (n + 1). */
  edgesUm: ArrayLike<number>
  /** The native diameters (µm) inside which the sizer is trusted; default: all its bins. */
  rangeUm?: readonly [number, number]
}

export interface MergeSettings extends ConversionSettings {
  /** Merged bins per decade of d_ve (default 32). */
  binsPerDecade?: number
}

export interface PlannedSizer {
  kind: SizerKind
  label: string
  /** Volume-equivalent edges, µm. */
  edgesVe: Float64Array
  /** Δlog native / Δlog d_ve per bin: multiplies dN/dlog d_native into dN/dlog d_ve. */
  jacobian: Float64Array
  /** The trusted range in d_ve, µm. */
  rangeVe: [number, number]
  flagged: { bin: number; reason: string }[]
  /** Hand-over weight in each merged bin (0 where it is not trusted). */
  weight: Float64Array
  /** Sparse overlaps with the merged bins: for merged bin k, entries mapStart[k]..mapStart[k+1]−1 of (mapSrc, mapLen). */
  mapStart: Int32Array
  mapSrc: Int32Array
  /** log10 length of each overlap. */
  mapLen: Float64Array
}

export interface MergePlan {
  /** Merged bin edges, volume-equivalent diameter, µm. */
  edges: Float64Array
  /** In the order given. */
  sizers: PlannedSizer[]
  overlaps: { lower: string; upper: string; fromUm: number; toUm: number }[]
}

/** Overlaps of the bins [e_j, e_j+1] ∩ [lo, hi] with the target bins, as log10 lengths. */
function overlapMap(src: Float64Array, lo: number, hi: number, target: Float64Array) {
  const n = target.length - 1
  const start = new Int32Array(n + 1)
  const srcIdx: number[] = []
  const len: number[] = []
  let j = 0
  for (let k = 0; k < n; k++) {
    start[k] = srcIdx.length
    const a = Math.max(target[k], lo)
    const b = Math.min(target[k + 1], hi)
    if (!(b > a)) continue
    while (j > 0 && src[j] > a) j--
    for (; j < src.length - 1; j++) {
      if (src[j] >= b) break
      const l = Math.max(a, src[j])
      const h = Math.min(b, src[j + 1])
      if (h > l) {
        srcIdx.push(j)
        len.push(Math.log10(h / l))
      }
    }
  }
  start[n] = srcIdx.length
  return { start, src: Int32Array.from(srcIdx), len: Float64Array.from(len) }
}

function fmtUm(d: number): string {
  return d < 1 ? `${Number((d * 1000).toPrecision(4))} nm` : `${Number(d.toPrecision(4))} µm`
}

/** Converts every sizer's bins, sets the merged bins and the hand-over weights. Throws InputError (located) for bad settings. */
export function planMerge(inputs: readonly SizerInput[], settings: MergeSettings): MergePlan {
  if (inputs.length === 0) throw new InputError('merge', 'no sizer given', 'Give at least one sizer file (--mobility, --aerodynamic or --optical).')
  const bpd = settings.binsPerDecade ?? 32
  if (!(Number.isInteger(bpd) && bpd >= 4 && bpd <= 256)) throw new InputError('merge: bins per decade', `${bpd} is not a whole number from 4 to 256`, 'Give e.g. 32.')
  const converted = inputs.map((inp) => {
    const e = inp.edgesUm
    if (e.length < 2) throw new InputError(`${inp.label}`, 'fewer than two bin edges', 'Give a sizer file with at least one bin.')
    const conv = volumeEquivalentEdges(inp.kind, e, settings, inp.label)
    const n = e.length - 1
    const jacobian = new Float64Array(n)
    for (let j = 0; j < n; j++) jacobian[j] = Math.log(e[j + 1] / e[j]) / Math.log(conv.edges[j + 1] / conv.edges[j])
    let lo = conv.edges[0]
    let hi = conv.edges[n]
    if (inp.rangeUm) {
      const [a, b] = inp.rangeUm
      if (!(a > 0 && b > a)) throw new InputError(`${inp.label}: range`, `${a}–${b} µm is not a range of diameters`, 'Give the lower and upper diameter, lower first, e.g. 10nm:500nm.')
      if (!(b > e[0] && a < e[n])) throw new InputError(`${inp.label}: range`, `${fmtUm(a)}–${fmtUm(b)} lies outside its bins (${fmtUm(e[0])}–${fmtUm(e[n])})`, 'Give a range inside the bins of the file.')
      // map the native range through the bins' own conversion (log-linear inside a bin)
      const mapOne = (d: number): number => {
        if (d <= e[0]) return conv.edges[0]
        if (d >= e[n]) return conv.edges[n]
        let j = 0
        while (e[j + 1] < d) j++
        const f = Math.log(d / e[j]) / Math.log(e[j + 1] / e[j])
        return conv.edges[j] * Math.pow(conv.edges[j + 1] / conv.edges[j], f)
      }
      lo = mapOne(a)
      hi = mapOne(b)
    }
    return { inp, conv, jacobian, lo, hi }
  })
  // the order of the trusted ranges; no range may lie inside another
  const order = converted.map((_, i) => i).sort((a, b) => converted[a].lo - converted[b].lo)
  for (let q = 0; q + 1 < order.length; q++) {
    const p = converted[order[q]]
    const s = converted[order[q + 1]]
    if (!(s.hi > p.hi) || s.lo === p.lo) {
      const [inner, outer] = s.hi <= p.hi ? [s, p] : [p, s]
      throw new InputError(
        `${inner.inp.label}: range`,
        `its trusted range (${fmtUm(inner.lo)}–${fmtUm(inner.hi)} volume-equivalent) lies inside that of ${outer.inp.label} (${fmtUm(outer.lo)}–${fmtUm(outer.hi)})`,
        `Narrow one of them with --${outer.inp.kind}-range or --${inner.inp.kind}-range so that each sizer has a part of the size range of its own.`
      )
    }
    if (s.lo > p.hi) {
      throw new InputError(
        'merge: size range',
        `no sizer covers ${fmtUm(p.hi)} to ${fmtUm(s.lo)} (volume-equivalent) between ${p.inp.label} and ${s.inp.label}: the merged distribution would have a hole`,
        `Widen the trusted ranges (--${p.inp.kind}-range, --${s.inp.kind}-range) or check --density and --shape-factor.`
      )
    }
  }
  const lo = converted[order[0]].lo
  const hi = Math.max(...converted.map((c) => c.hi))
  const nBins = Math.max(1, Math.round(Math.log10(hi / lo) * bpd))
  const edges = new Float64Array(nBins + 1)
  for (let k = 0; k <= nBins; k++) edges[k] = lo * Math.pow(hi / lo, k / nBins)
  edges[nBins] = hi

  const overlaps: MergePlan['overlaps'] = []
  const ramps = converted.map(() => new Float64Array(nBins))
  order.forEach((i, q) => {
    const c = converted[i]
    const prev = q > 0 ? converted[order[q - 1]] : undefined
    const next = q + 1 < order.length ? converted[order[q + 1]] : undefined
    for (let k = 0; k < nBins; k++) {
      const x = Math.sqrt(edges[k] * edges[k + 1])
      if (!(edges[k + 1] > c.lo && edges[k] < c.hi)) continue
      let r = 1
      if (prev && prev.hi > c.lo) r *= clamp01(Math.log(x / c.lo) / Math.log(prev.hi / c.lo))
      if (next && c.hi > next.lo) r *= clamp01(Math.log(c.hi / x) / Math.log(c.hi / next.lo))
      ramps[i][k] = r
    }
    if (next && c.hi > next.lo) overlaps.push({ lower: c.inp.label, upper: next.inp.label, fromUm: next.lo, toUm: c.hi })
  })
  const sizers: PlannedSizer[] = converted.map((c, i) => {
    const map = overlapMap(c.conv.edges, c.lo, c.hi, edges)
    return {
      kind: c.inp.kind,
      label: c.inp.label,
      edgesVe: c.conv.edges,
      jacobian: c.jacobian,
      rangeVe: [c.lo, c.hi],
      flagged: c.conv.flagged,
      weight: ramps[i],
      mapStart: map.start,
      mapSrc: map.src,
      mapLen: map.len
    }
  })
  return { edges, sizers, overlaps }
}

function clamp01(v: number): number {
  return v < 0 ? 0 : v > 1 ? 1 : v
}

/** A sizer's mean dN/dlog d_ve over the part of merged bin k it covers (its native dN/dlog d values), or NaN if none. */
export function sizerValueInBin(s: PlannedSizer, k: number, values: ArrayLike<number>): number {
  let num = 0
  let den = 0
  for (let e = s.mapStart[k]; e < s.mapStart[k + 1]; e++) {
    const j = s.mapSrc[e]
    num += values[j] * s.jacobian[j] * s.mapLen[e]
    den += s.mapLen[e]
  }
  return den > 0 ? num / den : NaN
}

/**
 * One merged distribution: `values[i]` is sizer i's dN/dlog d (its own diameter, one value per bin, cm⁻³) at
 * this time step, or undefined when it has no data. Writes dN/dlog d_ve into `out` (one per merged bin; NaN
 * where no sizer with data covers the bin) and returns the number of such empty bins.
 */
export function mergeStep(plan: MergePlan, values: readonly (ArrayLike<number> | undefined)[], out: Float64Array): number {
  const n = plan.edges.length - 1
  let empty = 0
  for (let k = 0; k < n; k++) {
    let num = 0
    let den = 0
    let anyCover = false
    let coverNum = 0
    let coverDen = 0
    for (let i = 0; i < plan.sizers.length; i++) {
      const v = values[i]
      if (!v) continue
      const s = plan.sizers[i]
      if (s.mapStart[k + 1] === s.mapStart[k]) continue
      const x = sizerValueInBin(s, k, v)
      anyCover = true
      coverNum += x
      coverDen += 1
      const w = s.weight[k]
      num += w * x
      den += w
    }
    if (den > 0) out[k] = num / den
    else if (anyCover) out[k] = coverNum / coverDen // bins at a hand-over's end where the weights vanish at the bin middle
    else {
      out[k] = NaN
      empty++
    }
  }
  return empty
}

export interface DensityFit {
  /** The fitted particle density, g cm⁻³ (the effective density when χ = 1). */
  density: number
  /** Root-mean-square of ln(aerodynamic / mobility) dN/dlog d_ve over the overlap's sub-bins and the time steps. */
  misfit: number
  /** Pairs of values compared at the optimum. */
  compared: number
  /** The overlap at the optimum, d_ve µm. */
  overlapUm: [number, number]
  /** The best density lies at an end of the searched range: the true one may lie beyond it. */
  atBound: boolean
  /** The misfit over the scanned densities (Infinity where the ranges do not overlap). */
  scan: { density: number; misfit: number }[]
}

/** Sub-bins of the overlap in which the two sizers are compared. */
const FIT_SUB_BINS = 12

/**
 * The particle density that makes the aerodynamic sizer agree best with the mobility sizer in their overlap
 * (after Khlystov, Stanier & Pandis 2004): minimises the RMS of ln(dN/dlog d_ve aerodynamic / mobility) over
 * FIT_SUB_BINS log-spaced sub-bins of the overlap, over every step in `steps` where both have data (pairs with
 * a zero on either side are not compared). A scan of ln ρ over [min, max] (default 0.5–5 g cm⁻³), then golden-
 * section refinement around the best point. `steps[t] = [mobility values, aerodynamic values]`, each the sizer's
 * dN/dlog d in its own diameter.
 */
export function fitDensity(
  mobility: SizerInput,
  aerodynamic: SizerInput,
  steps: readonly (readonly [ArrayLike<number> | undefined, ArrayLike<number> | undefined])[],
  settings: Omit<ConversionSettings, 'density' | 'optical'>,
  bounds: { min?: number; max?: number } = {}
): DensityFit {
  const min = bounds.min ?? 0.5
  const max = bounds.max ?? 5
  if (!(min > 0 && max > min)) throw new InputError('density fit: bounds', `${min} to ${max} g cm⁻³ is not a range of densities`, 'Give 0 < min < max, e.g. 0.5 and 5.')
  const both = steps.filter((s) => s[0] && s[1]) as unknown as [ArrayLike<number>, ArrayLike<number>][]
  if (both.length === 0) throw new InputError('density fit', 'no time step has data from both the mobility and the aerodynamic sizer', 'Check that the two files cover the same period (and the same time zone).')
  const mob = planMerge([mobility], { ...settings }).sizers[0]
  const evaluate = (rho: number): { misfit: number; compared: number; overlap: [number, number] } => {
    const aer = planMerge([aerodynamic], { ...settings, density: rho }).sizers[0]
    const lo = Math.max(mob.rangeVe[0], aer.rangeVe[0])
    const hi = Math.min(mob.rangeVe[1], aer.rangeVe[1])
    if (!(Math.log10(hi / lo) > 0.02)) return { misfit: Infinity, compared: 0, overlap: [lo, hi] }
    const sub = new Float64Array(FIT_SUB_BINS + 1)
    for (let k = 0; k <= FIT_SUB_BINS; k++) sub[k] = lo * Math.pow(hi / lo, k / FIT_SUB_BINS)
    const mm = overlapMap(mob.edgesVe, mob.rangeVe[0], mob.rangeVe[1], sub)
    const ma = overlapMap(aer.edgesVe, aer.rangeVe[0], aer.rangeVe[1], sub)
    const subM = { ...mob, mapStart: mm.start, mapSrc: mm.src, mapLen: mm.len }
    const subA = { ...aer, mapStart: ma.start, mapSrc: ma.src, mapLen: ma.len }
    let sum = 0
    let count = 0
    for (const [vm, va] of both) {
      for (let k = 0; k < FIT_SUB_BINS; k++) {
        const a = sizerValueInBin(subA, k, va)
        const m = sizerValueInBin(subM, k, vm)
        if (a > 0 && m > 0) {
          const r = Math.log(a / m)
          sum += r * r
          count++
        }
      }
    }
    return { misfit: count > 0 ? Math.sqrt(sum / count) : Infinity, compared: count, overlap: [lo, hi] }
  }
  const scan: DensityFit['scan'] = []
  const N = 46
  let best = -1
  for (let i = 0; i < N; i++) {
    const rho = min * Math.pow(max / min, i / (N - 1))
    const m = evaluate(rho).misfit
    scan.push({ density: rho, misfit: m })
    if (Number.isFinite(m) && (best < 0 || m < scan[best].misfit)) best = i
  }
  if (best < 0) {
    throw new InputError(
      'density fit',
      `the trusted ranges of ${mobility.label} and ${aerodynamic.label} do not overlap for any density from ${min} to ${max} g cm⁻³`,
      'Widen the trusted ranges (--mobility-range, --aerodynamic-range), or give --density instead of fitting it.'
    )
  }
  // golden-section search in ln ρ between the neighbours of the best scanned point
  let a = Math.log(scan[Math.max(0, best - 1)].density)
  let b = Math.log(scan[Math.min(N - 1, best + 1)].density)
  const g = (Math.sqrt(5) - 1) / 2
  let c = b - g * (b - a)
  let d = a + g * (b - a)
  let fc = evaluate(Math.exp(c)).misfit
  let fd = evaluate(Math.exp(d)).misfit
  for (let it = 0; it < 50 && b - a > 1e-6; it++) {
    if (fc <= fd) {
      b = d
      d = c
      fd = fc
      c = b - g * (b - a)
      fc = evaluate(Math.exp(c)).misfit
    } else {
      a = c
      c = d
      fc = fd
      d = a + g * (b - a)
      fd = evaluate(Math.exp(d)).misfit
    }
  }
  let rho = Math.exp((a + b) / 2)
  let at = evaluate(rho)
  if (!(at.misfit <= scan[best].misfit)) {
    rho = scan[best].density
    at = evaluate(rho)
  }
  const atBound = rho <= min * 1.0001 || rho >= max / 1.0001 || best === 0 || best === N - 1
  return { density: rho, misfit: at.misfit, compared: at.compared, overlapUm: at.overlap, atBound, scan }
}
