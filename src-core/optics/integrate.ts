/**
 * Bulk optics of a population at one wavelength: cross-sections integrated over the size distribution.
 *
 * σ = ∫ C(D) dN/dlnD dlnD, with C in µm² and dN/dlnD in cm⁻³, so σ is in Mm⁻¹.
 *
 * Quadrature. The integration variable is t = u/h_u + s(x)/h_x with u = ln D_dry, x = π D G/λ (G the
 * largest growth factor) and s(x) = X ln(1 + x/X) with X = 100 (≈ x below X, X ln(x/X) above): nodes equally spaced in t are
 * spaced by about h_u in ln D for small particles and by about h_x in size parameter for large ones, where
 * the interference and ripple structure of the efficiencies sits; beyond X the step grows in proportion to
 * x, since the ripple of such large spheres is weak and their weight in any distribution's tail small.
 *
 * On this grid the trapezoid rule is used, halving the step level by level and reusing every node. A lognormal
 * mode's nodes are the points t = j·2^−L of a lattice fixed on the whole t axis (L chosen so that at least four
 * steps cross the mode): its integrand is small at the ends of the range (sample.ts leaves out about a hundredth
 * of the tolerance), where the trapezoid rule converges faster than any power of the step and needs no end
 * nodes, and every mode, and every edit of one, lands on the same nodes, whose values the workspace's node
 * cache keeps (nodeCache.ts). A measured bin
 * (flat in log D, with a jump at its edges) is split from its own edges, and its levels are combined by
 * Richardson extrapolation (Simpson's rule). A level is accepted when every figure (σext, σsca, σabs relative
 * to σext, g, and b, β̄ while they are refined) changed by less than the tolerance, and this change and the one
 * before add up to less than it: where narrow resonances are not resolved, single changes are erratic and
 * understate the error (the tests compare with much finer integrations, at many nearby wavelengths). Beyond
 * level 3 a lognormal segment is refined by panels (panels.ts): only where its integral still changes, the other
 * panels' new nodes filled in by a cubic-exact subdivision, so that the grid stays uniform.
 *
 * Upscatter. The population's S11 is summed at fixed scattering angles (upscatter.ts: 32 Gauss nodes in Θ on
 * each hemisphere), from which b, β(μ₀) and β̄ follow. Those sums converge more slowly in size than the
 * cross-sections (the S11 of one angle oscillates in x with a period near 1, against about 6 for σsca; lossless
 * spheres add narrow resonances), and a row of them costs about four Mie evaluations of the same sphere. Three
 * things hold them to the tolerance at little cost:
 * - a control variate (upscatter.ts, shiftToAsymmetry): b, β(μ₀) and β̄ are ½ − ¾μ₀g (β̄: ½ − ⅜g) plus a
 *   remainder R from the higher odd Legendre moments. Most of their fine structure in size is in the g term,
 *   which the cross-section integration follows to the tolerance on every node; the angular sums supply only R,
 *   which is much smoother in size (DEVELOPERS.md has the measurements);
 * - at the default tolerance the sums stop at level 3 (2 for a looser one: a quick pass, uncertainty draws;
 *   at a tighter one, once R changed by less than the tolerance over two levels);
 * - beyond level 2 a node carrying less than the tolerance's share of σsca, or one of size parameter below
 *   SMOOTH_X, takes the mean of its two neighbours' normalised rows and g instead of its own row (whatever the
 *   cache holds for it, so that a result does not depend on what was computed before): the control variate
 *   puts its own g back, and the rows of the large spheres in a mode's tail, the dearest, are not computed.
 * Measured against a reference without angular error (test/optics/upscatter.test.ts): b and β̄ within 6e-5 on
 * fine, coarse, very coarse, absorbing and lossless modes at the default tolerance, for a few per cent more
 * work on the demo's samples than with the sums stopped at level 2 and no control variate (DEVELOPERS.md).
 * The user-angle phase function (drawn, not integrated) stops at level 2. Ratios use σsca from the same nodes.
 */
import { AngularTable, coatedSphereEfficiencies, CoatedWorkspace, sphereEfficiencies, type SphereEfficiencies } from '../mie/index.ts'
import { NODE_ABS, NODE_DUDT, NODE_EXT, NODE_FIELDS, NODE_GSCA, NODE_SCA, NODE_U, NodeCache } from './nodeCache.ts'
import { shiftToAsymmetry, UPSCATTER_COS_ZENITH, UPSCATTER_SCATTERING_COSINES, upscatterFrom } from './upscatter.ts'
import { addInto, combine, converged, figuresOf, largestChange, residualChange, scaleInto, Sums, type Figures } from './levelSums.ts'
import { dryIndicesAt, particleGrowthAt, particleGrowthSetting, wetParticle, type ParticleKind, type WetParticle } from './particles.ts'
import { firstLatticeStep, largestGrowthFactor, largestSizeParameter, levelNodes, SizeAxis, type LevelNodes } from './sizeLattice.ts'
import { PanelBuffers, SegmentPanels, settlePanels, SETTLE_FROM_LEVEL, SETTLED_SHARE } from './panels.ts'

/** A stretch of the size distribution: ln D from lo to hi (D in µm), with dN/dlnD (cm⁻³) there. */
export interface SizeSegment {
  lo: number
  hi: number
  /** true for a measured bin (flat inside, jumps at its edges); false for a smooth, vanishing tail. */
  flat: boolean
  density: (u: number) => number
}

export interface Population {
  label: string
  kind: ParticleKind
  segments: SizeSegment[]
}

export interface Conditions {
  rhPercent: number
  history: 'rising' | 'falling'
  temperatureK: number
}

export interface IntegrationOptions {
  /** Relative accuracy aimed at (default 1e-4). */
  tolerance?: number
  /** Scattering angles (degrees) for the population phase function and polarisation. */
  anglesDeg?: ArrayLike<number>
  /** Deepest refinement level (default 9: 512 times the first grid). */
  maxLevel?: number
  /** First-grid step in ln D (default 0.25) and in size parameter (default 2). */
  stepLnD?: number
  stepX?: number
  /**
   * The coarsest lattice step in t for lognormal modes (a power of two; default 1). A quick pass may start
   * coarser (2, 4): its nodes are nodes of every finer pass, so a full pass after it reuses them all.
   */
  coarsestStep?: number
  /**
   * Accumulate the angular sums (b, β̄, β(μ₀) and the phase function at `anglesDeg`); default true. Without
   * them only σext, σsca, σabs and g are computed (b, β̄ and β(μ₀) are NaN), at a fraction of the cost.
   */
  upscatter?: boolean
  /**
   * Refine by panels beyond the first levels (panels.ts); default true. False refines every level over the whole
   * range, as before panels were introduced (the tests compare the two).
   */
  panels?: boolean
}

/** The relative accuracy aimed at unless another is asked for. */
export const DEFAULT_TOLERANCE = 1e-4

/**
 * Refinement levels that accumulate the angular sums at least (see the module comment): 2 where less than the
 * default accuracy is asked (a quick pass, uncertainty draws), 3 at the default accuracy or a tighter one.
 */
function angularLevelsFor(tolerance: number): number {
  return tolerance > DEFAULT_TOLERANCE ? 2 : 3
}
/** Refinement levels of the angular sums on every node that carries scattering; beyond them, see addNode. */
const FIRST_ANGULAR_LEVELS = 2
/**
 * Below this size parameter (at the widest growth) a sphere's phase function changes little over a step of the
 * second level (0.31 in x at x = 5), so the nodes of later levels take their neighbours' rows (see addNode).
 */
const SMOOTH_X = 5
/** Refinement levels of the phase function at the user's angles (drawn, not integrated). */
const USER_ANGLE_LEVELS = 2
const upMu = UPSCATTER_SCATTERING_COSINES.nodes

/** Bulk optics of one or more populations at one wavelength. */
export interface BulkOptics {
  wavelengthUm: number
  ext: number
  sca: number
  abs: number
  g: number
  backscatter: number
  upscatterMean: number
  upscatter: Float64Array
  /** Σ over nodes of weight·S11 and S12 at the chosen angles, and the matching σsca (for the phase function). */
  phase: Float64Array | null
  polarization: Float64Array | null
  evaluations: number
  /** Largest refinement level any population needed. */
  level: number
  /** False when a population reached the deepest level without two settled levels in a row. */
  converged: boolean
}

/** A stretch of the size distribution on the lattice: t0, t1 its ends in t, u the last node's ln D. */
interface Segment {
  s: SizeSegment
  t0: number
  t1: number
  u: number
}

/** Workspace shared by all integrations of a computation: Mie buffers, angular tables and the node cache. */
export class OpticsWorkspace {
  mie = new CoatedWorkspace()
  upTable = new AngularTable(upMu)
  userTables = new Map<string, AngularTable>()
  /** Every node's cross-sections, kept for the next computation with the same particles (see nodeCache.ts). */
  nodes: NodeCache
  evaluations = 0
  /** Node-value arrays of the refinement by panels, reused from one integration to the next. */
  panelBuffers = new PanelBuffers()
  constructor(nodeLimit?: number) {
    this.nodes = new NodeCache(nodeLimit)
  }
  userTable(anglesDeg: ArrayLike<number>): AngularTable {
    const key = Array.from(anglesDeg).join(',')
    let t = this.userTables.get(key)
    if (!t) {
      t = new AngularTable(Array.from(anglesDeg, (a) => Math.cos((a * Math.PI) / 180)))
      this.userTables.set(key, t)
    }
    return t
  }
}

type Settings = Required<Omit<IntegrationOptions, 'anglesDeg'>> & { anglesDeg?: ArrayLike<number> }

/**
 * Work between pauses of a stepped integration, in series terms of the Mie evaluations (with the angular sums
 * counted as ANGULAR_WORK terms each): about 2 ms on this project's 2-core test machine, so that a caller
 * looking for newer work between steps (the app's workers) sees it within a few milliseconds.
 */
export const STEP_WORK = 50_000
const ANGULAR_WORK = 3

/**
 * Integrates one population at one wavelength into `into` (adds), refining until converged, with a pause
 * after every STEP_WORK of work. Returns the refinement level used.
 */
function* integratePopulation(pop: Population, wavelengthUm: number, cond: Conditions, opts: Settings, ws: OpticsWorkspace, into: Sums): Generator<void, { level: number; converged: boolean }> {
  const kind = pop.kind
  const dry = dryIndicesAt(kind, wavelengthUm)
  const userTable = opts.upscatter && opts.anglesDeg && opts.anglesDeg.length ? ws.userTable(opts.anglesDeg) : null
  const userKey = userTable ? Array.from(opts.anglesDeg!).join(',') : ''
  const nUser = userTable ? userTable.mu.length : 0
  const lambda2 = wavelengthUm * wavelengthUm
  const gMax = largestGrowthFactor(kind, cond)
  const axis = new SizeAxis((Math.PI * gMax) / wavelengthUm, opts.stepLnD, opts.stepX) // x = ax·e^u
  const wet: WetParticle = { n: 1, k: 0, coreRatio: 0, coreN: 1, coreK: 0 }
  // Everything a node's value depends on except its position t.
  const nodes = ws.nodes.context(
    JSON.stringify([wavelengthUm, dry, kind.coreShell, kind.fractions, kind.rule, kind.kappa, kind.phaseChange ?? null, cond, opts.stepLnD, opts.stepX])
  )
  let added = 0
  /** Work since the last pause (see STEP_WORK). */
  let work = 0

  const segs: Segment[] = pop.segments.map((s) => ({ s, t0: axis.t(s.lo), t1: axis.t(s.hi), u: s.lo }))
  largestSizeParameter(pop.label, pop.segments, axis, wavelengthUm, 'Narrow the mode (a smaller median or geometric standard deviation), or leave out the shortest wavelengths.')
  const result = new Sums(nUser)
  const prevResult = new Sums(nUser)
  const flatPrev = new Sums(nUser)
  let anglesFrozen = !opts.upscatter
  let userFrozen = !opts.upscatter
  const frozenUser = new Sums(nUser)
  const angularLevels = angularLevelsFor(opts.tolerance)
  let lastAngChange = Infinity
  const frozenAngles = new Sums(nUser)

  /** The efficiencies of the last evaluation. */
  let eff: SphereEfficiencies | null = null
  /**
   * The Mie evaluation of the particle at dry ln-diameter u: its efficiencies go to `eff`, its coefficients
   * stay in ws.mie; returns its geometric cross-section (µm²).
   */
  let growth: ReturnType<typeof particleGrowthSetting> | undefined // at the first evaluation, which throws where it is bad
  const evaluate = (u: number): number => {
    const d = Math.exp(u)
    if (growth === undefined) growth = particleGrowthSetting(kind, cond.rhPercent, cond.history, cond.temperatureK)
    const gf = particleGrowthAt(growth, d)
    wetParticle(kind, dry, gf, wet)
    const dw = d * gf
    const x = (Math.PI * dw) / wavelengthUm
    if (wet.coreRatio > 0) {
      eff = coatedSphereEfficiencies(x * wet.coreRatio, wet.coreN, wet.coreK, x, wet.n, wet.k, ws.mie)
    } else {
      eff = sphereEfficiencies(x, wet.n, wet.k, ws.mie)
    }
    ws.evaluations++
    return 0.25 * Math.PI * dw * dw
  }

  /** Evaluates the particle at u and keeps it as the node at t; returns its number (ws.mie holds its coefficients). */
  const addEvaluated = (t: number, u: number, dudt: number): number => {
    const area = evaluate(u)
    const e = eff!
    added++
    work += e.terms
    return nodes.add(t, u, dudt, e.qext * area, e.qsca * area, e.qabs * area, e.qsca * area * e.g)
  }

  /**
   * The node at lattice position tN of segment seg, with its upscatter row (each evaluated and kept where the
   * cache lacks it): its number, or −1 where the segment holds no scattering particles there. Leaves ws.mie
   * holding another sphere's coefficients.
   */
  const nodeWithRow = (seg: Segment, tN: number): number => {
    if (tN < seg.t0 || tN > seg.t1) return -1
    let i = nodes.find(tN)
    let fresh = false
    if (i < 0) {
      const u = axis.uAt(seg, tN)
      if (!(seg.s.density(u) > 0)) return -1
      i = addEvaluated(tN, u, axis.dudt(u))
      fresh = true
    }
    if (!(nodes.values[NODE_FIELDS * i + NODE_SCA] > 0)) return -1
    if (nodes.upRow(i) < 0) {
      if (!fresh) evaluate(nodes.values[NODE_FIELDS * i + NODE_U])
      work += ANGULAR_WORK * eff!.terms
      ws.upTable.accumulate(ws.mie, 1, nodes.angular, null, nodes.newUpRow(i, upMu.length))
    }
    return i
  }

  /** The integrand (dN/dt·C: σext, σsca, σabs, g·σsca) at the last node addNode visited (0 where it left it out). */
  const nodeF = new Float64Array(4)
  // A neighbour's row share waiting for the next node (see addNode): node, its t, the share and the sums it goes to.
  let carryNode = -1
  let carryT = NaN
  let carryShare = 0
  let carrySums: Sums | null = null
  /** Adds share·(node i's upscatter row) into sums. */
  const addRowTimes = (sums: Sums, i: number, share: number) => {
    const rows = nodes.angular
    const r = nodes.upRow(i)
    const up = sums.up
    for (let j = 0; j < up.length; j++) up[j] += share * rows[r + j]
  }
  const flushCarry = () => {
    if (carryNode < 0) return
    addRowTimes(carrySums!, carryNode, carryShare)
    carryNode = -1
  }

  // Adds f(t)·weight for the node at t = base + m·h: from the cache where it holds the node, else from a Mie
  // evaluation.
  const addNode = (seg: Segment, base: number, m: number, h: number, weight: number, sums: Sums, withUp: boolean, withUser: boolean) => {
    const t = base + m * h
    nodeF[0] = nodeF[1] = nodeF[2] = nodeF[3] = 0
    if (carryNode >= 0 && carryT !== base + (m - 1) * h) flushCarry()
    let i = nodes.findNext(t)
    const u = i >= 0 ? nodes.values[NODE_FIELDS * i + NODE_U] : axis.uAt(seg, t)
    seg.u = u
    const dens = seg.s.density(u)
    if (!(dens > 0)) return
    const dudt = i >= 0 ? nodes.values[NODE_FIELDS * i + NODE_DUDT] : axis.dudt(u)
    const w = weight * dens * dudt
    // A node whose largest possible extinction (Q_ext < 6 at the widest growth) is below 1e-10 of the
    // previous level's total cannot matter: leave it out (whether or not its value is known, so that the
    // result does not depend on what was computed before).
    const dMax = Math.exp(u) * gMax
    if (w * 1.5 * Math.PI * dMax * dMax < negligibleExt) return
    let fresh = false
    if (i < 0) {
      i = addEvaluated(t, u, dudt)
      fresh = true
    }
    const v = nodes.values
    const at = NODE_FIELDS * i
    const sca = v[at + NODE_SCA]
    const f = dens * dudt
    nodeF[0] = f * v[at + NODE_EXT]
    nodeF[1] = f * sca
    nodeF[2] = f * v[at + NODE_ABS]
    nodeF[3] = f * v[at + NODE_GSCA]
    sums.ext += w * v[at + NODE_EXT]
    sums.sca += w * sca
    sums.abs += w * v[at + NODE_ABS]
    sums.gsca += w * v[at + NODE_GSCA]
    // The angular sums need only the nodes that carry scattering: below 1e-8 of the previous level's
    // σsca a node is left out of them (and out of the σsca they are divided by).
    const user = withUser && userTable !== null
    if ((!withUp && !user) || w * sca < negligibleSca) return
    let upRow = withUp ? nodes.upRow(i) : -1
    let userRow = user ? nodes.userRow(i, userKey) : -1
    // Beyond the first angular levels a node carrying less than the tolerance's share of σsca takes the mean of
    // its two neighbours' normalised rows and g, whatever the cache holds for it (module comment); the control
    // variate puts its own g back. Its neighbours are the previous level's nodes (base + (m ± 1)·h is how that
    // level wrote them, to the bit).
    if (withUp && !user && lv > FIRST_ANGULAR_LEVELS && (w * sca < interpShare || axis.ax * Math.exp(u) < SMOOTH_X)) {
      const tA = base + (m - 1) * h
      const before = ws.evaluations
      // the left neighbour is the last node's right one when that node took its neighbours' rows too
      const a = carryNode >= 0 && carryT === tA ? carryNode : nodeWithRow(seg, tA)
      const tB = base + (m + 1) * h
      const b = a >= 0 ? nodeWithRow(seg, tB) : -1
      if (ws.evaluations !== before) fresh = false
      if (a >= 0 && b >= 0) {
        const vals = nodes.values
        const fa = (0.5 * w * sca) / vals[NODE_FIELDS * a + NODE_SCA]
        const fb = (0.5 * w * sca) / vals[NODE_FIELDS * b + NODE_SCA]
        // A's row is added once with both shares it takes (this node's and the last one's); B's share waits for
        // the next node, which may take B as its own left neighbour.
        if (carryNode === a && carrySums === sums) {
          addRowTimes(sums, a, fa + carryShare)
          carryNode = -1
        } else {
          flushCarry()
          addRowTimes(sums, a, fa)
        }
        carryNode = b
        carryT = tB
        carryShare = fb
        carrySums = sums
        sums.angSca += w * sca
        sums.angG += fa * vals[NODE_FIELDS * a + NODE_GSCA] + fb * vals[NODE_FIELDS * b + NODE_GSCA]
        return
      }
    }
    flushCarry()
    if ((withUp && upRow < 0) || (user && userRow < 0)) {
      if (!fresh) evaluate(u)
      work += ANGULAR_WORK * eff!.terms
      if (withUp && upRow < 0) {
        upRow = nodes.newUpRow(i, upMu.length)
        ws.upTable.accumulate(ws.mie, 1, nodes.angular, null, upRow)
      }
      if (user && userRow < 0) {
        userRow = nodes.newUserRow(i, userKey, 2 * nUser)
        userTable.accumulate(ws.mie, 1, nodes.angular, nodes.angular, userRow, userRow + nUser)
      }
    }
    const rows = nodes.angular
    if (withUp) {
      sums.angSca += w * sca
      sums.angG += w * v[at + NODE_GSCA]
      const up = sums.up
      for (let j = 0; j < up.length; j++) up[j] += w * rows[upRow + j]
    }
    if (user) {
      sums.userSca += w * sca
      const s11 = sums.user11!
      const s12 = sums.user12!
      for (let j = 0; j < nUser; j++) {
        s11[j] += w * rows[userRow + j]
        s12[j] += w * rows[userRow + nUser + j]
      }
    }
  }

  // First grid: the lattice (lognormal segments) or the bin's own edges (measured bins); see sizeLattice.ts.
  // The same lattice serves every mode and every edit of it, so the node cache can answer.
  const firstStep = segs.map((sg) => firstLatticeStep(sg.t0, sg.t1, sg.s.flat, opts.coarsestStep))
  const at: LevelNodes = { base: 0, m0: 0, dm: 1, count: 0, h: 0, halfEnds: false }
  const flatSums = new Sums(nUser)
  const smoothSums = new Sums(nUser)
  // Trapezoid sums per segment class (smooth, flat), kept apart so that the flat ones can be extrapolated.
  let lv = 0
  let lastFigures: Figures | null = null
  let lastChange = Infinity
  let negligibleExt = 0
  let negligibleSca = 0
  let interpShare = 0
  const hasFlat = segs.some((sg) => sg.s.flat)
  // Refinement by panels (panels.ts) of the lognormal segments; the settled panels' changes so far.
  const panels = segs.map((sg) => (sg.s.flat || !opts.panels ? null : new SegmentPanels(sg.t0, sg.t1, ws.panelBuffers)))
  let settledChange = 0
  // The nodes added are counted against the cache's bound even when the caller gives the work up between
  // steps (drive() in the app's workers calls return(), which runs this finally): they stay in the cache.
  nodes.users++
  try {
    for (; lv <= opts.maxLevel; lv++) {
      const withAngles = !anglesFrozen
      const withUser = !userFrozen
      // Accumulate the new nodes of this level (weights in units of the level's step, scaled below).
      const fresh = new Sums(nUser)
      const freshFlat = new Sums(nUser)
      for (let i = 0; i < segs.length; i++) {
        const sg = segs[i]
        const h0 = firstStep[i]
        sg.u = sg.s.lo
        // This level's nodes in this segment: t = base + m·h for m = m0, m0 + dm, … (count of them), each weighted h.
        const { base, m0, dm, count, h, halfEnds } = levelNodes(sg.t0, sg.t1, sg.s.flat, h0, lv, at)
        const target = sg.s.flat ? freshFlat : fresh
        const pan = panels[i]
        pan?.begin(h, lv === 0)
        for (let k = 0; k < count; k++) {
          const m = m0 + k * dm
          if (pan?.anySettled && pan.settled[pan.panelOf(base + m * h)]) {
            // a settled panel: the node by subdivision (no Mie evaluation), weighted h like any lattice node
            pan.interpolate(m, nodeF)
            target.ext += h * nodeF[0]
            target.sca += h * nodeF[1]
            target.abs += h * nodeF[2]
            target.gsca += h * nodeF[3]
            continue
          }
          addNode(sg, base, m, h, halfEnds && (k === 0 || k === count - 1) ? 0.5 * h : h, target, withAngles, withUser)
          pan?.put(m, base + m * h, h, lv === 0, nodeF[0], nodeF[1], nodeF[2], nodeF[3])
          if (work >= STEP_WORK) {
            work = 0
            yield
          }
        }
      }
      flushCarry()
      // Trapezoid at this level = old trapezoid / 2 + new nodes·h (weights above already carry h).
      scaleInto(smoothSums, 0.5, lv > 0, fresh, withAngles, withUser)
      flatPrev.copyFrom(flatSums)
      scaleInto(flatSums, 0.5, lv > 0, freshFlat, withAngles, withUser)
      // Combine: smooth part as is; flat part by Richardson (S = (4 T_h − T_2h)/3) from level 1 on.
      prevResult.copyFrom(result)
      combine(result, smoothSums, flatSums, hasFlat && lv > 0 ? flatPrev : null, anglesFrozen ? frozenAngles : null, userFrozen ? frozenUser : null)
      const figures = figuresOf(result, lambda2, opts.tolerance <= DEFAULT_TOLERANCE)
      for (const pan of panels) pan?.end(figures.ext, figures.sca, figures.g)
      // Stop when this level changed every figure by less than the tolerance and this change and the one before
      // add up to less than it. Where narrow resonances of weakly absorbing spheres are not resolved, the
      // changes between levels are erratic and understate the error: a single small change, or two that
      // happen to fall off geometrically, were each measured to stop the refinement early (errors up to 1e-3
      // on a 1e-4 tolerance, for lossless narrow modes at a dozen nearby wavelengths); two changes that together
      // stay under the tolerance did not.
      // b and β̄ take part while their sums are still to be refined: not at the level where they stop anyway.
      const judgeAngles = !anglesFrozen && !(lv >= angularLevels && opts.tolerance >= DEFAULT_TOLERANCE)
      if (lastFigures) {
        const change = largestChange(lastFigures, figures, judgeAngles)
        if (converged(lastFigures, figures, opts.tolerance, judgeAngles) && change + lastChange < opts.tolerance) break
        lastChange = change
      }
      // The upscatter sums stop at level angularLevels at the default tolerance or a looser one (or earlier, with
      // everything else); at a tighter one, once the part they supply (R) changed by less than it over two levels.
      const angChange = lastFigures ? residualChange(lastFigures, figures) : Infinity
      if (!anglesFrozen && lv >= angularLevels && (opts.tolerance >= DEFAULT_TOLERANCE || angChange + lastAngChange < opts.tolerance)) {
        anglesFrozen = true
        frozenAngles.copyFrom(result)
      }
      // The phase function at the user's angles is drawn, not integrated: it stops at level USER_ANGLE_LEVELS
      // whatever the tolerance (its cost per node grows with the number of angles).
      if (!userFrozen && (anglesFrozen || lv >= USER_ANGLE_LEVELS)) {
        userFrozen = true
        frozenUser.copyFrom(result)
      }
      lastAngChange = angChange
      lastFigures = figures
      // Beyond the uniform levels, panels whose changes are small settle (panels.ts).
      if (lv >= SETTLE_FROM_LEVEL && anglesFrozen && userFrozen) settledChange = settlePanels(panels, settledChange, SETTLED_SHARE * opts.tolerance)
      negligibleExt = 1e-10 * figures.ext
      negligibleSca = 1e-8 * figures.sca
      interpShare = opts.tolerance * figures.sca
    }
  } finally {
    for (const pan of panels) pan?.release()
    nodes.users--
    ws.nodes.grew(added)
  }
  addInto(into, result)
  return { level: Math.min(lv, opts.maxLevel), converged: lv <= opts.maxLevel }
}

/** The populations ordered by their largest size, largest first (a stable order for equal ones). */
function byLargestFirst(populations: readonly Population[]): readonly Population[] {
  const top = (p: Population) => p.segments.reduce((m, sg) => Math.max(m, sg.hi), -Infinity)
  return populations.length < 2 ? populations : [...populations].sort((a, b) => top(b) - top(a))
}

/** The coarsest lattice step: a power of two from 1/64 to 64 (anything else is a programming error). */
function coarsestStepOf(step = 1): number {
  const e = Math.log2(step)
  if (!(Number.isInteger(e) && Math.abs(e) <= 6)) throw new RangeError(`coarsestStep must be a power of two from 1/64 to 64, not ${step}`)
  return step
}

/**
 * Bulk optics of an external mixture of populations at one wavelength (µm), with humidity `cond`.
 * Options: tolerance (default 1e-4), angles for the population phase function, grid controls.
 */
export function bulkOpticsAt(populations: readonly Population[], wavelengthUm: number, cond: Conditions, options: IntegrationOptions = {}, ws = new OpticsWorkspace()): BulkOptics {
  return finish(bulkOpticsSteps(populations, wavelengthUm, cond, options, ws))
}

/** Runs a stepped computation to its end. */
export function finish<T>(steps: Generator<void, T>): T {
  for (;;) {
    const r = steps.next()
    if (r.done) return r.value
  }
}

/**
 * bulkOpticsAt in steps: the generator pauses every few milliseconds of work (STEP_WORK) and returns the bulk
 * optics at the end, so that a caller that must stay responsive can look for newer work between steps.
 */
export function* bulkOpticsSteps(populations: readonly Population[], wavelengthUm: number, cond: Conditions, options: IntegrationOptions = {}, ws = new OpticsWorkspace()): Generator<void, BulkOptics> {
  const opts = {
    tolerance: options.tolerance ?? DEFAULT_TOLERANCE,
    maxLevel: options.maxLevel ?? 9,
    stepLnD: options.stepLnD ?? 0.25,
    stepX: options.stepX ?? 2,
    coarsestStep: coarsestStepOf(options.coarsestStep),
    upscatter: options.upscatter ?? true,
    panels: options.panels ?? true,
    anglesDeg: options.anglesDeg
  }
  const nUser = opts.upscatter && opts.anglesDeg ? opts.anglesDeg.length : 0
  const total = new Sums(nUser)
  const before = ws.evaluations
  let level = 0
  let converged = true
  // Largest particles first: where populations share their particles' context, the one that needs a node's
  // angular row most (a coarse mode's tail) computes it, and the others find it (see addNode).
  for (const pop of byLargestFirst(populations)) {
    const r = yield* integratePopulation(pop, wavelengthUm, cond, opts, ws, total)
    level = Math.max(level, r.level)
    converged &&= r.converged
  }
  const lambda2 = wavelengthUm * wavelengthUm
  // Each population's angular sums come with its own σsca from the same nodes; the total's ratio
  // uses their sum.
  const up = upscatterFrom(total.up, total.angSca, lambda2, new Float64Array(UPSCATTER_COS_ZENITH.length))
  const g = total.sca > 0 ? total.gsca / total.sca : 0
  // The control variate where g is held to the default accuracy or better (module comment).
  if (opts.upscatter && total.angSca > 0 && opts.tolerance <= DEFAULT_TOLERANCE) shiftToAsymmetry(up, total.angG / total.angSca, g)
  let phase: Float64Array | null = null
  let polarization: Float64Array | null = null
  if (total.user11) {
    phase = new Float64Array(nUser)
    polarization = new Float64Array(nUser)
    // For one sphere C_sca·p = 4π S11/k² = λ² S11/π with p normalised to ∫ p dΩ = 4π; summed over the
    // population, p = (λ²/π) ΣwS11 / σsca.
    const s = total.userSca > 0 ? lambda2 / (Math.PI * total.userSca) : 0
    for (let j = 0; j < nUser; j++) {
      phase[j] = s * total.user11[j]
      polarization[j] = total.user11[j] > 0 ? -total.user12![j] / total.user11[j] : 0
    }
  }
  return {
    wavelengthUm,
    ext: total.ext,
    sca: total.sca,
    abs: total.abs,
    g,
    backscatter: opts.upscatter ? up.b : NaN,
    upscatterMean: opts.upscatter ? up.mean : NaN,
    upscatter: opts.upscatter ? up.beta : up.beta.fill(NaN),
    phase,
    polarization,
    evaluations: ws.evaluations - before,
    level,
    converged
  }
}

