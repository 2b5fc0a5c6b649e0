/**
 * Refinement by panels for a lognormal mode's size integration (integrate.ts): the levels beyond SETTLE_FROM_LEVEL
 * compute new nodes only in the panels of the t axis whose integral is still changing; a settled panel's new nodes
 * take the value of the 4-point interpolatory subdivision of Deslauriers & Dubuc (1989, "Symmetric iterative
 * interpolation processes", Constructive Approximation 5, 49–68): f(mid) = (−f₋₁ + 9f₀ + 9f₁ − f₂)/16 from the
 * level before, exact for cubics.
 *
 * Why interpolated nodes and not a coarser trapezoid there: the trapezoid's error on a smooth integrand is made of
 * end terms (Euler–Maclaurin) that cancel between neighbouring panels only on a uniform grid, so a grid refined in
 * some panels and not in others has an error of order h² at every border between them (the per-panel refinement
 * tried before, DEVELOPERS.md). With the settled panels' nodes filled in by a cubic-exact subdivision the grid stays
 * uniform: inside a settled stretch the interpolated nodes add exactly what the coarser trapezoid had (the
 * subdivision's second differences telescope), and at its borders they supply the end terms, to O(h⁴).
 *
 * The same interpolation gives each panel an honest measure of how much it is still changing: a new node's
 * deviation from the interpolated value, times h, summed over the panel. On a smooth integrand that is O(h⁴) and
 * does not telescope away (unlike the trapezoid's own panel changes, which are O(h²) end terms); where narrow
 * resonances are not resolved it is the panel's share of the level's change. A panel settles when its changes on
 * the last two levels add up to little, in order of those changes (smallest first), while the settled panels'
 * changes together stay within SETTLED_SHARE of the tolerance; the refinement as a whole still stops only by the
 * rule of integrate.ts on the population's figures. In practice the panels that settle are those in the tail of
 * large sizes (many nodes, costly per node, carrying little of σ), and the ones that keep refining carry most of it.
 */

/** Width of a panel in t (integrate.ts): about 4 in size parameter for large particles (x up to 100), 0.5 in ln D for small ones. */
export const PANEL_WIDTH = 2
/**
 * Panels may settle after this level: levels up to it are uniform. At the default tolerance the angular sums still
 * run on the next level (integrate.ts), where a settled panel's nodes take their neighbours' rows; at a tighter one
 * panels settle only once those sums have stopped. (From level 3 until 2026-12: DEVELOPERS.md.)
 */
export const SETTLE_FROM_LEVEL = 2
/** Share of the tolerance that the settled panels' last two changes may take together. */
export const SETTLED_SHARE = 0.25

/**
 * Node-value arrays handed from one integration to the next (kept by the OpticsWorkspace): a coarse mode's arrays
 * grow to a few megabytes over its levels, and allocating them afresh for each wavelength showed as garbage
 * collection in a profile of warm passes.
 */
export class PanelBuffers {
  private free: Float64Array[] = []
  /** An array of at least n numbers (its contents are not cleared). */
  take(n: number): Float64Array {
    let best = -1
    for (let i = 0; i < this.free.length; i++) if (this.free[i].length >= n && (best < 0 || this.free[i].length < this.free[best].length)) best = i
    if (best < 0) return new Float64Array(Math.max(n, 1024))
    const a = this.free[best]
    this.free[best] = this.free[this.free.length - 1]
    this.free.pop()
    return a
  }
  give(a: Float64Array): void {
    if (a.length === 0) return
    if (this.free.length >= 8) this.free.sort((x, y) => y.length - x.length).pop()
    this.free.push(a)
  }
}

/** Four figures a node: the integrand (dN/dt·C) of σext, σsca, σabs and g·σsca. */
const F = 4

/**
 * A lognormal segment's node values on the current level of its lattice and its panels' changes. Values are
 * indexed by lattice number m (t = m·h); `begin` moves to the next level, `put`/`interpolate` fill its new nodes.
 */
export class SegmentPanels {
  private vals: Float64Array = new Float64Array(0)
  private next: Float64Array = new Float64Array(0)
  private mLo = 0
  private count = 0
  private nextLo = 0
  private nextCount = 0
  private readonly sub = new Float64Array(F)
  private readonly pLo: number
  readonly panels: number
  /** 1 where a panel settled. */
  readonly settled: Uint8Array
  /** This level's change of each panel (F figures a panel). */
  readonly change: Float64Array
  /** Relative change of each panel on this level and on the one before. */
  readonly rel: Float64Array
  readonly lastRel: Float64Array
  anySettled = false

  constructor(
    private readonly t0: number,
    private readonly t1: number,
    private readonly pool: PanelBuffers
  ) {
    this.pLo = Math.floor(t0 / PANEL_WIDTH)
    this.panels = Math.floor(t1 / PANEL_WIDTH) - this.pLo + 1
    this.settled = new Uint8Array(this.panels)
    this.change = new Float64Array(F * this.panels)
    this.rel = new Float64Array(this.panels).fill(Infinity)
    this.lastRel = new Float64Array(this.panels).fill(Infinity)
  }

  /** Starts a level of step h: the lattice numbers in [t0, t1], the last level's nodes (the even ones) carried over. */
  begin(h: number, first: boolean): void {
    const lo = Math.ceil(this.t0 / h)
    const n = Math.floor(this.t1 / h) - lo + 1
    if (this.next.length < F * n) {
      this.pool.give(this.next)
      this.next = this.pool.take(2 * F * n)
    }
    if (!first) {
      // old node m is new node 2m
      for (let m = this.mLo; m < this.mLo + this.count; m++) {
        const from = F * (m - this.mLo)
        const to = F * (2 * m - lo)
        for (let j = 0; j < F; j++) this.next[to + j] = this.vals[from + j]
      }
    }
    this.nextLo = lo
    this.nextCount = n
    this.change.fill(0)
  }

  /** The panel of t. */
  panelOf(t: number): number {
    return Math.floor(t / PANEL_WIDTH) - this.pLo
  }

  /** The subdivision's values at new node m = 2k + 1 (between the last level's k and k + 1) into `sub`. */
  private subdivide(m: number): void {
    const v = this.vals
    const sub = this.sub
    // the last level's nodes k − 1 … k + 2 at offsets a … d (−1 outside the segment, where the integrand vanishes)
    const i = (m - 1) / 2 - 1 - this.mLo
    const n = this.count
    const a = i >= 0 && i < n ? F * i : -1
    const b = i + 1 >= 0 && i + 1 < n ? F * (i + 1) : -1
    const c = i + 2 >= 0 && i + 2 < n ? F * (i + 2) : -1
    const d = i + 3 >= 0 && i + 3 < n ? F * (i + 3) : -1
    for (let j = 0; j < F; j++) {
      const fa = a < 0 ? 0 : v[a + j]
      const fb = b < 0 ? 0 : v[b + j]
      const fc = c < 0 ? 0 : v[c + j]
      const fd = d < 0 ? 0 : v[d + j]
      sub[j] = (9 * (fb + fc) - fa - fd) / 16
    }
  }

  /**
   * Keeps the computed node m (values ext, sca, abs, gsca) of this level; on a level after the first, its
   * deviation from the subdivision, times h, goes to its panel's change.
   */
  put(m: number, t: number, h: number, first: boolean, ext: number, sca: number, abs: number, gsca: number): void {
    const at = F * (m - this.nextLo)
    const nx = this.next
    nx[at] = ext
    nx[at + 1] = sca
    nx[at + 2] = abs
    nx[at + 3] = gsca
    if (first) return
    this.subdivide(m)
    const c = F * this.panelOf(t)
    for (let j = 0; j < F; j++) this.change[c + j] += h * (nx[at + j] - this.sub[j])
  }

  /** Fills the settled node m of this level by subdivision; its values in `out` (ext, sca, abs, gsca). */
  interpolate(m: number, out: Float64Array): void {
    this.subdivide(m)
    const at = F * (m - this.nextLo)
    for (let j = 0; j < F; j++) out[j] = this.next[at + j] = this.sub[j]
  }

  /** Hands the arrays back to the pool (the integration is over or given up). */
  release(): void {
    this.pool.give(this.vals)
    this.pool.give(this.next)
    this.vals = this.next = new Float64Array(0)
  }

  /** Ends the level: its values become the last level's, each panel's change relative to the population's figures. */
  end(ext: number, sca: number, g: number): void {
    const t = this.vals
    this.vals = this.next
    this.next = t
    this.mLo = this.nextLo
    this.count = this.nextCount
    const c = this.change
    for (let p = 0; p < this.panels; p++) {
      const d = F * p
      const r = Math.max(
        ext > 0 ? Math.abs(c[d]) / ext : 0,
        sca > 0 ? Math.abs(c[d + 1]) / sca : 0,
        ext > 0 ? Math.abs(c[d + 2]) / ext : 0,
        sca > 0 ? Math.abs(c[d + 3] - g * c[d + 1]) / sca : 0
      )
      this.lastRel[p] = this.rel[p]
      this.rel[p] = r
    }
  }
}

/**
 * Settles panels of the population's lognormal segments, smallest last-two-level change first, while the settled
 * panels' changes together (`spent`, carried from level to level) stay below `budget`; returns the new total.
 */
export function settlePanels(all: readonly (SegmentPanels | null)[], spent: number, budget: number): number {
  const order: { s: SegmentPanels; p: number; score: number }[] = []
  for (const s of all) {
    if (!s) continue
    for (let p = 0; p < s.panels; p++) if (!s.settled[p]) order.push({ s, p, score: s.rel[p] + s.lastRel[p] })
  }
  order.sort((a, b) => a.score - b.score)
  for (const o of order) {
    if (!(spent + o.score < budget)) break
    spent += o.score
    o.s.settled[o.p] = 1
    o.s.anySettled = true
  }
  return spent
}
