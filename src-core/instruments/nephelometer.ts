/**
 * Integrating-nephelometer truncation: the instrument sees scattering angles θ1..θ2 only (e.g. 7°–170°),
 * weighted by its angular sensitivity (ideally sin θ), so it misses the near-forward and near-backward
 * light. The correction factor is C = σ_true/σ_measured, for total scatter (0°–180° against θ1–θ2) and for
 * hemispheric backscatter (90°–180° against 90°–θ2), in the sense of Anderson & Ogren (1998), Aerosol Sci.
 * Technol. 29:57 (who tabulate C against the Ångström exponent for one instrument; here C comes from the
 * population's own phase function).
 *
 * Measured fraction (azimuthal symmetry, phase function p normalised to ∫ p dΩ = 4π):
 *   σ_meas/σ_true = ½ ∫_{θ1}^{θ2} p(θ) r(θ) sin θ dθ,   r(θ) = the response relative to sin θ (1 if ideal).
 * Both integrals are taken by Gauss–Legendre panels in θ, finer towards 0° where the diffraction peak sits,
 * with breakpoints at θ1, θ2 and 90°; the true integral uses the same nodes, so C → 1 exactly for the full range.
 */
import { InputError } from '../errors.ts'
import { gaussLegendre } from '../numeric/index.ts'
import { computeSampleOptics, studyMaterials } from '../optics/index.ts'
import type { Sample, Study } from '../study/model.ts'

/**
 * A non-ideal angular response, relative to sin θ (1 = ideal): a function of the angle in degrees, or a
 * table of angles (ascending, covering θ1..θ2) and weights, linearly interpolated.
 */
export type AngularResponse = ((thetaDeg: number) => number) | { angles_deg: number[]; weight: number[] }

export interface NephelometerGeometry {
  /** Lowest and highest scattering angle the instrument sees, degrees (e.g. 7 and 170). */
  lowDeg: number
  highDeg: number
  /** Angular sensitivity relative to sin θ; ideal when absent. */
  response?: AngularResponse
}

export interface TruncationQuadrature {
  anglesDeg: Float64Array
  /** Weights of ∫ p sin θ dθ over 0–180°, θ1–θ2 (with the response), 90–180° and 90°–θ2 (with the response). */
  totalTrue: Float64Array
  totalMeasured: Float64Array
  backTrue: Float64Array
  backMeasured: Float64Array
}

export interface TruncationCorrection {
  low_deg: number
  high_deg: number
  ideal_response: boolean
  /** C = σ_true/σ_measured for total scatter. */
  total: number
  /** C for hemispheric backscatter (90°–180° against 90°–θ2). */
  backscatter: number
  /** σ_measured/σ_true for total scatter and for backscatter (1/C). */
  measured_fraction_total: number
  measured_fraction_backscatter: number
  /** ½ ∫ p sin θ dθ over 0–180° on the nodes: 1 for a well-resolved, normalised phase function. */
  phase_normalisation: number
}

const GL8 = gaussLegendre(8)

function responseFunction(g: NephelometerGeometry): (deg: number) => number {
  const r = g.response
  if (!r) return () => 1
  if (typeof r === 'function') return r
  const a = r.angles_deg
  const w = r.weight
  if (a.length < 2 || a.length !== w.length) throw new InputError('nephelometer: response', `the table has ${a.length} angles and ${w.length} weights`, 'Give at least two angles, each with a weight.')
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i]) || (i > 0 && !(a[i] > a[i - 1]))) throw new InputError('nephelometer: response', `angle ${a[i]}° does not follow ${a[i - 1]}° in increasing order`, 'Sort the table by angle.')
    if (!(w[i] >= 0 && Number.isFinite(w[i]))) throw new InputError('nephelometer: response', `the weight ${w[i]} at ${a[i]}° is not a number ≥ 0`, 'Give weights ≥ 0 relative to sin θ (1 = ideal).')
  }
  if (a[0] > g.lowDeg + 1e-9 || a[a.length - 1] < g.highDeg - 1e-9) throw new InputError('nephelometer: response', `the table covers ${a[0]}° to ${a[a.length - 1]}°, not the instrument's ${g.lowDeg}° to ${g.highDeg}°`, 'Extend the table to cover the angles the instrument sees.')
  return (deg) => {
    let i = 0
    while (i < a.length - 2 && a[i + 1] < deg) i++
    const t = Math.min(1, Math.max(0, (deg - a[i]) / (a[i + 1] - a[i])))
    return w[i] + t * (w[i + 1] - w[i])
  }
}

function checkGeometry(g: NephelometerGeometry): void {
  if (!(g.lowDeg >= 0 && g.highDeg <= 180 && g.highDeg > g.lowDeg)) {
    throw new InputError('nephelometer: angles', `${g.lowDeg}° to ${g.highDeg}° is not a range inside 0° to 180°`, 'Give 0 ≤ θ1 < θ2 ≤ 180 degrees, e.g. 7 and 170.')
  }
  if (!(g.highDeg > 90)) throw new InputError('nephelometer: angles', `the highest angle ${g.highDeg}° does not reach past 90°, so there is no backscatter to measure`, 'Give θ2 above 90°, e.g. 170.')
}

/** The nodes and weights of the truncation integrals for a geometry. */
export function truncationQuadrature(geometry: NephelometerGeometry): TruncationQuadrature {
  checkGeometry(geometry)
  const r = responseFunction(geometry)
  const breaks = new Set<number>([0, 0.25, 0.5, 1, 2, 3, 5, 7.5, 10, geometry.lowDeg, geometry.highDeg, 90, 180])
  for (let a = 15; a < 180; a += 5) breaks.add(a)
  const b = [...breaks].sort((x, y) => x - y)
  const m = GL8.nodes.length
  const n = (b.length - 1) * m
  const q: TruncationQuadrature = {
    anglesDeg: new Float64Array(n),
    totalTrue: new Float64Array(n),
    totalMeasured: new Float64Array(n),
    backTrue: new Float64Array(n),
    backMeasured: new Float64Array(n)
  }
  let j = 0
  for (let p = 0; p + 1 < b.length; p++) {
    const lo = b[p]
    const hi = b[p + 1]
    const mid = 0.5 * (lo + hi)
    const half = 0.5 * (hi - lo)
    for (let i = 0; i < m; i++) {
      const deg = mid + half * GL8.nodes[i]
      const rad = (deg * Math.PI) / 180
      const w = 0.5 * GL8.weights[i] * half * (Math.PI / 180) * Math.sin(rad) // ½ ∫ … sin θ dθ
      q.anglesDeg[j] = deg
      q.totalTrue[j] = w
      const inside = mid > geometry.lowDeg && mid < geometry.highDeg
      if (inside) {
        const rv = r(deg)
        if (!(rv >= 0 && Number.isFinite(rv))) throw new InputError('nephelometer: response', `the response at ${deg.toFixed(3)}° is ${rv}`, 'Give a response ≥ 0 relative to sin θ (1 = ideal).')
        q.totalMeasured[j] = w * rv
        if (mid > 90) q.backMeasured[j] = w * rv
      }
      if (mid > 90) q.backTrue[j] = w
      j++
    }
  }
  return q
}

/** The correction factors from a phase function tabulated at the quadrature's angles (any normalisation). */
export function truncationFromPhase(phase: ArrayLike<number>, q: TruncationQuadrature, geometry: NephelometerGeometry): TruncationCorrection {
  if (phase.length !== q.anglesDeg.length) throw new InputError('nephelometer: phase', `${phase.length} phase values for ${q.anglesDeg.length} angles`, 'Tabulate the phase function at the quadrature angles.')
  let tt = 0
  let tm = 0
  let bt = 0
  let bm = 0
  for (let j = 0; j < phase.length; j++) {
    const p = phase[j]
    if (!(p >= 0 && Number.isFinite(p))) throw new InputError('nephelometer: phase', `the phase function at ${q.anglesDeg[j].toFixed(3)}° is ${p}`, 'Give a phase function ≥ 0 at every angle.')
    tt += q.totalTrue[j] * p
    tm += q.totalMeasured[j] * p
    bt += q.backTrue[j] * p
    bm += q.backMeasured[j] * p
  }
  if (!(tm > 0) || !(bm > 0)) throw new InputError('nephelometer', 'the instrument would measure no scattering at these angles', 'Check the angles and the response.')
  return {
    low_deg: geometry.lowDeg,
    high_deg: geometry.highDeg,
    ideal_response: !geometry.response,
    total: tt / tm,
    backscatter: bt / bm,
    measured_fraction_total: tm / tt,
    measured_fraction_backscatter: bm / bt,
    phase_normalisation: tt
  }
}

/** Correction factors for a phase function given as a function of the angle in degrees (any normalisation). */
export function truncationCorrectionForPhase(phase: (thetaDeg: number) => number, geometry: NephelometerGeometry): TruncationCorrection {
  const q = truncationQuadrature(geometry)
  return truncationFromPhase(Array.from(q.anglesDeg, phase), q, geometry)
}

export interface NephelometerOptions {
  /** Wavelength of the nephelometer channel, nm (e.g. 450, 550 or 700). */
  wavelengthNm: number
  /** Humidity inside the instrument, percent (default: the sample's). Nephelometers are often run dry (< 40 %). */
  rhPercent?: number
  /** Relative accuracy of the size integration (default 1e-3, ample for a correction factor). */
  tolerance?: number
}

/** Truncation correction for a sample's population at one wavelength, from its own phase function. */
export function nephelometerTruncation(sample: Sample, study: Pick<Study, 'user_materials'>, geometry: NephelometerGeometry, options: NephelometerOptions): TruncationCorrection & { wavelength_nm: number; rh_percent: number; sca_true_mm: number; sca_measured_mm: number } {
  const q = truncationQuadrature(geometry)
  const wl = options.wavelengthNm
  if (!(wl >= 200 && wl <= 40000)) throw new InputError('nephelometer: wavelength', `${wl} nm is outside 200 to 40000 nm`, 'Give the channel wavelength in nm, e.g. 550.')
  const s = { wavelengths_nm: [wl], user_materials: study.user_materials }
  const optics = computeSampleOptics(sample, s, { anglesDeg: Array.from(q.anglesDeg), angularWavelengthsNm: [wl], rhPercent: options.rhPercent, tolerance: options.tolerance ?? 1e-3 }, studyMaterials(s))
  const c = truncationFromPhase(optics.angular[0].phase, q, geometry)
  const sca = optics.wavelengths[0].sca
  return { ...c, wavelength_nm: wl, rh_percent: options.rhPercent ?? sample.rh_percent, sca_true_mm: sca, sca_measured_mm: sca / c.total }
}
