/**
 * The size integration's variable and its lattice, shared by the integration at one wavelength (integrate.ts)
 * and the one over the infrared nodes at once (spectralIntegrate.ts).
 *
 * t = u/h_u + s(x)/h_x with u = ln D_dry, x = a·e^u the size parameter of the most grown particle at the shortest
 * wavelength integrated (a = π G/λ) and s(x) = X ln(1 + x/X), X = 100 (see integrate.ts). A lognormal segment's
 * nodes are the points t = j·2^−L of a lattice fixed on the whole t axis; a measured bin is split from its own edges.
 */
import { InputError } from '../errors.ts'
import { SPHERE_DOMAIN } from '../mie/index.ts'
import type { Conditions, SizeSegment } from './integrate.ts'
import type { ParticleKind } from './particles.ts'

/** Beyond this size parameter the node step grows in proportion to x (see integrate.ts). */
export const X_STRETCH = 100

/** Smallest lattice level whose step 2^−L fits at least this many times into a lognormal segment. */
export const MIN_LATTICE_STEPS = 4

/** The largest growth factor of a particle kind at the conditions, for the node spacing (no Kelvin term, so an upper bound). */
export function largestGrowthFactor(kind: ParticleKind, cond: Conditions): number {
  return cond.rhPercent > 0 && kind.kappa > 0 ? Math.cbrt(1 + (kind.kappa * cond.rhPercent) / (100 - cond.rhPercent)) : 1
}

/**
 * The largest size parameter of a population's range on `axis` (its wavelength `wavelengthUm`); an InputError
 * naming the population when it is beyond what the sphere engine covers, with `fix`.
 */
export function largestSizeParameter(label: string, segments: readonly SizeSegment[], axis: SizeAxis, wavelengthUm: number, fix: string): number {
  const uTop = Math.max(...segments.map((sg) => sg.hi))
  const xTop = axis.ax * Math.exp(uTop)
  if (xTop > SPHERE_DOMAIN.sizeParameter.max) {
    throw new InputError(
      label,
      `its size distribution reaches diameters of ${Math.exp(uTop).toPrecision(3)} µm, where the size parameter at ${Number((wavelengthUm * 1000).toPrecision(6))} nm (${xTop.toPrecision(3)}) is beyond the ${SPHERE_DOMAIN.sizeParameter.max} this engine covers`,
      fix
    )
  }
  return xTop
}

/** The integration variable t(u) for size parameters x = ax·e^u, with first-grid steps h_u (ln D) and h_x (x). */
export class SizeAxis {
  private readonly iu: number
  private readonly ihx: number
  constructor(
    readonly ax: number,
    stepLnD: number,
    stepX: number
  ) {
    this.iu = 1 / stepLnD
    this.ihx = 1 / stepX
  }

  /** s(x(u))/h_x; s(x) = X ln(1 + x/X) is analytic, which the trapezoid rule needs. */
  private stretch(u: number): number {
    return X_STRETCH * Math.log1p((this.ax * Math.exp(u)) / X_STRETCH) * this.ihx
  }

  /** d(s(x(u))/h_x)/du. */
  private stretchSlope(u: number): number {
    const x = this.ax * Math.exp(u)
    return ((x * X_STRETCH) / (X_STRETCH + x)) * this.ihx
  }

  t(u: number): number {
    return u * this.iu + this.stretch(u)
  }

  /** du/dt at u. */
  dudt(u: number): number {
    return 1 / (this.iu + this.stretchSlope(u))
  }

  /** u at t: Newton from the segment's last node's u, safeguarded by the segment's bracket (t is increasing in u). */
  uAt(seg: { s: SizeSegment; u: number }, t: number): number {
    let u = seg.u
    let lo = seg.s.lo
    let hi = seg.s.hi
    const ax = this.ax
    const iu = this.iu
    const ihx = this.ihx
    for (let it = 0; it < 100; it++) {
      // t(u) − t and its slope, written out to take e^u once (the same arithmetic as t and stretchSlope)
      const x = ax * Math.exp(u)
      const f = u * iu + X_STRETCH * Math.log1p(x / X_STRETCH) * ihx - t
      if (f > 0) hi = u
      else lo = u
      let next = u - f / (iu + ((x * X_STRETCH) / (X_STRETCH + x)) * ihx)
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi)
      if (Math.abs(next - u) < 1e-13 * (1 + Math.abs(u))) return next
      u = next
    }
    return u
  }
}

/**
 * The first grid's step of a segment from t0 to t1: a lognormal segment (smooth, vanishing at both ends) uses the
 * dyadic lattice from the level that puts at least MIN_LATTICE_STEPS steps across it, starting from `coarsestStep`;
 * a measured bin (flat, with jumps at its edges) is split into max(2, ⌈t1 − t0⌉) equal steps from its own edges,
 * which Richardson extrapolation needs.
 */
export function firstLatticeStep(t0: number, t1: number, flat: boolean, coarsestStep: number): number {
  if (flat) return (t1 - t0) / Math.max(2, Math.ceil(t1 - t0))
  let h = coarsestStep
  while ((t1 - t0) / h < MIN_LATTICE_STEPS && h > 2 ** -40) h /= 2
  return h
}

/** One level's new nodes in a segment: t = base + (m0 + k·dm)·h for k < count, each weighted h (half at a bin's ends on level 0). */
export interface LevelNodes {
  base: number
  m0: number
  dm: number
  count: number
  h: number
  halfEnds: boolean
}

/**
 * The nodes level `lv` adds in a segment whose first step is h0. A measured bin is split from its own edges: all
 * of t0 + k·h0 at level 0 (the two ends at half weight), then the odd multiples of h from t0. A lognormal segment
 * takes the lattice nodes inside [t0, t1]: all multiples of h0 at level 0, the odd multiples of h after.
 */
export function levelNodes(t0: number, t1: number, flat: boolean, h0: number, lv: number, out: LevelNodes): LevelNodes {
  const h = h0 / (1 << lv)
  out.h = h
  out.base = flat ? t0 : 0
  out.dm = lv === 0 ? 1 : 2
  out.halfEnds = flat && lv === 0
  if (flat) {
    const n0 = Math.round((t1 - t0) / h0)
    out.m0 = lv === 0 ? 0 : 1
    out.count = lv === 0 ? n0 + 1 : n0 << (lv - 1)
  } else if (lv === 0) {
    out.m0 = Math.ceil(t0 / h0)
    out.count = Math.floor(t1 / h0) - out.m0 + 1
  } else {
    const k0 = Math.ceil((t0 / h - 1) / 2)
    out.m0 = 2 * k0 + 1
    out.count = Math.floor((t1 / h - 1) / 2) - k0 + 1
  }
  return out
}
