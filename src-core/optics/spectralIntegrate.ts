/**
 * Bulk optics of populations at many wavelengths at once, on shared size nodes: the thermal infrared's size
 * integration (optics/longwave.ts). σext, σsca, σabs and g only, no angular sums.
 *
 * Why a second integration. The one of integrate.ts runs once per wavelength; over the infrared's node
 * wavelengths (17, all long next to the particles) its set-up, its water uptake at each node (a root of the
 * κ-Köhler equation) and its convergence levels cost more than the Mie series of the small particles: on the
 * demo's fine samples the infrared added 18–110 % to a sample's computation (DEVELOPERS.md). Here one size
 * lattice serves every wavelength: the lattice of integrate.ts (sizeLattice.ts) with the size parameter taken at
 * the shortest wavelength (so that every wavelength's efficiencies are resolved at least as finely as in a
 * one-wavelength integration), each node's growth factor computed once, its wet index mixed and its Mie
 * efficiencies computed at each wavelength, and the levels refined for all wavelengths together.
 *
 * When to stop. A level is accepted when no wavelength's σext, σsca, σabs (relative to σext) or g changed by more
 * than the tolerance from the level before. integrate.ts asks two such changes in a row, because between narrow
 * Mie resonances of weakly absorbing large spheres the changes are erratic; the efficiencies here are smooth in
 * size wherever the particles are small next to the wavelength (x below SMOOTH_X at the shortest one, at the
 * population's largest diameter and growth), where the trapezoid rule's error on the lattice falls faster than
 * any power of the step and one change bounds it. A population with larger particles keeps the stricter rule.
 * Checked against the one-wavelength integration at a tight tolerance in test/optics/spectral.test.ts.
 */
import { coatedSphereEfficiencies, sphereEfficiencies, type SphereEfficiencies } from '../mie/index.ts'
import { STEP_WORK, type Conditions, type Population, type SizeSegment } from './integrate.ts'
import type { OpticsWorkspace } from './workspace.ts'
import { NODE_FIELDS } from './nodeCache.ts'
import { dryIndicesAt, particleGrowth, wetParticle, type WetParticle } from './particles.ts'
import { firstLatticeStep, largestGrowthFactor, largestSizeParameter, levelNodes, SizeAxis, type LevelNodes } from './sizeLattice.ts'

/**
 * Up to this size parameter (at the shortest wavelength, for the most grown particle of a population) the
 * efficiencies are taken as smooth in size and one small change accepts a level (see the module note). Mie
 * resonances narrow enough to fool a single change need x of several tens with little absorption (Chýlek 1976,
 * J. Opt. Soc. Am. 66:285: ripple widths fall off as x grows); below a few they are broad.
 */
export const SMOOTH_X = 20

export interface SpectralOptions {
  /** Relative accuracy (as in integrate.ts: σext, σsca relative, σabs relative to σext, g absolute). */
  tolerance: number
  /** The coarsest lattice step (a power of two, see IntegrationOptions.coarsestStep). */
  coarsestStep: number
  /** Deepest refinement level (default 9). */
  maxLevel?: number
}

/** Bulk optics at each wavelength, in the order given (coefficients in Mm⁻¹ for µm and cm⁻³). */
export interface SpectralBulk {
  ext: Float64Array
  sca: Float64Array
  abs: Float64Array
  g: Float64Array
  /** Mie evaluations (one per node and wavelength). */
  evaluations: number
  /** Largest refinement level any population needed. */
  level: number
  converged: boolean
}

/** Figures per wavelength: 4j + 0 ext, 1 sca, 2 abs, 3 sca·g. */
const F = 4

function scaleInto(target: Float64Array, factor: number, keep: boolean, fresh: Float64Array): void {
  const f = keep ? factor : 0
  for (let j = 0; j < target.length; j++) target[j] = target[j] * f + fresh[j]
}

/** The largest change of any wavelength's figures between two levels' sums (the rule of integrate.ts). */
function largestChange(a: Float64Array, b: Float64Array): number {
  let c = 0
  for (let j = 0; j < a.length; j += F) {
    const ext = b[j]
    if (!(ext > 0)) continue
    c = Math.max(c, Math.abs(a[j] - ext) / ext, Math.abs(a[j + 2] - b[j + 2]) / ext)
    const sca = b[j + 1]
    if (sca > 0) {
      c = Math.max(c, Math.abs(a[j + 1] - sca) / sca)
      const ga = a[j + 1] > 0 ? a[j + 3] / a[j + 1] : 0
      c = Math.max(c, Math.abs(ga - b[j + 3] / sca))
    }
  }
  return c
}

function* integrateSpectral(pop: Population, wavelengthsUm: readonly number[], cond: Conditions, opts: Required<SpectralOptions>, ws: OpticsWorkspace, into: Float64Array): Generator<void, { level: number; converged: boolean; evaluations: number }> {
  const kind = pop.kind
  const nw = wavelengthsUm.length
  const dry = wavelengthsUm.map((w) => dryIndicesAt(kind, w))
  const gMax = largestGrowthFactor(kind, cond)
  const shortest = Math.min(...wavelengthsUm)
  const axis = new SizeAxis((Math.PI * gMax) / shortest, 0.25, 2)
  const xTop = largestSizeParameter(pop.label, pop.segments, axis, shortest, 'Narrow the mode (a smaller median or geometric standard deviation).')
  const smooth = xTop <= SMOOTH_X
  const nodes = ws.nodes.spectralContext(
    JSON.stringify(['spectral', wavelengthsUm, dry, kind.coreShell, kind.fractions, kind.rule, kind.kappa, kind.phaseChange ?? null, cond]),
    nw
  )
  const width = nodes.width
  const wet: WetParticle = { n: 1, k: 0, coreRatio: 0, coreN: 1, coreK: 0 }
  const invLambda = wavelengthsUm.map((w) => Math.PI / w)
  let added = 0
  let evaluations = 0
  let work = 0
  let negligibleExt = 0

  /** Computes node i's cross-sections at every wavelength: its growth once, its wet index and Mie efficiencies at each. */
  const evaluate = (i: number, u: number) => {
    const d = Math.exp(u)
    const gf = particleGrowth(kind, d, cond.rhPercent, cond.history, cond.temperatureK)
    const dw = d * gf
    const area = 0.25 * Math.PI * dw * dw
    const v = nodes.values
    let at = width * i + 2
    for (let j = 0; j < nw; j++, at += F) {
      wetParticle(kind, dry[j], gf, wet)
      const x = dw * invLambda[j]
      const e: SphereEfficiencies = wet.coreRatio > 0 ? coatedSphereEfficiencies(x * wet.coreRatio, wet.coreN, wet.coreK, x, wet.n, wet.k, ws.mie) : sphereEfficiencies(x, wet.n, wet.k, ws.mie)
      v[at] = e.qext * area
      v[at + 1] = e.qsca * area
      v[at + 2] = e.qabs * area
      v[at + 3] = e.qsca * area * e.g
      work += e.terms
    }
    evaluations += nw
    ws.evaluations += nw
  }

  const addNode = (seg: { s: SizeSegment; u: number }, t: number, weight: number, sums: Float64Array) => {
    let i = nodes.find(t)
    const u = i >= 0 ? nodes.values[width * i] : axis.uAt(seg, t)
    seg.u = u
    const dens = seg.s.density(u)
    if (!(dens > 0)) return
    const dudt = i >= 0 ? nodes.values[width * i + 1] : axis.dudt(u)
    const w = weight * dens * dudt
    // as in integrate.ts: a node whose largest possible extinction is below 1e-10 of the previous level's
    // smallest total (over the wavelengths) cannot matter
    const dMax = Math.exp(u) * gMax
    if (w * 1.5 * Math.PI * dMax * dMax < negligibleExt) return
    if (i < 0) {
      i = nodes.add(t, u, dudt)
      added++
      evaluate(i, u)
    }
    const v = nodes.values
    const at = width * i + 2
    for (let j = 0; j < sums.length; j++) sums[j] += w * v[at + j]
  }

  const segs = pop.segments.map((s) => ({ s, t0: axis.t(s.lo), t1: axis.t(s.hi), u: s.lo }))
  const firstStep = segs.map((sg) => firstLatticeStep(sg.t0, sg.t1, sg.s.flat, opts.coarsestStep))
  const hasFlat = segs.some((sg) => sg.s.flat)
  const n = F * nw
  const smoothSums = new Float64Array(n)
  const flatSums = new Float64Array(n)
  const flatPrev = new Float64Array(n)
  const fresh = new Float64Array(n)
  const freshFlat = new Float64Array(n)
  const result = new Float64Array(n)
  const previous = new Float64Array(n)
  const lattice: LevelNodes = { base: 0, m0: 0, dm: 1, count: 0, h: 0, halfEnds: false }
  let lv = 0
  let lastChange = Infinity
  try {
    for (; lv <= opts.maxLevel; lv++) {
      fresh.fill(0)
      freshFlat.fill(0)
      for (let s = 0; s < segs.length; s++) {
        const sg = segs[s]
        sg.u = sg.s.lo
        const { base, m0, dm, count, h, halfEnds } = levelNodes(sg.t0, sg.t1, sg.s.flat, firstStep[s], lv, lattice)
        const target = sg.s.flat ? freshFlat : fresh
        for (let k = 0; k < count; k++) {
          addNode(sg, base + (m0 + k * dm) * h, halfEnds && (k === 0 || k === count - 1) ? 0.5 * h : h, target)
          if (work >= STEP_WORK) {
            work = 0
            yield
          }
        }
      }
      scaleInto(smoothSums, 0.5, lv > 0, fresh)
      flatPrev.set(flatSums)
      scaleInto(flatSums, 0.5, lv > 0, freshFlat)
      previous.set(result)
      const richardson = hasFlat && lv > 0
      for (let j = 0; j < n; j++) result[j] = smoothSums[j] + (richardson ? (4 * flatSums[j] - flatPrev[j]) / 3 : flatSums[j])
      if (lv > 0) {
        const change = largestChange(previous, result)
        if (change < opts.tolerance && (smooth || change + lastChange < opts.tolerance)) break
        lastChange = change
      }
      let smallest = Infinity
      for (let j = 0; j < n; j += F) smallest = Math.min(smallest, result[j])
      negligibleExt = 1e-10 * smallest
    }
  } finally {
    ws.nodes.grew(added * Math.ceil(width / NODE_FIELDS))
  }
  for (let j = 0; j < n; j++) into[j] += result[j]
  return { level: Math.min(lv, opts.maxLevel), converged: lv <= opts.maxLevel, evaluations }
}

/**
 * σext, σsca, σabs and g of an external mixture of populations at each of `wavelengthsUm` (µm), on size nodes
 * shared by all of them, pausing every few milliseconds of work (as bulkOpticsSteps).
 */
export function* spectralBulkSteps(populations: readonly Population[], wavelengthsUm: readonly number[], cond: Conditions, options: SpectralOptions, ws: OpticsWorkspace): Generator<void, SpectralBulk> {
  const opts: Required<SpectralOptions> = { maxLevel: 9, ...options }
  const nw = wavelengthsUm.length
  const total = new Float64Array(F * nw)
  let evaluations = 0
  let level = 0
  let converged = true
  for (const pop of populations) {
    const r = yield* integrateSpectral(pop, wavelengthsUm, cond, opts, ws, total)
    evaluations += r.evaluations
    level = Math.max(level, r.level)
    converged &&= r.converged
  }
  const out: SpectralBulk = { ext: new Float64Array(nw), sca: new Float64Array(nw), abs: new Float64Array(nw), g: new Float64Array(nw), evaluations, level, converged }
  for (let j = 0; j < nw; j++) {
    out.ext[j] = total[F * j]
    out.sca[j] = total[F * j + 1]
    out.abs[j] = total[F * j + 2]
    out.g[j] = total[F * j + 1] > 0 ? total[F * j + 3] / total[F * j + 1] : 0
  }
  return out
}
