/**
 * Optical particle counter re-binning. A counter sizes each particle by the light it scatters into its
 * collection optics; its bin edges are calibrated with polystyrene latex spheres (PSL, m = 1.59 + 0i at a
 * visible laser wavelength; common practice). A particle of another index scattering the same power is
 * assigned the same bin, so each calibration edge D_c corresponds to the true diameter D with
 *   R(D, m_sample) = R(D_c, m_PSL),   R(D, m) = ∫_a^b S11(θ; x, m) sin θ dθ
 * for collection angles a..b around the beam (azimuth-symmetric cone or annulus; the common factors
 * λ²/(4π²)·2π cancel). S11 by Mie theory (Bohren & Huffman 1983, eq. 4.77).
 *
 * Where R is not monotonic in D (Mie resonances, for particles comparable with the wavelength) one response
 * belongs to several diameters: every candidate is returned and the edge flagged. The candidate reported as
 * `true_um` is then the one nearest (in ln D) to the calibration diameter.
 */
import { InputError } from '../errors.ts'
import { AngularTable, MieWorkspace, SPHERE_DOMAIN, sphereEfficiencies } from '../mie/index.ts'
import { gaussLegendreOn } from '../numeric/index.ts'

/** PSL's index for calibration (common practice: 1.59 + 0i at visible laser wavelengths). */
export const PSL_INDEX = { n: 1.59, k: 0 } as const

export interface OpcGeometry {
  /** Laser wavelength, nm (e.g. 633 for a helium–neon laser). */
  wavelengthNm: number
  /** Collection half-angles from the beam direction, degrees: light scattered between lowDeg and highDeg is collected. */
  lowDeg: number
  highDeg: number
  /** Index of the calibration spheres (default PSL_INDEX). */
  calibrationIndex?: { n: number; k: number }
}

/** Reusable state for response evaluations at one geometry. */
export class OpcResponder {
  readonly geometry: OpcGeometry
  private readonly table: AngularTable
  private readonly weights: Float64Array
  private readonly acc: Float64Array
  private readonly ws = new MieWorkspace()

  /** `maxSizeParameter`: the largest x to be asked for, which sets the number of angular nodes. */
  constructor(geometry: OpcGeometry, maxSizeParameter: number) {
    checkOpcGeometry(geometry)
    this.geometry = geometry
    const a = (geometry.lowDeg * Math.PI) / 180
    const b = (geometry.highDeg * Math.PI) / 180
    // S11 oscillates with a period of about π/x in θ: take some 6 nodes per period (at least 24).
    const n = Math.min(4000, Math.max(24, Math.ceil((6 * maxSizeParameter * (b - a)) / Math.PI)))
    // ∫_a^b S11 sin θ dθ = ∫_{cos b}^{cos a} S11 dμ
    const rule = gaussLegendreOn(n, Math.cos(b), Math.cos(a))
    this.table = new AngularTable(rule.nodes)
    this.weights = Float64Array.from(rule.weights)
    this.acc = new Float64Array(n)
  }

  /** R(D, m) for a diameter in µm. */
  response(diameterUm: number, n: number, k: number): number {
    const x = (Math.PI * diameterUm * 1000) / this.geometry.wavelengthNm
    if (!(x >= SPHERE_DOMAIN.sizeParameter.min && x <= SPHERE_DOMAIN.sizeParameter.max)) {
      throw new InputError('optical particle counter: diameter', `${diameterUm} µm gives a size parameter ${x} outside Mie's valid range`, 'Use bin edges from about 0.01 µm to a few hundred µm.')
    }
    sphereEfficiencies(x, n, k, this.ws)
    this.acc.fill(0)
    this.table.accumulate(this.ws, 1, this.acc, null)
    let s = 0
    for (let j = 0; j < this.acc.length; j++) s += this.weights[j] * this.acc[j]
    return s
  }
}

function checkOpcGeometry(g: OpcGeometry): void {
  if (!(g.wavelengthNm >= 200 && g.wavelengthNm <= 40000)) throw new InputError('optical particle counter: wavelength', `${g.wavelengthNm} nm is outside 200 to 40000 nm`, 'Give the laser wavelength in nm, e.g. 633.')
  if (!(g.lowDeg >= 0 && g.highDeg <= 180 && g.highDeg > g.lowDeg)) throw new InputError('optical particle counter: angles', `${g.lowDeg}° to ${g.highDeg}° is not a range inside 0° to 180°`, 'Give the collection angles, e.g. 35 to 120 degrees.')
  const c = g.calibrationIndex
  if (c && !(c.n > 0 && c.k >= 0)) throw new InputError('optical particle counter: calibration index', `${c.n}+${c.k}i is not a refractive index`, 'Give n > 0 and k ≥ 0, e.g. 1.59+0i for PSL.')
}

/** Response R(D, m) of a counter at each diameter (µm). */
export function opcResponseCurve(diametersUm: readonly number[], index: { n: number; k: number }, geometry: OpcGeometry): number[] {
  const xMax = (Math.PI * Math.max(...diametersUm) * 1000) / geometry.wavelengthNm
  const r = new OpcResponder(geometry, xMax)
  return diametersUm.map((d) => r.response(d, index.n, index.k))
}

export interface RebinnedEdge {
  calibration_um: number
  /** R at the edge: the calibration sphere's response, which the true diameter matches. */
  response: number
  /** The true diameter (unique candidate, or the one nearest the calibration diameter in ln D). */
  true_um: number
  /** Every diameter whose response for the sample's index equals the PSL response at the edge. */
  candidates_um: number[]
  /** Several PSL diameters give the edge's response (the calibration itself is ambiguous there). */
  calibration_candidates_um: number[]
  ambiguous: boolean
}

export interface RebinnedBin {
  calibration_lo_um: number
  calibration_hi_um: number
  true_lo_um: number
  true_hi_um: number
  /** The response of either index is not monotonic across the bin, or an edge is ambiguous. */
  flagged: boolean
  reasons: string[]
}

export interface RebinResult {
  wavelength_nm: number
  low_deg: number
  high_deg: number
  calibration_index: { n: number; k: number }
  sample_index: { n: number; k: number }
  edges: RebinnedEdge[]
  bins: RebinnedBin[]
  notes: string[]
  /** With `curve: true`: the response R(D) of the calibration and the sample index over the searched range. */
  response?: OpcResponseCurves
}

/** R(D) of both indices on one set of diameters (the search grid, thinned to at most CURVE_POINTS points). */
export interface OpcResponseCurves {
  diameter_um: number[]
  calibration: number[]
  sample: number[]
}

/** The most points a returned response curve keeps (enough to draw it; the search itself uses every grid point). */
export const CURVE_POINTS = 1500

export interface RebinOptions {
  /** True diameters are searched from min(edges)/f to max(edges)·f (default 4). */
  searchFactor?: number
  /** Also return the response curves of both indices (`response`), for a chart. */
  curve?: boolean
}

/** A response curve on a fine grid of diameters: Δx ≤ 0.05 and Δln D ≤ 0.01. */
function responseGrid(r: OpcResponder, lo: number, hi: number, m: { n: number; k: number }): { d: Float64Array; v: Float64Array } {
  const wl = r.geometry.wavelengthNm / 1000
  const ds: number[] = []
  let d = lo
  while (d < hi) {
    ds.push(d)
    const x = (Math.PI * d) / wl
    d *= Math.exp(Math.min(0.01, 0.05 / x))
  }
  ds.push(hi)
  const dArr = Float64Array.from(ds)
  const v = new Float64Array(dArr.length)
  for (let i = 0; i < dArr.length; i++) v[i] = r.response(dArr[i], m.n, m.k)
  return { d: dArr, v }
}

/** Every D on the grid's range with R(D) = target (bisection inside each bracketing interval). */
function solveAll(r: OpcResponder, grid: { d: Float64Array; v: Float64Array }, m: { n: number; k: number }, target: number): number[] {
  const out: number[] = []
  const { d, v } = grid
  for (let i = 0; i + 1 < d.length; i++) {
    const a = v[i] - target
    const b = v[i + 1] - target
    if (a === 0) {
      out.push(d[i])
      continue
    }
    if (a * b >= 0) continue
    let lo = d[i]
    let hi = d[i + 1]
    let flo = a
    for (let it = 0; it < 60 && hi - lo > 1e-10 * hi; it++) {
      const mid = Math.sqrt(lo * hi)
      const f = r.response(mid, m.n, m.k) - target
      if (f === 0) {
        lo = hi = mid
        break
      }
      if ((f < 0) === (flo < 0)) {
        lo = mid
        flo = f
      } else hi = mid
    }
    out.push(Math.sqrt(lo * hi))
  }
  if (v[d.length - 1] === target) out.push(d[d.length - 1])
  return out
}

function monotonicOver(grid: { d: Float64Array; v: Float64Array }, lo: number, hi: number): boolean {
  let dir = 0
  let prev = NaN
  for (let i = 0; i < grid.d.length; i++) {
    if (grid.d[i] < lo || grid.d[i] > hi) continue
    if (Number.isFinite(prev)) {
      const s = Math.sign(grid.v[i] - prev)
      if (s !== 0) {
        if (dir !== 0 && s !== dir) return false
        dir = s
      }
    }
    prev = grid.v[i]
  }
  return true
}

/**
 * Maps a counter's calibration bin edges (µm, ascending) to true diameters for particles of `sampleIndex`.
 */
export function rebinOpcEdges(edgesUm: readonly number[], sampleIndex: { n: number; k: number }, geometry: OpcGeometry, options: RebinOptions = {}): RebinResult {
  if (edgesUm.length < 2) throw new InputError('optical particle counter: edges', `${edgesUm.length} bin edges given`, 'Give at least two ascending bin edges in µm.')
  edgesUm.forEach((e, i) => {
    if (!(e > 0 && Number.isFinite(e)) || (i > 0 && !(e > edgesUm[i - 1]))) throw new InputError(`optical particle counter: edge ${i + 1}`, `${e} µm is not a positive diameter above the edge before it`, 'Give ascending bin edges in µm.')
  })
  if (!(sampleIndex.n > 0 && sampleIndex.k >= 0)) throw new InputError('optical particle counter: sample index', `${sampleIndex.n}+${sampleIndex.k}i is not a refractive index`, 'Give n > 0 and k ≥ 0.')
  const f = options.searchFactor ?? 4
  if (!(f > 1)) throw new InputError('optical particle counter: search factor', `${f} is not greater than 1`, 'Give a factor above 1, e.g. 4.')
  const cal = geometry.calibrationIndex ?? PSL_INDEX
  const lo = edgesUm[0] / f
  const hi = edgesUm[edgesUm.length - 1] * f
  const r = new OpcResponder(geometry, (Math.PI * hi * 1000) / geometry.wavelengthNm)
  const pslGrid = responseGrid(r, lo, hi, cal)
  const sampleGrid = responseGrid(r, lo, hi, sampleIndex)
  const edges: RebinnedEdge[] = edgesUm.map((dc) => {
    const target = r.response(dc, cal.n, cal.k)
    const candidates = solveAll(r, sampleGrid, sampleIndex, target)
    const calCandidates = solveAll(r, pslGrid, cal, target)
    if (!calCandidates.some((c) => Math.abs(c / dc - 1) < 1e-6)) calCandidates.push(dc)
    calCandidates.sort((a, b) => a - b)
    if (!candidates.length) {
      throw new InputError('optical particle counter: edges', `no diameter from ${lo.toPrecision(3)} to ${hi.toPrecision(3)} µm of index ${sampleIndex.n}+${sampleIndex.k}i scatters as much as a ${dc} µm calibration sphere`, 'Give a larger search factor, or check the index and the angles.')
    }
    const best = candidates.reduce((p, c) => (Math.abs(Math.log(c / dc)) < Math.abs(Math.log(p / dc)) ? c : p))
    return { calibration_um: dc, response: target, true_um: best, candidates_um: candidates, calibration_candidates_um: calCandidates, ambiguous: candidates.length > 1 || calCandidates.length > 1 }
  })
  const bins: RebinnedBin[] = []
  for (let i = 0; i + 1 < edges.length; i++) {
    const a = edges[i]
    const b = edges[i + 1]
    const reasons: string[] = []
    if (a.ambiguous || b.ambiguous) reasons.push('an edge has several candidate diameters')
    if (!monotonicOver(pslGrid, a.calibration_um, b.calibration_um)) reasons.push('the calibration response is not monotonic across the bin')
    if (!monotonicOver(sampleGrid, Math.min(a.true_um, b.true_um), Math.max(a.true_um, b.true_um))) reasons.push("the sample's response is not monotonic across the bin")
    if (!(b.true_um > a.true_um)) reasons.push('the true edges are not in increasing order')
    bins.push({ calibration_lo_um: a.calibration_um, calibration_hi_um: b.calibration_um, true_lo_um: a.true_um, true_hi_um: b.true_um, flagged: reasons.length > 0, reasons })
  }
  let response: OpcResponseCurves | undefined
  if (options.curve) {
    // both grids step by the same rule from the same diameter, so they share their diameters
    const n = Math.min(pslGrid.d.length, sampleGrid.d.length)
    const step = Math.max(1, Math.ceil(n / CURVE_POINTS))
    response = { diameter_um: [], calibration: [], sample: [] }
    for (let i = 0; i < n; i += step) {
      response.diameter_um.push(pslGrid.d[i])
      response.calibration.push(pslGrid.v[i])
      response.sample.push(sampleGrid.v[i])
    }
  }
  return {
    ...(response ? { response } : {}),
    wavelength_nm: geometry.wavelengthNm,
    low_deg: geometry.lowDeg,
    high_deg: geometry.highDeg,
    calibration_index: { n: cal.n, k: cal.k },
    sample_index: { n: sampleIndex.n, k: sampleIndex.k },
    edges,
    bins,
    notes: [
      `Response R(D) = ∫ S11 sin θ dθ over ${geometry.lowDeg}°–${geometry.highDeg}° (azimuth-symmetric collection) at ${geometry.wavelengthNm} nm, by Mie theory; homogeneous spheres.`,
      `True diameters searched from ${lo.toPrecision(3)} to ${hi.toPrecision(3)} µm; where several diameters give the edge's response, all are listed and the one nearest the calibration diameter is used.`
    ]
  }
}
