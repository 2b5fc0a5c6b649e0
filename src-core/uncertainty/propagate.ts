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
import { DEFAULT_VERDICT_MARGIN_WM2, LONGWAVE_INPUT_RANGES } from '../climate/index.ts'
import { getMaterial, refractiveIndexAt, type Material } from '../materials/index.ts'
import { computeSampleOptics, OpticsWorkspace, resolveComposition, resolveMaterial, sampleForcingFigures, siteLongwaveInputs, siteSurfaceAlbedo, studyMaterials } from '../optics/index.ts'
import type { LongwaveOptics, SampleOptics } from '../optics/types.ts'
import type { SampleForcingFigures } from '../optics/forcing.ts'
import { MAX_GSD } from '../sizes/index.ts'
import type { Composition, Sample, Site, Study } from '../study/model.ts'
import { normalCdf, normalQuantile, randomPermutation, Xoshiro128 } from './random.ts'
import { SITE_QUANTITIES, uncertaintySettingsSchema, type UncertainInput, type UncertaintySettings } from './settings.ts'
import { probabilityPositive, spearmanRankCorrelation, stoppingStandardError, summarizeValues, type FigureSummary, type ProbabilityEstimate } from './stats.ts'

/** The wavelength (nm) of every figure of an uncertainty run. */
export const UNCERTAINTY_WAVELENGTH_NM = 550
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
const N_OUT = UNCERTAINTY_FIGURES.length
const FORCING_INDEX = UNCERTAINTY_FIGURES.findIndex((f) => f.key === UNCERTAINTY_VERDICT_FIGURE)

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

const PROB_EDGE = 1e-6

/** The variate's quantile function for a distribution with optional bounds. */
export function variateQuantile(input: Pick<UncertainInput, 'distribution' | 'bounds'>, where: string): (u: number) => number {
  const d = input.distribution
  let q: (u: number) => number
  let cdf: (x: number) => number
  if (d.kind === 'normal') {
    if (!(d.sd >= 0 && Number.isFinite(d.mean))) throw new InputError(`${where}: distribution`, 'a normal distribution needs a finite mean and sd ≥ 0', 'Give mean and sd ≥ 0.')
    q = d.sd === 0 ? () => d.mean : (u) => d.mean + d.sd * normalQuantile(u)
    cdf = d.sd === 0 ? (x) => (x < d.mean ? 0 : 1) : (x) => normalCdf((x - d.mean) / d.sd)
  } else if (d.kind === 'lognormal') {
    if (!(d.median > 0 && d.gsd >= 1)) throw new InputError(`${where}: distribution`, 'a lognormal distribution needs median > 0 and gsd ≥ 1', 'Give median > 0 and gsd ≥ 1.')
    const s = Math.log(d.gsd)
    q = s === 0 ? () => d.median : (u) => d.median * Math.exp(s * normalQuantile(u))
    cdf = s === 0 ? (x) => (x < d.median ? 0 : 1) : (x) => (x <= 0 ? 0 : normalCdf(Math.log(x / d.median) / s))
  } else {
    if (!(d.hi >= d.lo)) throw new InputError(`${where}: distribution`, `a uniform distribution needs hi ≥ lo (it has ${d.lo} to ${d.hi})`, 'Swap lo and hi.')
    q = (u) => d.lo + u * (d.hi - d.lo)
    cdf = (x) => (d.hi === d.lo ? (x < d.lo ? 0 : 1) : Math.min(1, Math.max(0, (x - d.lo) / (d.hi - d.lo))))
  }
  const b = input.bounds
  if (!b) return q
  const lo = b.lo ?? -Infinity
  const hi = b.hi ?? Infinity
  if (!(hi >= lo)) throw new InputError(`${where}: bounds`, `the upper bound ${hi} is below the lower bound ${lo}`, 'Swap the bounds.')
  if (b.method === 'clamp') return (u) => Math.min(hi, Math.max(lo, q(u)))
  const fLo = Number.isFinite(lo) ? cdf(lo) : 0
  const fHi = Number.isFinite(hi) ? cdf(hi) : 1
  if (!(fHi > fLo)) {
    // A degenerate distribution inside the bounds is fine; otherwise nothing is left to draw from.
    const v = q(0.5)
    if (v >= lo && v <= hi && fHi === fLo && (d.kind !== 'uniform' || d.lo === d.hi)) return () => v
    throw new InputError(`${where}: bounds`, `the bounds ${lo} to ${hi} leave no probability to draw from`, 'Widen the bounds so that they overlap the distribution.')
  }
  return (u) => Math.min(hi, Math.max(lo, q(fLo + u * (fHi - fLo))))
}

/** Valid range of each perturbed quantity (a draw outside is refused). */
const VALID: Record<UncertainInput['quantity'], { lo: number; hi: number; loOpen?: boolean; hiOpen?: boolean; unit: string }> = {
  n: { lo: 0.05, hi: 10, unit: '' },
  k: { lo: 0, hi: 10, unit: '' },
  median: { lo: 0, hi: 1000, loOpen: true, unit: 'µm' },
  gsd: { lo: 1, hi: MAX_GSD, loOpen: true, unit: '' },
  amount: { lo: 0, hi: Infinity, unit: '' },
  density: { lo: 0, hi: 25, loOpen: true, unit: 'g cm⁻³' },
  kappa: { lo: 0, hi: 2, unit: '' },
  rh: { lo: 0, hi: 100, hiOpen: true, unit: '%' },
  layer: { lo: 0, hi: 50000, loOpen: true, unit: '' },
  surface_albedo: { lo: 0, hi: 1, unit: '' },
  cloud_fraction: { lo: 0, hi: 1, unit: '' },
  transmittance: { lo: 0, hi: 1, loOpen: true, unit: '' },
  surface_temperature: { lo: LONGWAVE_INPUT_RANGES.surface_temperature_k.lo, hi: LONGWAVE_INPUT_RANGES.surface_temperature_k.hi, unit: 'K' },
  surface_emissivity: { lo: LONGWAVE_INPUT_RANGES.surface_emissivity.lo, hi: LONGWAVE_INPUT_RANGES.surface_emissivity.hi, unit: '' },
  layer_height: { lo: LONGWAVE_INPUT_RANGES.layer_height_km.lo, hi: LONGWAVE_INPUT_RANGES.layer_height_km.hi, unit: 'km' },
  water_column: { lo: LONGWAVE_INPUT_RANGES.water_column_cm.lo, hi: LONGWAVE_INPUT_RANGES.water_column_cm.hi, unit: 'cm' },
  spread: { lo: -Infinity, hi: Infinity, unit: 'spreads' }
}

/** The site field each infrared quantity sets, and how its current value (default filled in) is read. */
const INFRARED_SITE_FIELD = {
  surface_temperature: { field: 'surface_temperature_k', read: (s: Site) => siteLongwaveInputs(s).surfaceTemperatureK },
  surface_emissivity: { field: 'surface_emissivity', read: (s: Site) => siteLongwaveInputs(s).surfaceEmissivity },
  layer_height: { field: 'layer_height_km', read: (s: Site) => siteLongwaveInputs(s).layerHeightKm },
  water_column: { field: 'water_column_cm', read: (s: Site) => siteLongwaveInputs(s).waterColumnCm }
} as const

function inRange(q: UncertainInput['quantity'], v: number): boolean {
  const r = VALID[q]
  if (!Number.isFinite(v)) return false
  return (r.loOpen ? v > r.lo : v >= r.lo) && (r.hiOpen ? v < r.hi : v <= r.hi)
}

function applyOp(op: UncertainInput['apply'], base: number, v: number): number {
  return op === 'factor' ? base * v : op === 'add' ? base + v : v
}

function rangeText(q: UncertainInput['quantity']): string {
  const r = VALID[q]
  return `${r.loOpen ? '(' : '['}${r.lo}, ${r.hi}${r.hiOpen ? ')' : ']'}${r.unit ? ' ' + r.unit : ''}`
}

/** Throws unless the perturbed value is valid; `draw` < 0 means the planning check. */
function checkValue(label: string, q: UncertainInput['quantity'], value: number, draw: number, v: number): void {
  if (inRange(q, value)) return
  const when = draw < 0 ? 'can give (within its 1e-6 to 1 − 1e-6 quantiles)' : `gave in draw ${draw}`
  throw new InputError(
    `uncertainty: ${label}`,
    `the variate ${Number(v.toPrecision(6))} ${when} the value ${Number(value.toPrecision(6))}, outside the valid range ${rangeText(q)}`,
    'Narrow the distribution or give bounds (e.g. "bounds": { "lo": …, "hi": …, "method": "resample" }), or use a lognormal factor for a positive quantity.'
  )
}

/** A catalogue component's display name (an own component keeps its id). */
function componentName(id: string | undefined): string {
  if (id === undefined) return 'a component'
  try {
    return getMaterial(id).name
  } catch {
    return id
  }
}

function defaultLabel(s: UncertainInput): string {
  const what =
    s.quantity === 'n' || s.quantity === 'k'
      ? `${s.quantity} of ${componentName(s.material)}`
      : s.quantity === 'median' || s.quantity === 'gsd' || s.quantity === 'amount'
        ? `${s.quantity === 'median' ? 'median diameter' : s.quantity} of ${s.mode === undefined ? 'every mode' : typeof s.mode === 'number' ? `mode ${s.mode}` : `mode "${s.mode}"`}`
        : s.quantity === 'rh'
          ? 'relative humidity'
          : s.quantity === 'spread'
            ? `measured bins within their ${s.spread_scale === 'standard-deviation' ? 'standard deviation' : 'standard error'}`
            : s.quantity.replace(/_/g, ' ')
  return `${what} (${s.apply})`
}

/**
 * Deep copy of a plain JSON value (study documents are plain JSON): what JSON.parse(JSON.stringify(v)) gives (keys
 * in the same order, undefined members left out of objects and null in arrays, −0 as 0, NaN and ±Infinity as
 * null), without the text in between (the round trip was 2 % of a draw).
 */
function copyJson<T>(v: T): T {
  return copyPlain(v) as T
}

function copyPlain(v: unknown): unknown {
  if (typeof v === 'number') return Number.isFinite(v) ? (v === 0 ? 0 : v) : null
  if (v === null || typeof v !== 'object') return v
  if (Array.isArray(v)) {
    const out: unknown[] = new Array(v.length)
    for (let i = 0; i < v.length; i++) out[i] = skippedByJson(v[i]) ? null : copyPlain(v[i])
    return out
  }
  const out: Record<string, unknown> = {}
  for (const k of Object.keys(v)) {
    const x = (v as Record<string, unknown>)[k]
    if (!skippedByJson(x)) out[k] = copyPlain(x)
  }
  return out
}

function skippedByJson(x: unknown): boolean {
  return x === undefined || typeof x === 'function' || typeof x === 'symbol'
}

/** Every composition of a sample: the sample's, then each mode's own (null where a mode has none). */
function compositionsOf(sample: Sample): (Composition | null)[] {
  const out: (Composition | null)[] = [sample.composition]
  if (sample.size.kind === 'modes') for (const m of sample.size.modes) out.push(m.composition ?? null)
  return out
}

/** Resolves one input against the sample: checks it applies and that its draws stay valid. */
function resolveInput(spec: UncertainInput, sample: Sample, site: Site, own: Material[], where: string): ResolvedInput {
  const label = spec.name ?? defaultLabel(spec)
  const variate = variateQuantile(spec, where)
  const vLo = variate(PROB_EDGE)
  const vHi = variate(1 - PROB_EDGE)
  const vMid = variate(0.5)
  /** Checks the perturbed value at the variate's extremes and median for each base value. */
  const checkBases = (bases: number[]) => {
    for (const b of bases) for (const v of [vLo, vMid, vHi]) checkValue(label, spec.quantity, applyOp(spec.apply, b, v), -1, v)
  }
  const q = spec.quantity
  const modes = sample.size.kind === 'modes' ? sample.size.modes : null
  const modeIndices = (): number[] => {
    if (!modes) return []
    if (spec.mode === undefined) return modes.map((_, i) => i)
    const i = typeof spec.mode === 'number' ? spec.mode : modes.findIndex((m) => m.name === spec.mode)
    if (!(i >= 0 && i < modes.length)) {
      throw new InputError(`${where}: mode`, `sample "${sample.name}" has no mode ${JSON.stringify(spec.mode)} (it has ${modes.length}: ${modes.map((m, j) => `${j}${m.name ? ` "${m.name}"` : ''}`).join(', ')})`, 'Give the mode as its 0-based position or its name, or leave "mode" out for every mode.')
    }
    return [i]
  }
  if ((q === 'n' || q === 'k') && !spec.material) throw new InputError(`${where}: material`, `an uncertain ${q} needs the component's id`, 'Add "material", e.g. "black-carbon".')
  if (spec.material !== undefined && q !== 'n' && q !== 'k') throw new InputError(`${where}: material`, `"material" only applies to n and k, not to ${q}`, 'Remove "material".')
  if (spec.spread_scale !== undefined && q !== 'spread') throw new InputError(`${where}: spread_scale`, `"spread_scale" only applies to spread, not to ${q}`, 'Remove "spread_scale".')
  if (spec.mode !== undefined && q !== 'median' && q !== 'gsd' && q !== 'amount') throw new InputError(`${where}: mode`, `"mode" only applies to median, gsd and amount, not to ${q}`, 'Remove "mode".')

  switch (q) {
    case 'n':
    case 'k': {
      const id = spec.material!
      const used = compositionsOf(sample).some((c) => c?.components.some((s) => s.material === id))
      if (!used) throw new InputError(`${where}: material`, `sample "${sample.name}" has no component "${id}"`, `Use one of its components: ${[...new Set(compositionsOf(sample).flatMap((c) => c?.components.map((s) => s.material) ?? []))].join(', ')}.`)
      const base = refractiveIndexAt(resolveMaterial(id, own, `${where}: material`), UNCERTAINTY_WAVELENGTH_NM / 1000)
      checkBases([base[q]])
      return {
        label, spec, variate,
        apply: (st, v) => {
          const list = st.index.get(id) ?? []
          list.push({ part: q, op: spec.apply, v, label })
          st.index.set(id, list)
        }
      }
    }
    case 'median':
    case 'gsd':
    case 'amount': {
      if (!modes) {
        if (q === 'gsd') throw new InputError(`${where}: quantity`, `sample "${sample.name}" has measured bins, which have no gsd`, 'Use "median" (scales the bin diameters) or "amount" (scales the bin values).')
        if (spec.apply !== 'factor') throw new InputError(`${where}: apply`, `for measured bins, ${q} can only be changed by a factor`, 'Use "apply": "factor".')
        if (spec.mode !== undefined) throw new InputError(`${where}: mode`, `sample "${sample.name}" has measured bins, not modes`, 'Remove "mode".')
        checkBases([1]) // a factor on every bin
        return {
          label, spec, variate,
          apply: (st, v, draw) => {
            if (st.sample.size.kind !== 'bins') return
            const b = st.sample.size.bins
            if (!(v > 0)) checkValue(label, q, v, draw, v)
            if (q === 'median') b.diameters = b.diameters.map((d) => d * v)
            else b.values = b.values.map((x) => x * v)
          }
        }
      }
      const idx = modeIndices()
      const baseOf = (m: (typeof modes)[number]): number => (q === 'median' ? m.median_um : q === 'gsd' ? m.gsd : m.by === 'number' ? m.number_cm3 : m.by === 'volume' ? m.volume_um3_cm3 : m.mass_ug_m3)
      checkBases(idx.map((i) => baseOf(modes[i])))
      return {
        label, spec, variate,
        apply: (st, v, draw) => {
          if (st.sample.size.kind !== 'modes') return
          for (const i of idx) {
            const m = st.sample.size.modes[i]
            const value = applyOp(spec.apply, baseOf(m), v)
            checkValue(label, q, value, draw, v)
            if (q === 'median') m.median_um = value
            else if (q === 'gsd') m.gsd = value
            else if (m.by === 'number') m.number_cm3 = value
            else if (m.by === 'volume') m.volume_um3_cm3 = value
            else m.mass_ug_m3 = value
          }
        }
      }
    }
    case 'density':
    case 'kappa': {
      const comps = compositionsOf(sample)
      const bases = comps.map((c, i) => (c ? resolveComposition(c, own, `${where}: composition ${i}`) : null)).map((k) => (k ? (q === 'density' ? k.densityGcm3 : k.kappa) : NaN))
      checkBases(bases.filter((b) => Number.isFinite(b)))
      return {
        label, spec, variate,
        apply: (st, v, draw) => {
          compositionsOf(st.sample).forEach((c, i) => {
            if (!c) return
            const current = (q === 'density' ? c.density_g_cm3 : c.kappa) ?? bases[i]
            const value = applyOp(spec.apply, current, v)
            checkValue(label, q, value, draw, v)
            if (q === 'density') c.density_g_cm3 = value
            else c.kappa = value
          })
        }
      }
    }
    case 'rh': {
      checkBases([sample.rh_percent])
      return {
        label, spec, variate,
        apply: (st, v, draw) => {
          const value = applyOp(spec.apply, st.sample.rh_percent, v)
          checkValue(label, q, value, draw, v)
          st.sample.rh_percent = value
        }
      }
    }
    case 'layer': {
      const l = sample.layer
      const base = l.kind === 'depth' ? l.depth_m : l.kind === 'scale-height' ? l.scale_height_m : l.aod_550
      checkBases([base])
      return {
        label, spec, variate,
        apply: (st, v, draw) => {
          const L = st.sample.layer
          const cur = L.kind === 'depth' ? L.depth_m : L.kind === 'scale-height' ? L.scale_height_m : L.aod_550
          const value = applyOp(spec.apply, cur, v)
          checkValue(label, q, value, draw, v)
          if (L.kind === 'depth') L.depth_m = value
          else if (L.kind === 'scale-height') L.scale_height_m = value
          else L.aod_550 = value
        }
      }
    }
    case 'spread': {
      const b = sample.size.kind === 'bins' ? sample.size.bins : undefined
      if (!b?.spread) throw new InputError(`${where}: quantity`, `sample "${sample.name}" has no spread kept with its bins (only a stretch of a station record made a sample has one)`, 'Choose another quantity, or make the sample from a stretch of the station record.')
      if (spec.apply !== 'add') throw new InputError(`${where}: apply`, 'the spread is drawn as an offset in units of the spread', 'Use "apply": "add" with a normal distribution of mean 0 and sd 1.')
      const sigma = spreadSigmas(b.values, b.spread, spec.spread_scale === 'standard-deviation' ? 1 : Math.sqrt(b.rows_averaged ?? 1))
      return {
        label, spec, variate,
        apply: (st, v) => {
          if (st.sample.size.kind !== 'bins') return
          const x = st.sample.size.bins
          x.values = x.values.map((m, j) => (sigma[j] > 0 ? m * Math.exp(sigma[j] * v - (sigma[j] * sigma[j]) / 2) : m))
        }
      }
    }
    case 'surface_albedo':
    case 'cloud_fraction':
    case 'transmittance': {
      const baseOf = (s: Site) => (q === 'surface_albedo' ? siteSurfaceAlbedo(s) : q === 'cloud_fraction' ? s.cloud_fraction : s.transmittance)
      checkBases([baseOf(site)])
      return {
        label, spec, variate,
        apply: (st, v, draw) => {
          const value = applyOp(spec.apply, baseOf(st.site), v)
          checkValue(label, q, value, draw, v)
          if (q === 'surface_albedo') {
            st.site.surface = 'custom'
            st.site.surface_albedo = value
          } else if (q === 'cloud_fraction') st.site.cloud_fraction = value
          else st.site.transmittance = value
        }
      }
    }
    case 'surface_temperature':
    case 'surface_emissivity':
    case 'layer_height':
    case 'water_column': {
      const { field, read } = INFRARED_SITE_FIELD[q]
      checkBases([read(site)])
      return {
        label, spec, variate,
        apply: (st, v, draw) => {
          const value = applyOp(spec.apply, read(st.site), v)
          checkValue(label, q, value, draw, v)
          st.site[field] = value
        }
      }
    }
  }
}

/**
 * Per bin, the σ of ln(value) of a lognormal with the bin's mean m and standard deviation s/divisor:
 * σ² = ln(1 + (s/(divisor·m))²) (the lognormal's moments; Aitchison & Brown 1957). 0 where the bin or its spread is 0.
 */
function spreadSigmas(values: readonly number[], spread: readonly number[], divisor: number): Float64Array {
  const out = new Float64Array(values.length)
  for (let j = 0; j < values.length; j++) {
    const m = values[j]
    const sd = (spread[j] ?? 0) / divisor
    out[j] = m > 0 && sd > 0 ? Math.sqrt(Math.log1p((sd / m) ** 2)) : 0
  }
  return out
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
function drawOptics(plan: UncertaintyPlan, sample: Sample, index: DrawState['index'], ws: OpticsWorkspace): SampleOptics {
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
function recordFigures(optics: SampleOptics, forcing: SampleForcingFigures, out: Float64Array, offset: number): void {
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

// ---------------------------------------------------------------------------------------------------------------
// Results

export type UncertaintyStatus = 'completed' | 'precision reached' | 'cancelled'

export interface UncertaintyFigureResult extends FigureSummary {
  key: UncertaintyFigureKey
  label: string
  unit: string
  /** The figure without any perturbation (the plain calculation at the same settings). */
  central: number
}

export interface UncertaintyInputResult {
  label: string
  input: UncertainInput
  /** Summary of the drawn variate (the factor, offset or value). */
  variate: FigureSummary
}

export interface SensitivityEntry {
  label: string
  /** Spearman rank correlation of the input's variate with the thin-layer forcing; null if the input did not vary. */
  rho: number | null
}

export interface UncertaintyResult {
  sample: string
  status: UncertaintyStatus
  draws: number
  requested_draws: number
  seed: number
  sampling: 'random' | 'latin-hypercube'
  precision: number
  min_draws: number
  wavelength_nm: number
  figures: UncertaintyFigureResult[]
  /** P(net forcing > 0) over the draws (sunlight + infrared), with its binomial standard error √(p(1−p)/n). */
  warming: ProbabilityEstimate
  sensitivity: { method: string; ranking: SensitivityEntry[] }
  inputs: UncertaintyInputResult[]
  notes: string[]
}

/** The plain calculation of the plan's sample (no perturbation) at the run's settings. */
export function centralFigures(plan: UncertaintyPlan, workspace = drawWorkspace()): Float64Array {
  completePlan(plan)
  const optics = plan.fixedOptics ?? drawOptics(plan, plan.sample, new Map(), workspace)
  const out = new Float64Array(N_OUT)
  recordFigures(optics, sampleForcingFigures(optics, plan.site), out, 0)
  return out
}

/** Summarises draws 0..n−1 (all of `block`, which must start at draw 0). */
export function summarizeDraws(plan: UncertaintyPlan, block: DrawBlock, status: UncertaintyStatus, central = centralFigures(plan)): UncertaintyResult {
  if (block.start !== 0) throw new InputError('uncertainty: summary', `the draws start at ${block.start}, not 0`, 'Summarise the merged draws from draw 0.')
  if (block.count < 1) throw new InputError('uncertainty: summary', 'no draws were made', 'Run at least one draw (the run may have been cancelled at once).')
  const nIn = plan.inputs.length
  const forcing = drawColumn(block, FORCING_INDEX, 'outputs', N_OUT)
  const figures = UNCERTAINTY_FIGURES.map((f, j) => ({ key: f.key, label: f.label, unit: f.unit, central: central[j], ...summarizeValues(drawColumn(block, j, 'outputs', N_OUT), `uncertainty: ${f.label}`) }))
  const inputs = plan.inputs.map((r, j) => ({ label: r.label, input: r.spec, variate: summarizeValues(drawColumn(block, j, 'inputs', nIn), `uncertainty: ${r.label}`) }))
  const ranking = plan.inputs
    .map((r, j) => ({ label: r.label, rho: spearmanRankCorrelation(drawColumn(block, j, 'inputs', nIn), forcing) }))
    .sort((a, b) => Math.abs(b.rho ?? -1) - Math.abs(a.rho ?? -1))
  const notes = [
    `Each draw: the sample's optics at ${UNCERTAINTY_WAVELENGTH_NM} nm (size integration to ${UNCERTAINTY_TOLERANCE} relative) and its forcing at the site, with the infrared part from the sample's band optics (4–40 µm); "net_toa", the thin-layer sunlight figure plus the infrared one, is the forcing the verdict, P(warm) and the ranking use.`,
    `Percentiles by linear interpolation between order statistics (Hyndman & Fan definition 7); sd with n − 1.`,
    plan.sampling === 'latin-hypercube'
      ? `Latin hypercube sampling: each input's range is cut into ${plan.draws} equally probable strata, each drawn exactly once (the run is not stopped early).`
      : `Simple random sampling; stops early once the standard error of P(warm) is below ${plan.precision} (checked after ${plan.minDraws} draws and then every ${UNCERTAINTY_CHECK_EVERY}).`
  ]
  if (status === 'cancelled') notes.push(`Cancelled after ${block.count} of ${plan.draws} draws: the figures are from those draws only.`)
  return {
    sample: plan.sample.name,
    status,
    draws: block.count,
    requested_draws: plan.draws,
    seed: plan.seed,
    sampling: plan.sampling,
    precision: plan.precision,
    min_draws: plan.minDraws,
    wavelength_nm: UNCERTAINTY_WAVELENGTH_NM,
    figures,
    warming: probabilityPositive(forcing),
    sensitivity: { method: 'Spearman rank correlation of each input with the net forcing (sunlight + infrared), sorted by |ρ|', ranking },
    inputs,
    notes
  }
}

/** Progress of a run: draws done so far, of at most `total`; return false to cancel. */
export type UncertaintyProgress = (p: { done: number; total: number }) => boolean | void

/**
 * Runs a whole uncertainty analysis in this thread, in chunks of CHECK_EVERY draws, calling `onProgress`
 * after each chunk (false cancels: the result then summarises the draws made, status "cancelled").
 */
export function runUncertainty(study: Study, sampleName: string, options: UncertaintyRunOptions = {}, onProgress?: UncertaintyProgress): UncertaintyResult {
  const plan = planUncertainty(study, sampleName, options)
  const ws = drawWorkspace()
  const blocks: DrawBlock[] = []
  let done = 0
  let status: UncertaintyStatus = 'completed'
  let merged: DrawBlock | null = null
  while (done < plan.draws) {
    const end = Math.min(plan.draws, done + UNCERTAINTY_CHECK_EVERY)
    blocks.push(computeDraws(plan, done, end, ws))
    done = end
    merged = mergeDrawBlocks(blocks, plan.inputs.length)
    const stop = earlyStopPoint(plan, merged)
    if (stop !== null) {
      merged = truncateBlock(merged, stop, plan.inputs.length)
      status = 'precision reached'
      break
    }
    if (onProgress && onProgress({ done, total: plan.draws }) === false) {
      status = done < plan.draws ? 'cancelled' : 'completed'
      break
    }
  }
  return summarizeDraws(plan, merged ?? mergeDrawBlocks(blocks, plan.inputs.length), status, centralFigures(plan, ws))
}

/** The first `count` draws of a block. */
export function truncateBlock(block: DrawBlock, count: number, nInputs: number): DrawBlock {
  const c = Math.min(count, block.count)
  return { start: block.start, count: c, inputs: block.inputs.subarray(0, c * nInputs), outputs: block.outputs.subarray(0, c * N_OUT) }
}
