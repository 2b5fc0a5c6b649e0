/**
 * The running sums of a population's size integration at one wavelength, level by level (integrate.ts): the
 * cross-sections, the angular sums and their σsca and g, how a level's new nodes join the last level's sums,
 * and the figures each level is judged by.
 */
import { shiftToAsymmetry, UPSCATTER_SCATTERING_COSINES, upscatterFrom } from './upscatter.ts'

const upMu = UPSCATTER_SCATTERING_COSINES.nodes

/** Running sums of one population at one wavelength. */
export class Sums {
  ext = 0
  sca = 0
  abs = 0
  gsca = 0
  angSca = 0
  /** Σ weight·g·C_sca over the nodes of the angular sums (their g, for the control variate; see shiftToAsymmetry). */
  angG = 0
  /** σsca of the nodes in the user-angle sums (they stop refining earlier than the upscatter sums). */
  userSca = 0
  up: Float64Array
  user11: Float64Array | null
  user12: Float64Array | null
  constructor(userAngles: number) {
    this.up = new Float64Array(upMu.length)
    this.user11 = userAngles ? new Float64Array(userAngles) : null
    this.user12 = userAngles ? new Float64Array(userAngles) : null
  }
  copyFrom(o: Sums): void {
    this.ext = o.ext
    this.sca = o.sca
    this.abs = o.abs
    this.gsca = o.gsca
    this.angSca = o.angSca
    this.angG = o.angG
    this.userSca = o.userSca
    this.up.set(o.up)
    if (this.user11 && o.user11) this.user11.set(o.user11)
    if (this.user12 && o.user12) this.user12.set(o.user12)
  }
}

/** The figures a level is judged by. */
export interface Figures {
  ext: number
  sca: number
  abs: number
  g: number
  b: number
  bbar: number
  /** b + ¾ g and β̄ + ⅜ g on the nodes of the angular sums: what the control variate takes from them. */
  rb: number
  rbbar: number
}

export function figuresOf(s: Sums, lambda2: number, shift: boolean): Figures {
  const up = upscatterFrom(s.up, s.angSca, lambda2)
  const g = s.sca > 0 ? s.gsca / s.sca : 0
  const gRows = s.angSca > 0 ? s.angG / s.angSca : g
  const rb = up.b + 0.75 * gRows
  const rbbar = up.mean + 0.375 * gRows
  if (shift) shiftToAsymmetry(up, gRows, g)
  return { ext: s.ext, sca: s.sca, abs: s.abs, g, b: up.b, bbar: up.mean, rb, rbbar }
}

/** The change between two levels of what the angular sums supply (b and β̄ less their g terms). */
export function residualChange(a: Figures, b: Figures): number {
  return Math.max(Math.abs(a.rb - b.rb), Math.abs(a.rbbar - b.rbbar))
}

/** The change of b and β̄ between two levels (absolute: they are fractions, like g). */
function angularChange(a: Figures, b: Figures): number {
  return Math.max(Math.abs(a.b - b.b), Math.abs(a.bbar - b.bbar))
}

/**
 * The largest change between two levels (a, then b) of one population's figures, as a share of the sample's figures
 * at this wavelength: the population's own at level b plus those of the populations integrated before it (`before`,
 * their sums).
 * σext and σsca relative to the sample's, σabs relative to its σext; g (and b, β̄) as the sample's g moves with them:
 * the population's change weighted by its share of σsca, plus its σsca's change times how far its g is from the
 * others' (b and β̄ lie in [0, 1], so 1 bounds that distance for them). With nothing before, this is each figure's
 * change relative to the population's own (σext, σsca, σabs relative to σext) and the change of g, b and β̄.
 */
export function largestChange(a: Figures, b: Figures, withAngles: boolean, before: Sums): number {
  const r = (p: number, q: number, scale: number) => (scale > 0 ? Math.abs(p - q) / scale : 0)
  const ext = b.ext + before.ext
  const sca = b.sca + before.sca
  const others = before.sca > 0 && sca > 0
  const share = others ? b.sca / sca : 1
  const scaMove = others ? Math.abs(a.sca - b.sca) / sca : 0
  const gApart = others ? Math.abs(b.g - before.gsca / before.sca) : 0
  const c = Math.max(r(a.ext, b.ext, ext), r(a.sca, b.sca, sca), r(a.abs, b.abs, ext), Math.abs(a.g - b.g) * share + scaMove * gApart)
  return withAngles ? Math.max(c, angularChange(a, b) * share + scaMove) : c
}

/**
 * The error the populations already integrated at one wavelength estimate for themselves (each the sum of its last
 * two changes, as a share of the sample's figures up to it), in Mm⁻¹ of σext and of σsca (largestChange puts g, b
 * and β̄ on σsca's scale), so that the next population may stop once its own estimate and theirs together are
 * within the tolerance of the sample's figures.
 */
export class ErrorBudget {
  ext = 0
  sca = 0
  /** Adds a population's estimate: `share` of the sample's σext and σsca up to it (its figures f plus `before`). */
  spend(share: number, f: Figures, before: Sums): void {
    this.ext += share * (f.ext + before.ext)
    this.sca += share * (f.sca + before.sca)
  }
  /** The share of the sample's figures up to a population (its figures f plus `before`) already spent. */
  spent(f: Figures, before: Sums): number {
    const ext = f.ext + before.ext
    const sca = f.sca + before.sca
    return Math.max(ext > 0 ? this.ext / ext : 0, sca > 0 ? this.sca / sca : 0)
  }
}

/** target = (keep ? target·factor : 0) + fresh, over scalar and (if withAngles) angular sums. */
export function scaleInto(target: Sums, factor: number, keep: boolean, fresh: Sums, withAngles: boolean, withUser: boolean): void {
  const f = keep ? factor : 0
  target.ext = target.ext * f + fresh.ext
  target.sca = target.sca * f + fresh.sca
  target.abs = target.abs * f + fresh.abs
  target.gsca = target.gsca * f + fresh.gsca
  if (withAngles) {
    target.angSca = target.angSca * f + fresh.angSca
    target.angG = target.angG * f + fresh.angG
    for (let j = 0; j < target.up.length; j++) target.up[j] = target.up[j] * f + fresh.up[j]
  }
  if (withUser && target.user11 && fresh.user11) {
    target.userSca = target.userSca * f + fresh.userSca
    for (let j = 0; j < target.user11.length; j++) {
      target.user11[j] = target.user11[j] * f + fresh.user11[j]
      target.user12![j] = target.user12![j] * f + fresh.user12![j]
    }
  }
}

/** result = smooth + flat (Richardson with flatPrev when given); angular sums from `frozen` if given. */
export function combine(result: Sums, smooth: Sums, flat: Sums, flatPrev: Sums | null, frozenUp: Sums | null, frozenUser: Sums | null): void {
  const r = (a: number, b: number) => (flatPrev ? (4 * a - b) / 3 : a)
  result.ext = smooth.ext + r(flat.ext, flatPrev?.ext ?? 0)
  result.sca = smooth.sca + r(flat.sca, flatPrev?.sca ?? 0)
  result.abs = smooth.abs + r(flat.abs, flatPrev?.abs ?? 0)
  result.gsca = smooth.gsca + r(flat.gsca, flatPrev?.gsca ?? 0)
  if (frozenUp) {
    result.angSca = frozenUp.angSca
    result.angG = frozenUp.angG
    result.up.set(frozenUp.up)
  } else {
    result.angSca = smooth.angSca + r(flat.angSca, flatPrev?.angSca ?? 0)
    result.angG = smooth.angG + r(flat.angG, flatPrev?.angG ?? 0)
    for (let j = 0; j < result.up.length; j++) result.up[j] = smooth.up[j] + r(flat.up[j], flatPrev?.up[j] ?? 0)
  }
  if (!result.user11) return
  if (frozenUser) {
    result.userSca = frozenUser.userSca
    result.user11.set(frozenUser.user11!)
    result.user12!.set(frozenUser.user12!)
    return
  }
  result.userSca = smooth.userSca + r(flat.userSca, flatPrev?.userSca ?? 0)
  for (let j = 0; j < result.user11.length; j++) {
    result.user11[j] = smooth.user11![j] + r(flat.user11![j], flatPrev?.user11![j] ?? 0)
    result.user12![j] = smooth.user12![j] + r(flat.user12![j], flatPrev?.user12![j] ?? 0)
  }
}

export function addInto(into: Sums, s: Sums): void {
  into.ext += s.ext
  into.sca += s.sca
  into.abs += s.abs
  into.gsca += s.gsca
  into.angSca += s.angSca
  into.angG += s.angG
  into.userSca += s.userSca
  for (let j = 0; j < into.up.length; j++) into.up[j] += s.up[j]
  if (into.user11 && s.user11) {
    for (let j = 0; j < into.user11.length; j++) {
      into.user11[j] += s.user11[j]
      into.user12![j] += s.user12![j]
    }
  }
}
