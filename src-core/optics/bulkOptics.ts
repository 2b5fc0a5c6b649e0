/**
 * The size integration's public entry points: the bulk optics of an external mixture of populations at one
 * wavelength, integrated population by population (integrate.ts, whose module comment describes the quadrature)
 * and put together here (the ratios, the upscatter figures with their control variate, the phase function).
 */
import { shiftToAsymmetry, UPSCATTER_COS_ZENITH, upscatterFrom } from './upscatter.ts'
import { ErrorBudget, Sums } from './levelSums.ts'
import { DEFAULT_TOLERANCE, integratePopulation, type Conditions, type IntegrationOptions, type Population } from './integrate.ts'
import { OpticsWorkspace } from './workspace.ts'

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


/**
 * The order the populations are integrated in. Populations of one particle kind share their nodes' context, so among
 * them the largest go first: the one that needs a node's angular row most (a coarse mode's tail) computes it, and the
 * others find it (see NodeVisitor.addNode, nodeVisitor.ts). Kinds go in the order of their largest sizes, smallest
 * first: a population is judged against the sample's figures so far (integrate.ts), so the coarse, resonant ones,
 * whose refinement costs most, come last and stop once they are within the tolerance of the whole sample.
 * A stable order for equal sizes.
 */
function integrationOrder(populations: readonly Population[]): readonly Population[] {
  if (populations.length < 2) return populations
  const top = (p: Population) => p.segments.reduce((m, sg) => Math.max(m, sg.hi), -Infinity)
  const kindTop = new Map<Population['kind'], number>()
  for (const p of populations) kindTop.set(p.kind, Math.max(kindTop.get(p.kind) ?? -Infinity, top(p)))
  const ascending = (x: number, y: number) => (x === y ? 0 : x - y) // populations without particles have top −∞
  return [...populations].sort((a, b) => ascending(kindTop.get(a.kind)!, kindTop.get(b.kind)!) || ascending(top(b), top(a)))
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
  const budget = new ErrorBudget()
  for (const pop of integrationOrder(populations)) {
    const r = yield* integratePopulation(pop, wavelengthUm, cond, opts, ws, total, budget)
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

