/**
 * Monte Carlo propagation of input uncertainty through a sample's optics at 550 nm and its forcing.
 *
 * Each draw copies the sample and the site, perturbs the uncertain inputs by their drawn variates, and
 * computes `computeSampleOptics` (550 nm only, tolerance 1e-3, no angular output, only the figures a draw reads) and `sampleForcing`'s figures
 * (`sampleForcingFigures`: the same numbers without the texts a draw does not report).
 *
 * The infrared part: the band optics (20 wavelengths over 4–40 µm) are integrated once, for the unperturbed
 * sample, and each draw scales their coefficients by its wet volume over the unperturbed one. Particles are small
 * against these wavelengths, where absorption and extinction per particle go with its volume (the small-particle
 * limit; Bohren & Huffman 1983, §5.2); so a draw's changes of amount, size and water move the infrared part, while
 * a perturbed refractive index moves only the sunlight part. Integrating the bands in every draw made a run five
 * times slower (4.5 s against 22 s for the demo's 1000 draws on two cores). The infrared site inputs are drawn
 * as they are.
 *
 * Reproducibility and splitting: draw i's random numbers come from its own substream (seed, i) (see
 * random.ts), so `computeDraws(plan, i, j)` gives the same numbers whichever worker computes it and in
 * whatever order; `mergeDrawBlocks` puts blocks back in draw order. With Latin hypercube sampling (McKay,
 * Beckman & Conover 1979, Technometrics 21:239) input j of draw i falls in stratum π_j(i) of N equal-
 * probability strata, π_j a permutation drawn from the seed alone (so every worker knows it); draw i's own
 * uniform number places it inside its stratum.
 *
 * Early stop: at checkpoints (min_draws, then every CHECK_EVERY draws) on the draws 0..n−1 in order, the run
 * stops once the standard error of P(warm) is below the precision. Because checkpoints and draws are fixed,
 * the result does not depend on how the draws were split. Latin hypercube runs make all N draws (stopping
 * part way would leave strata empty).
 */
import { InputError } from '../errors.ts'
import { DEFAULT_VERDICT_MARGIN_WM2 } from '../climate/index.ts'
import { refractiveIndexAt, type Material } from '../materials/index.ts'
import { computeSampleOptics, OpticsWorkspace, resolveMaterial, sampleForcingFigures, studyMaterials } from '../optics/index.ts'
import type { LongwaveOptics, SampleOptics } from '../optics/types.ts'
import type { SampleForcingFigures } from '../optics/forcing.ts'
import type { Sample, Site, Study } from '../study/model.ts'
import { randomPermutation, Xoshiro128 } from './random.ts'
import { SITE_QUANTITIES, UNCERTAINTY_WAVELENGTH_NM, uncertaintySettingsSchema, type UncertainInput, type UncertaintySettings } from './settings.ts'
import { stoppingStandardError } from './stats.ts'
import { applyOp, copyJson, resolveInput } from './inputs.ts'

/** Relative accuracy of each draw's size integration. */
export const UNCERTAINTY_TOLERANCE = 1e-3
/** Draws between early-stop checkpoints. */
export const UNCERTAINTY_CHECK_EVERY = 50

/** The figures recorded per draw, in this order. */
export const UNCERTAINTY_FIGURES = [
  { key: 'ext', label: 'extinction coefficient at 550 nm', unit: 'Mm⁻¹' },
  { key: 'sca', label: 'scattering coefficient at 550 nm', unit: 'Mm⁻¹' },
  { key: 'abs', label: 'absorption coefficient at 550 nm', unit: 'Mm⁻¹' },
  { key: 'ssa', label: 'single-scattering albedo at 550 nm', unit: '' },
  { key: 'g', label: 'asymmetry parameter at 550 nm', unit: '' },
  { key: 'upscatter', label: 'upscatter fraction β̄ at 550 nm', unit: '' },
  { key: 'tau', label: 'layer optical depth at 550 nm', unit: '' },
  { key: 'forcing', label: 'thin-layer forcing, global-mean insolation (the sunlight part of the verdict)', unit: 'W m⁻²' },
  { key: 'forcing_daily_mean', label: "thin-layer forcing through the site's day", unit: 'W m⁻²' },
  { key: 'forcing_two_stream_toa', label: 'two-stream forcing at the top of the atmosphere', unit: 'W m⁻²' },
  { key: 'longwave_toa', label: 'infrared forcing at the top of the atmosphere (0 where the infrared part is left out)', unit: 'W m⁻²' },
  { key: 'net_toa', label: 'net forcing, sunlight + infrared (the forcing the verdict uses)', unit: 'W m⁻²' }
] as const

/** The figure P(warm), the early stop and the sensitivity ranking look at: the net forcing the verdict uses. */
export const UNCERTAINTY_VERDICT_FIGURE: UncertaintyFigureKey = 'net_toa'

export type UncertaintyFigureKey = (typeof UNCERTAINTY_FIGURES)[number]['key']
export const N_OUT = UNCERTAINTY_FIGURES.length
export const FORCING_INDEX = UNCERTAINTY_FIGURES.findIndex((f) => f.key === UNCERTAINTY_VERDICT_FIGURE)

/** Run settings (the document's settings, with command-line or app overrides). */
export interface UncertaintyRunOptions {
  draws?: number
  seed?: number
  sampling?: 'random' | 'latin-hypercube'
  precision?: number
  minDraws?: number
  /** Inputs to use instead of the document's (for the app's editor and for tests). */
  inputs?: UncertainInput[]
}

/** An input ready to draw: its variate's quantile function and what it changes. */
export interface ResolvedInput {
  label: string
  spec: UncertainInput
  /** Variate from a uniform number u in (0, 1) (truncation or clamping included). */
  variate: (u: number) => number
  /** Applies the variate to a draw's copy. */
  apply: (state: DrawState, v: number, draw: number) => void
}

/** A draw's working copies. */
export interface DrawState {
  sample: Sample
  site: Site
  /** Index perturbations per material id, applied in order. */
  index: Map<string, { part: 'n' | 'k'; op: UncertainInput['apply']; v: number; label: string }[]>
}

export interface UncertaintyPlan {
  sample: Sample
  site: Site
  study: Pick<Study, 'user_materials'>
  inputs: ResolvedInput[]
  draws: number
  seed: number
  sampling: 'random' | 'latin-hypercube'
  precision: number
  minDraws: number
  marginWm2: number
  /** Study materials at 550 nm. */
  own: Material[]
  /** Latin hypercube permutations, one per input. */
  strata: Uint32Array[] | null
  /**
   * The unperturbed sample's optics at 550 nm (brief: the figures a draw reads) with its infrared band optics (what
   * the next two come from); null in a plan made with `nominal` 'later' until completePlan.
   */
  nominal: SampleOptics | null
  /** Optics of the unperturbed sample when no input changes the optics (site inputs only). */
  fixedOptics: SampleOptics | null
  /** The unperturbed sample's infrared band optics and wet volume, which the draws scale (see the module note). */
  longwaveBase: { optics: LongwaveOptics; wetVolume: number } | null
  /**
   * True when an input changes what a node's value depends on besides its size (OWN_CONTEXT_QUANTITIES), so that
   * every draw has its own node contexts: the draws' workspace then recycles its node tables after each draw.
   */
  ownContexts: boolean
}

/** Quantities that change a particle's indices, water uptake or make-up (its node context, see nodeCache.ts). */
const OWN_CONTEXT_QUANTITIES: readonly UncertainInput['quantity'][] = ['n', 'k', 'density', 'kappa', 'rh']

/** Draws start..start+count−1: the variates (count × inputs) and the figures (count × UNCERTAINTY_FIGURES). */
export interface DrawBlock {
  start: number
  count: number
  inputs: Float64Array
  outputs: Float64Array
}

// ---------------------------------------------------------------------------------------------------------------
// Settings → plan

/** The document's uncertainty settings, checked (an absent field gives an empty object). */
export function readUncertaintySettings(raw: unknown): UncertaintySettings {
  if (raw === undefined) return {}
  const r = uncertaintySettingsSchema.safeParse(raw)
  if (!r.success) {
    const issue = r.error.issues[0]
    const path = ['uncertainty', ...issue.path].map((p) => (typeof p === 'number' ? `[${p}]` : `.${String(p)}`)).join('').replace(/^\./, '')
    const fix = (issue as { params?: { fix?: string } }).params?.fix ?? 'See the uncertainty settings described in the README.'
    throw new InputError(path, issue.message, fix)
  }
  return r.data
}


/**
 * Prepares a run for one sample of a study: its uncertain inputs (the study's settings for that sample plus
 * the site's, unless `options.inputs` replaces them) and the run settings (options override the document).
 * `nominal`, the `nominal` of a plan made from the same study, sample and options (a worker thread is sent
 * the main thread's), is used instead of computing the unperturbed sample's optics again; 'later' leaves them to
 * completePlan (computeDraws can start without them, see there).
 */
export function planUncertainty(study: Study, sampleName: string, options: UncertaintyRunOptions = {}, nominal?: SampleOptics | 'later'): UncertaintyPlan {
  const settings = readUncertaintySettings(study.uncertainty)
  const sample = study.samples.find((s) => s.name === sampleName)
  if (!sample) throw new InputError('uncertainty: sample', `the study has no sample "${sampleName}"`, `Use one of: ${study.samples.map((s) => `"${s.name}"`).join(', ')}.`)
  const own = studyMaterials({ user_materials: study.user_materials, wavelengths_nm: [UNCERTAINTY_WAVELENGTH_NM] })
  let specs: { spec: UncertainInput; where: string }[]
  if (options.inputs) specs = options.inputs.map((spec, i) => ({ spec, where: `uncertainty input ${i}` }))
  else {
    const mine = settings.samples?.[sampleName]?.inputs ?? []
    const siteInputs = settings.site?.inputs ?? []
    specs = [
      ...mine.map((spec, i) => ({ spec, where: `uncertainty.samples["${sampleName}"].inputs[${i}]` })),
      ...siteInputs.map((spec, i) => ({ spec, where: `uncertainty.site.inputs[${i}]` }))
    ]
    siteInputs.forEach((spec, i) => {
      if (!SITE_QUANTITIES.includes(spec.quantity)) throw new InputError(`uncertainty.site.inputs[${i}].quantity`, `"${spec.quantity}" is not a site quantity`, `Put it with the sample's inputs; the site takes ${SITE_QUANTITIES.join(', ')}.`)
    })
  }
  const inputs = specs.map(({ spec, where }) => resolveInput(spec, sample, study.site, own, where))
  const draws = options.draws ?? settings.draws ?? 1000
  const seed = options.seed ?? settings.seed ?? 1
  const sampling = options.sampling ?? settings.sampling ?? 'random'
  const precision = options.precision ?? settings.precision ?? 0.01
  const minDraws = options.minDraws ?? settings.min_draws ?? 200
  if (!(Number.isInteger(draws) && draws >= 1 && draws <= 1e7)) throw new InputError('uncertainty: draws', `${draws} is not a whole number from 1 to 10000000`, 'Give the number of draws, e.g. 1000.')
  if (!(Number.isInteger(seed) && seed >= 0 && seed <= 0xffffffff)) throw new InputError('uncertainty: seed', `${seed} is not a whole number from 0 to 4294967295`, 'Give a whole number, e.g. 1.')
  if (!(precision >= 0 && precision < 0.5)) throw new InputError('uncertainty: precision', `${precision} is not from 0 to 0.5`, 'Give e.g. 0.01, or 0 never to stop early.')
  if (!(Number.isInteger(minDraws) && minDraws >= 1)) throw new InputError('uncertainty: min_draws', `${minDraws} is not a whole number of draws`, 'Give e.g. 200.')
  let strata: Uint32Array[] | null = null
  if (sampling === 'latin-hypercube') strata = inputs.map((_, j) => randomPermutation(draws, new Xoshiro128(seed, j, 1)))
  const plan: UncertaintyPlan = {
    sample, site: study.site, study: { user_materials: study.user_materials }, inputs, draws, seed, sampling, precision, minDraws,
    marginWm2: study.verdict_margin_w_m2 ?? DEFAULT_VERDICT_MARGIN_WM2, own, strata,
    nominal: null, fixedOptics: null, longwaveBase: null,
    ownContexts: inputs.some((r) => OWN_CONTEXT_QUANTITIES.includes(r.spec.quantity))
  }
  if (nominal !== 'later') completePlan(plan, nominal)
  return plan
}

/** True when every input is a site quantity (the draws then share the unperturbed sample's optics). */
function siteOnly(plan: Pick<UncertaintyPlan, 'inputs'>): boolean {
  return plan.inputs.every((r) => SITE_QUANTITIES.includes(r.spec.quantity))
}

/**
 * Gives a plan its unperturbed sample's optics (`nominal`, or computed here) and what the draws take from them;
 * nothing where it has them already.
 */
export function completePlan(plan: UncertaintyPlan, nominal?: SampleOptics): void {
  if (plan.nominal) return
  const n = nominal ?? nominalOptics(plan, copyJson(plan.sample), new OpticsWorkspace())
  plan.nominal = n
  if (siteOnly(plan)) plan.fixedOptics = n
  else if (n.longwave) plan.longwaveBase = { optics: n.longwave, wetVolume: n.wet_volume_um3_cm3 }
}

// ---------------------------------------------------------------------------------------------------------------
// Draws

function perturbedMaterials(plan: Pick<UncertaintyPlan, 'own'>, index: DrawState['index']): Material[] {
  if (!index.size) return plan.own
  const extra: Material[] = []
  for (const [id, ops] of index) {
    const base = resolveMaterial(id, plan.own, `uncertainty: material ${id}`)
    const perturb = (part: 'n' | 'k', x: number) => {
      for (const o of ops) if (o.part === part) x = applyOp(o.op, x, o.v)
      return x
    }
    const text = ops.map((o) => `${o.part} ${o.op} ${o.v}`).join(', ')
    extra.push({
      ...base,
      index: {
        kind: 'expression',
        nExpression: `${id} n perturbed (${text})`,
        kExpression: `${id} k perturbed (${text})`,
        evaluateN: (wl) => perturb('n', refractiveIndexAt(base, wl).n),
        evaluateK: (wl) => perturb('k', refractiveIndexAt(base, wl).k)
      }
    })
  }
  return [...extra, ...plan.own]
}

/**
 * Node limit of a draws' workspace. A draw with its own humidity or indices has its own node context, never used
 * again: under the default limit (400,000 nodes, about 220 MB with the angular rows) a run kept them all and grew
 * new tables for each draw; under this one the cache keeps the last few dozen draws' nodes and hands dropped
 * tables on to new contexts (nodeCache.ts). Draws that share a context (only amounts, sizes or the site drawn)
 * still find its nodes.
 */
export const UNCERTAINTY_NODE_LIMIT = 20_000

/** A workspace for computing draws (see UNCERTAINTY_NODE_LIMIT). */
export function drawWorkspace(): OpticsWorkspace {
  return new OpticsWorkspace(UNCERTAINTY_NODE_LIMIT)
}

/** The unperturbed sample's optics at 550 nm, with its infrared band optics. */
function nominalOptics(plan: Pick<UncertaintyPlan, 'study' | 'own'>, sample: Sample, ws: OpticsWorkspace): SampleOptics {
  return computeSampleOptics(
    sample,
    { wavelengths_nm: [UNCERTAINTY_WAVELENGTH_NM], user_materials: plan.study.user_materials },
    { tolerance: UNCERTAINTY_TOLERANCE, angularWavelengthsNm: [], workspace: ws, brief: true },
    perturbedMaterials(plan, new Map())
  )
}

/** A draw's optics at 550 nm, its infrared band optics scaled from the unperturbed sample's (module note). */
export function drawOptics(plan: UncertaintyPlan, sample: Sample, index: DrawState['index'], ws: OpticsWorkspace): SampleOptics {
  const base = plan.longwaveBase
  if (!base) return nominalOptics(plan, sample, ws)
  return withLongwave(base, sunlightOptics(plan, sample, index, ws))
}

/** A draw's optics at 550 nm without the infrared part. */
function sunlightOptics(plan: UncertaintyPlan, sample: Sample, index: DrawState['index'], ws: OpticsWorkspace): SampleOptics {
  return computeSampleOptics(
    sample,
    { wavelengths_nm: [UNCERTAINTY_WAVELENGTH_NM], user_materials: plan.study.user_materials },
    { tolerance: UNCERTAINTY_TOLERANCE, angularWavelengthsNm: [], workspace: ws, longwave: false, brief: true },
    perturbedMaterials(plan, index)
  )
}

/** A draw's optics given its infrared band optics: the unperturbed sample's scaled by the wet volumes' ratio. */
function withLongwave(base: NonNullable<UncertaintyPlan['longwaveBase']>, optics: SampleOptics): SampleOptics {
  const f = base.wetVolume > 0 ? optics.wet_volume_um3_cm3 / base.wetVolume : 0
  optics.longwave = base.optics.withheld
    ? base.optics
    : { withheld: null, bands: base.optics.bands.map((b) => ({ ...b, ext: b.ext * f, sca: b.sca * f, abs: b.abs * f })) }
  return optics
}

/** The figures of one computed draw, in UNCERTAINTY_FIGURES order, into `out` at `offset`. */
export function recordFigures(optics: SampleOptics, forcing: SampleForcingFigures, out: Float64Array, offset: number): void {
  const r = optics.wavelengths[0]
  out[offset] = r.ext
  out[offset + 1] = r.sca
  out[offset + 2] = r.abs
  out[offset + 3] = r.ssa
  out[offset + 4] = r.g
  out[offset + 5] = r.upscatter_fraction
  out[offset + 6] = r.optical_depth
  out[offset + 7] = forcing.thin_layer_w_m2
  out[offset + 8] = forcing.daily_mean_w_m2
  out[offset + 9] = forcing.two_stream_toa_w_m2
  out[offset + 10] = forcing.longwave_toa_w_m2 ?? 0
  out[offset + 11] = forcing.net_toa_w_m2
}

/** The uniform numbers of draw i (one per input), Latin hypercube strata applied. */
export function drawUniforms(plan: Pick<UncertaintyPlan, 'seed' | 'draws' | 'strata'>, i: number, count: number, out = new Float64Array(count)): Float64Array {
  const rng = new Xoshiro128(plan.seed, i, 0)
  for (let j = 0; j < count; j++) {
    const u = rng.nextUniform()
    out[j] = plan.strata ? (plan.strata[j][i] + u) / plan.draws : u
  }
  return out
}

/**
 * Computes draws start..end−1 (end exclusive) of a plan. Deterministic: the same plan and draw indices give
 * the same numbers on any worker. `keepGoing` is asked before each draw; false stops the block early
 * (its `count` then says how many were made).
 *
 * A plan made without its unperturbed optics (planUncertainty's 'later') gets them from `nominalFrom` (asked before
 * each draw, with `wait` false, and with `wait` true when the block cannot go on without them: it must then return
 * them), or computes them itself without it. Until they come, each draw's sunlight optics are computed and its
 * forcing, which needs the infrared part scaled from them, waits: a worker thread need not wait for the main
 * thread's first computation to start drawing. The same numbers either way.
 */
export function computeDraws(plan: UncertaintyPlan, start: number, end: number, workspace = drawWorkspace(), keepGoing?: () => boolean, nominalFrom?: (wait: boolean) => SampleOptics | null): DrawBlock {
  if (!(Number.isInteger(start) && Number.isInteger(end) && start >= 0 && end >= start && end <= plan.draws)) {
    throw new InputError('uncertainty: draws', `draws ${start} to ${end} are not within 0 to ${plan.draws}`, 'Ask for draws inside the plan.')
  }
  const nIn = plan.inputs.length
  const inputs = new Float64Array((end - start) * nIn)
  const outputs = new Float64Array((end - start) * N_OUT)
  const u = new Float64Array(nIn)
  /** Draws whose forcing waits for the plan's unperturbed optics: their sunlight optics, site and place. */
  const waiting: { optics: SampleOptics; site: Site; at: number }[] = []
  const finishDraw = (optics: SampleOptics, site: Site, at: number) => recordFigures(optics, sampleForcingFigures(optics, site), outputs, at)
  const awaitNominal = (wait: boolean) => {
    if (!nominalFrom) completePlan(plan)
    else {
      const n = nominalFrom(wait)
      if (n) completePlan(plan, n)
      else if (wait) throw new Error('computeDraws: nominalFrom(true) gave no optics')
    }
    if (!plan.nominal) return
    const base = plan.longwaveBase
    if (waiting.length && !base) throw new Error('computeDraws: draws wait for an infrared part the plan does not have')
    for (const w of waiting.splice(0)) finishDraw(withLongwave(base!, w.optics), w.site, w.at)
  }
  // without the plan's optics only draws that perturb the sample can start (the others use those optics)
  if (!plan.nominal) awaitNominal(!nominalFrom || siteOnly(plan))
  let done = 0
  for (let i = start; i < end; i++) {
    if (keepGoing && !keepGoing()) break
    if (!plan.nominal) awaitNominal(false)
    drawUniforms(plan, i, nIn, u)
    const state: DrawState = { sample: plan.fixedOptics ? plan.sample : copyJson(plan.sample), site: { ...plan.site }, index: new Map() }
    for (let j = 0; j < nIn; j++) {
      const v = plan.inputs[j].variate(u[j])
      inputs[done * nIn + j] = v
      plan.inputs[j].apply(state, v, i)
    }
    if (plan.nominal) finishDraw(plan.fixedOptics ?? drawOptics(plan, state.sample, state.index, workspace), state.site, done * N_OUT)
    else waiting.push({ optics: sunlightOptics(plan, state.sample, state.index, workspace), site: state.site, at: done * N_OUT })
    // this draw's nodes will not serve another: their tables serve the next draw (a result does not depend on
    // which table holds its nodes: the output is the same byte for byte, test/cli/uncertainty-regression.test.ts)
    if (plan.ownContexts) workspace.nodes.recycle()
    done++
  }
  if (waiting.length) awaitNominal(true)
  return { start, count: done, inputs: inputs.subarray(0, done * nIn), outputs: outputs.subarray(0, done * N_OUT) }
}

/** Joins blocks into one, in draw order; they must cover draws contiguously from the first block's start. */
export function mergeDrawBlocks(blocks: readonly DrawBlock[], nInputs: number): DrawBlock {
  const sorted = blocks.filter((b) => b.count > 0).sort((a, b) => a.start - b.start)
  const start = sorted.length ? sorted[0].start : 0
  let count = 0
  for (const b of sorted) {
    if (b.start !== start + count) throw new InputError('uncertainty: merge', `draws ${start + count} to ${b.start - 1} are missing`, 'Merge blocks that follow each other without gaps.')
    count += b.count
  }
  const inputs = new Float64Array(count * nInputs)
  const outputs = new Float64Array(count * N_OUT)
  let at = 0
  for (const b of sorted) {
    inputs.set(b.inputs.subarray(0, b.count * nInputs), at * nInputs)
    outputs.set(b.outputs.subarray(0, b.count * N_OUT), at * N_OUT)
    at += b.count
  }
  return { start, count, inputs, outputs }
}

/** Column `j` of a block's figures (or inputs, with `which`), over its first `count` draws. */
export function drawColumn(block: DrawBlock, j: number, which: 'outputs' | 'inputs', width: number, count = block.count): Float64Array {
  const src = which === 'outputs' ? block.outputs : block.inputs
  const out = new Float64Array(count)
  for (let i = 0; i < count; i++) out[i] = src[i * width + j]
  return out
}

/**
 * Where a run that has made draws 0..block.count−1 stops: the first checkpoint (min_draws, min_draws +
 * CHECK_EVERY, …) at which the standard error of P(warm) (with Laplace's p̃, see stoppingStandardError) is
 * below the precision; null if none yet. Latin hypercube runs and precision 0 never stop early.
 */
export function earlyStopPoint(plan: UncertaintyPlan, block: DrawBlock): number | null {
  if (plan.sampling === 'latin-hypercube' || plan.precision <= 0 || block.start !== 0) return null
  let positives = 0
  let next = plan.minDraws
  for (let i = 0; i < block.count; i++) {
    if (block.outputs[i * N_OUT + FORCING_INDEX] > 0) positives++
    const n = i + 1
    if (n === next) {
      if (n < plan.draws && stoppingStandardError(positives, n) < plan.precision) return n
      next += UNCERTAINTY_CHECK_EVERY
    }
  }
  return null
}

