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
 * steps cross the mode): its integrand is small at the ends of the range (sample.ts leaves out 1e-6 of a mode's
 * second moment among small particles, and a tenth of the tolerance among large ones), where the trapezoid rule
 * converges faster than any power of the step and needs no end nodes, and every mode, and every edit of one,
 * lands on the same nodes, whose values the workspace's node
 * cache keeps (nodeCache.ts). A measured bin
 * (flat in log D, with a jump at its edges) is split from its own edges, and its levels are combined by
 * Richardson extrapolation (Simpson's rule). A level is accepted when every figure (σext, σsca, σabs relative
 * to σext, g, and b, β̄ while they are refined) changed by less than the tolerance, and this change and the one
 * before add up to less than it: where narrow resonances are not resolved, single changes are erratic and
 * understate the error (the tests compare with much finer integrations, at many nearby wavelengths). Where a
 * sample has several populations, the tolerance is the sample's: a population's changes are judged as shares of the
 * sample's figures so far, less the error the populations before it estimated for themselves (SHARED_LIMIT). Beyond
 * level 2 a lognormal segment is refined by panels (panels.ts): only where its integral still changes, the other
 * panels' new nodes filled in by a cubic-exact subdivision, so that the grid stays uniform (and on level 3, where
 * the angular sums still run, given their neighbours' rows).
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
import { addInto, combine, ErrorBudget, figuresOf, largestChange, residualChange, scaleInto, Sums, type Figures } from './levelSums.ts'
import { dryIndicesAt, type ParticleKind } from './particles.ts'
import { firstLatticeStep, largestGrowthFactor, largestSizeParameter, levelNodes, SizeAxis, type LevelNodes } from './sizeLattice.ts'
import { SegmentPanels, settlePanels, SETTLE_FROM_LEVEL, SETTLED_SHARE } from './panels.ts'
import { NodeVisitor, type Segment } from './nodeVisitor.ts'
import type { OpticsWorkspace } from './workspace.ts'

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
/** Refinement levels of the phase function at the user's angles (drawn, not integrated). */
const USER_ANGLE_LEVELS = 2

/**
 * A population among others may stop once its changes are within the tolerance of the sample's figures (see the
 * stopping rule below), but its own changes must stay within SHARED_LIMIT times the tolerance, and within the
 * tolerance itself below level SHARED_FROM_LEVEL (a step of at most 1/32 in size parameter up to x = 100): on a narrow,
 * lossless coarse mode beside a fine mode carrying most of σ, looser limits let the changes of coarse levels stop the
 * refinement early by chance (errors up to 2e-4 of the sample's σext at a 1e-4 tolerance; DEVELOPERS.md).
 */
export const SHARED_LIMIT = 3
export const SHARED_FROM_LEVEL = 6
/** The sums of no population: what a population's changes are judged against when none came before it. */
const NOTHING_BEFORE = new Sums(0)

export type Settings = Required<Omit<IntegrationOptions, 'anglesDeg'>> & { anglesDeg?: ArrayLike<number> }

/**
 * Work between pauses of a stepped integration, in series terms of the Mie evaluations (with the angular sums
 * counted as ANGULAR_WORK terms each): about 2 ms on this project's 2-core test machine, so that a caller
 * looking for newer work between steps (the app's workers) sees it within a few milliseconds.
 */
export const STEP_WORK = 50_000

/**
 * Integrates one population at one wavelength into `into` (adds), refining until converged, with a pause
 * after every STEP_WORK of work; `into` holds the populations integrated before it and `budget` what they estimated
 * of their own error (the stopping rule below). Returns the refinement level used.
 */
export function* integratePopulation(pop: Population, wavelengthUm: number, cond: Conditions, opts: Settings, ws: OpticsWorkspace, into: Sums, budget: ErrorBudget): Generator<void, { level: number; converged: boolean }> {
  const kind = pop.kind
  const dry = dryIndicesAt(kind, wavelengthUm)
  const userTable = opts.upscatter && opts.anglesDeg && opts.anglesDeg.length ? ws.userTable(opts.anglesDeg) : null
  const userKey = userTable ? Array.from(opts.anglesDeg!).join(',') : ''
  const nUser = userTable ? userTable.mu.length : 0
  const lambda2 = wavelengthUm * wavelengthUm
  const gMax = largestGrowthFactor(kind, cond)
  const axis = new SizeAxis((Math.PI * gMax) / wavelengthUm, opts.stepLnD, opts.stepX) // x = ax·e^u
  // Everything a node's value depends on except its position t.
  const nodes = ws.nodes.context(
    JSON.stringify([wavelengthUm, dry, kind.coreShell, kind.fractions, kind.rule, kind.kappa, kind.phaseChange ?? null, cond, opts.stepLnD, opts.stepX])
  )
  const visit = new NodeVisitor(kind, dry, cond, wavelengthUm, gMax, axis, nodes, ws, userTable, userKey, nUser)
  const nodeF = visit.nodeF

  // The arrays this generator keeps across its pauses are built element by element (not by map, some or from), so
  // that they have one shape whatever the population: arrays whose shape varied from call to call sent the
  // optimised code of this function back to the interpreter in the middle of an edit, and it was compiled again.
  const segs: Segment[] = []
  for (let i = 0; i < pop.segments.length; i++) {
    const s = pop.segments[i]
    segs.push({ s, t0: axis.t(s.lo), t1: axis.t(s.hi), u: s.lo })
  }
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

  // First grid: the lattice (lognormal segments) or the bin's own edges (measured bins); see sizeLattice.ts.
  // The same lattice serves every mode and every edit of it, so the node cache can answer.
  const firstStep = new Float64Array(segs.length)
  for (let i = 0; i < segs.length; i++) firstStep[i] = firstLatticeStep(segs[i].t0, segs[i].t1, segs[i].s.flat, opts.coarsestStep)
  const at: LevelNodes = { base: 0, m0: 0, dm: 1, count: 0, h: 0, halfEnds: false }
  const flatSums = new Sums(nUser)
  const smoothSums = new Sums(nUser)
  // Trapezoid sums per segment class (smooth, flat), kept apart so that the flat ones can be extrapolated.
  let lv = 0
  let lastFigures: Figures | null = null
  let lastChange = Infinity
  let lastOwn = Infinity
  let hasFlat = false
  // Refinement by panels (panels.ts) of the lognormal segments; the settled panels' changes so far.
  const panels: (SegmentPanels | null)[] = []
  for (const sg of segs) {
    hasFlat ||= sg.s.flat
    panels.push(sg.s.flat || !opts.panels ? null : new SegmentPanels(sg.t0, sg.t1, ws.panelBuffers))
  }
  let settledChange = 0
  // The nodes added are counted against the cache's bound even when the caller gives the work up between
  // steps (drive() in the app's workers calls return(), which runs this finally): they stay in the cache.
  nodes.users++
  try {
    for (; lv <= opts.maxLevel; lv++) {
      visit.lv = lv
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
            if (withAngles) visit.addNeighbourRows(sg, base, m, h, h * nodeF[1], target)
            continue
          }
          visit.addNode(sg, base, m, h, halfEnds && (k === 0 || k === count - 1) ? 0.5 * h : h, target, withAngles, withUser)
          pan?.put(m, base + m * h, h, lv === 0, nodeF[0], nodeF[1], nodeF[2], nodeF[3])
          if (visit.work >= STEP_WORK) {
            visit.work = 0
            yield
          }
        }
      }
      visit.flushCarry()
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
      // A population's figures are judged as shares of the sample's so far: its own and those of the populations
      // integrated before it (`into`, bulkOptics.ts puts the coarse, resonant ones last), and the tolerance is the
      // sample's, less what those populations estimated of their own error (`budget`). Its own changes must still
      // stay within the tolerance below SHARED_FROM_LEVEL and within SHARED_LIMIT times it from there, where the
      // lattice resolves the efficiencies' ripple (DEVELOPERS.md, "A population judged within its sample"). With
      // nothing before, this is the rule on its own figures.
      if (lastFigures) {
        const change = largestChange(lastFigures, figures, judgeAngles, into)
        const own = largestChange(lastFigures, figures, judgeAngles, NOTHING_BEFORE)
        const allowed = opts.tolerance - budget.spent(figures, into)
        const ownAllowed = (lv >= SHARED_FROM_LEVEL ? SHARED_LIMIT : 1) * opts.tolerance
        if (change <= allowed && change + lastChange < allowed && own + lastOwn < ownAllowed) {
          budget.spend(change + lastChange, figures, into)
          break
        }
        if (lv === opts.maxLevel) budget.spend(change + lastChange, figures, into)
        lastChange = change
        lastOwn = own
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
      // At the default tolerance they may settle before the angular sums stop (level 3): a settled panel's nodes then
      // take their neighbours' normalised rows, as nodes carrying little do (NodeVisitor.addNeighbourRows).
      if (lv >= SETTLE_FROM_LEVEL && userFrozen && (anglesFrozen || opts.tolerance >= DEFAULT_TOLERANCE)) settledChange = settlePanels(panels, settledChange, SETTLED_SHARE * opts.tolerance)
      visit.negligibleExt = 1e-10 * figures.ext
      visit.negligibleSca = 1e-8 * figures.sca
      visit.interpShare = opts.tolerance * figures.sca
    }
  } finally {
    for (const pan of panels) pan?.release()
    nodes.users--
    ws.nodes.grew(visit.added)
  }
  addInto(into, result)
  return { level: Math.min(lv, opts.maxLevel), converged: lv <= opts.maxLevel }
}
