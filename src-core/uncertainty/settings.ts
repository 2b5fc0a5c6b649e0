/**
 * The uncertainty settings of a study document (`study.uncertainty`): which inputs of which sample are
 * uncertain, how, and how the run is made. Type aliases (not interfaces) so that they fit the document's
 * `uncertainty?: Record<string, unknown>` field as they are.
 *
 * Example:
 * {
 *   "draws": 1000, "seed": 1, "sampling": "latin-hypercube",
 *   "samples": { "Winter wood smoke": { "inputs": [
 *     { "quantity": "k", "material": "black-carbon", "apply": "factor", "distribution": { "kind": "lognormal", "median": 1, "gsd": 1.3 } },
 *     { "quantity": "median", "mode": 1, "apply": "factor", "distribution": { "kind": "normal", "mean": 1, "sd": 0.1 }, "bounds": { "lo": 0.5, "hi": 1.5, "method": "resample" } },
 *     { "quantity": "rh", "apply": "add", "distribution": { "kind": "normal", "mean": 0, "sd": 5 }, "bounds": { "lo": -20, "hi": 20, "method": "clamp" } } ] } },
 *   "site": { "inputs": [ { "quantity": "surface_albedo", "apply": "set", "distribution": { "kind": "uniform", "lo": 0.1, "hi": 0.3 } } ] }
 * }
 */
import * as z from 'zod'
import { MAX_GSD } from '../sizes/index.ts'

/** The wavelength (nm) of every figure of an uncertainty run. */
export const UNCERTAINTY_WAVELENGTH_NM = 550

/** A distribution of the drawn number (the variate): a factor, an offset or the value itself (see `apply`). */
export type UncertainDistribution =
  | { kind: 'normal'; mean: number; sd: number }
  | { kind: 'lognormal'; median: number; gsd: number }
  | { kind: 'uniform'; lo: number; hi: number }

/**
 * Optional bounds on the variate.
 * - `resample`: draws outside are redrawn until inside, i.e. the variate follows the distribution truncated
 *   to [lo, hi]. (Drawn as the inverse distribution function on [F(lo), F(hi)], which gives exactly that
 *   distribution with one uniform number per draw, so Latin hypercube strata stay intact.)
 * - `clamp`: draws beyond a bound are set to the bound (the bounds then carry the cut-off probability).
 */
export type UncertainBounds = { lo?: number; hi?: number; method: 'resample' | 'clamp' }

/**
 * What is uncertain:
 * - `n`, `k`: the real or imaginary index of one component (`material`: its id), at every wavelength, in
 *   every composition of the sample that contains it;
 * - `median` (µm), `gsd`, `amount`: of mode `mode` (0-based index, or its name), or of every mode when no
 *   mode is given; `amount` is the form the mode is given in (number, volume or mass concentration); for
 *   measured bins, `median` scales the bin diameters and `amount` the bin values (factor only);
 * - `density` (g cm⁻³), `kappa`: of every composition in the sample (the resolved value when not given);
 * - `rh` (percent), `layer` (the layer's depth, scale height or AOD, whichever the sample gives);
 * - `surface_albedo`, `cloud_fraction`, `transmittance`: of the site;
 * - `surface_temperature` (K), `surface_emissivity`, `layer_height` (km), `water_column` (cm): the site's
 *   infrared inputs (climate/longwave.ts; their defaults when the site gives none);
 * - `spread`: measured bins that keep their spread (`bins.spread`, a stretch of a station record made a sample):
 *   the variate z (apply `add`, in units of the spread; normal, mean 0, sd 1 draws the spread itself) moves every
 *   bin together to the quantile z of a lognormal with the bin's mean and, by `spread_scale`, the standard error of
 *   the mean (`standard-error`, the default: spread/√rows) or the rows' standard deviation (`standard-deviation`).
 *   See "How the spread of a stretch is drawn" in DEVELOPERS.md.
 */
export type UncertainQuantity =
  | 'n' | 'k' | 'median' | 'gsd' | 'amount' | 'density' | 'kappa' | 'rh' | 'layer' | 'surface_albedo' | 'cloud_fraction' | 'transmittance'
  | 'surface_temperature' | 'surface_emissivity' | 'layer_height' | 'water_column' | 'spread'

export const UNCERTAIN_QUANTITIES: readonly UncertainQuantity[] = [
  'n', 'k', 'median', 'gsd', 'amount', 'density', 'kappa', 'rh', 'layer', 'surface_albedo', 'cloud_fraction', 'transmittance',
  'surface_temperature', 'surface_emissivity', 'layer_height', 'water_column', 'spread'
]
export const SITE_QUANTITIES: readonly UncertainQuantity[] = ['surface_albedo', 'cloud_fraction', 'transmittance', 'surface_temperature', 'surface_emissivity', 'layer_height', 'water_column']

/**
 * One uncertain input. `apply`: `factor` multiplies the value by the variate (e.g. a lognormal factor of
 * median 1 on k), `add` adds it (e.g. a normal offset of mean 0 on RH), `set` replaces the value by it.
 */
export type UncertainInput = {
  /** Label in results; default e.g. "k of black-carbon (factor)". */
  name?: string
  quantity: UncertainQuantity
  material?: string
  mode?: number | string
  apply: 'factor' | 'add' | 'set'
  distribution: UncertainDistribution
  bounds?: UncertainBounds
  /** `spread` only: what each bin is drawn with (default `standard-error`). */
  spread_scale?: 'standard-error' | 'standard-deviation'
}

export type UncertaintySampleSettings = { inputs: UncertainInput[] }

/** `study.uncertainty`. */
export type UncertaintySettings = {
  /** Most draws per run (default 1000). */
  draws?: number
  /** Seed of the random numbers (default 1). */
  seed?: number
  /** `random` (default) or `latin-hypercube` (McKay, Beckman & Conover 1979). */
  sampling?: 'random' | 'latin-hypercube'
  /** Stop when the standard error of P(warm) is below this (default 0.01); 0 never stops early. */
  precision?: number
  /** Draws made before the early stop is considered (default 200). */
  min_draws?: number
  /** Per sample (by name): its uncertain inputs. */
  samples?: Record<string, UncertaintySampleSettings>
  /** Uncertain site inputs, used with every sample. */
  site?: UncertaintySampleSettings
}

// ---------------------------------------------------------------------------------------------------------------
// Schema (zod), with the document's convention: custom issues carry a plain-language `fix`.

const fmt = (v: number): string => String(Number(v.toPrecision(10)))

function num(ok: (v: number) => boolean, problem: (v: number) => string, fix: string) {
  return z.number().superRefine((v, ctx) => {
    if (!ok(v)) ctx.addIssue({ code: 'custom', message: problem(v), params: { fix } })
  })
}

const finite = num((v) => Number.isFinite(v), (v) => `${fmt(v)} is not a finite number`, 'Give a plain finite number.')

const distribution = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('normal'), mean: finite, sd: num((v) => v >= 0, (v) => `the standard deviation must be 0 or more (it is ${fmt(v)})`, 'Give sd ≥ 0 (0 means no spread).') }),
  z.strictObject({
    kind: z.literal('lognormal'),
    median: num((v) => v > 0, (v) => `the median of a lognormal must be greater than 0 (it is ${fmt(v)})`, 'Give a positive median, e.g. 1 for a factor.'),
    gsd: num((v) => v >= 1 && v <= MAX_GSD, (v) => `the geometric standard deviation must be from 1 to ${MAX_GSD} (it is ${fmt(v)})`, 'Give gsd ≥ 1 (1 means no spread), e.g. 1.3.')
  }),
  z.strictObject({ kind: z.literal('uniform'), lo: finite, hi: finite })
])

const bounds = z.strictObject({ lo: finite.optional(), hi: finite.optional(), method: z.enum(['resample', 'clamp']) })

const input = z.strictObject({
  name: z.string().optional(),
  quantity: z.enum(UNCERTAIN_QUANTITIES as [UncertainQuantity, ...UncertainQuantity[]]),
  material: z.string().optional(),
  mode: z.union([num((v) => Number.isInteger(v) && v >= 0, (v) => `mode ${fmt(v)} is not a whole number from 0`, 'Give the mode as its 0-based position in the sample (0 is the first) or its name.'), z.string()]).optional(),
  apply: z.enum(['factor', 'add', 'set']),
  distribution,
  bounds: bounds.optional(),
  spread_scale: z.enum(['standard-error', 'standard-deviation']).optional()
})

const inputList = z.strictObject({ inputs: z.array(input) })

/** Schema of `study.uncertainty` (the study schema uses it for that field). */
export const uncertaintySettingsSchema: z.ZodType<UncertaintySettings> = z.strictObject({
  draws: num((v) => Number.isInteger(v) && v >= 1 && v <= 1e7, (v) => `${fmt(v)} draws is not a whole number from 1 to 10000000`, 'Give the number of draws, e.g. 1000.').optional(),
  seed: num((v) => Number.isInteger(v) && v >= 0 && v <= 0xffffffff, (v) => `the seed ${fmt(v)} is not a whole number from 0 to 4294967295`, 'Give a whole number, e.g. 1.').optional(),
  sampling: z.enum(['random', 'latin-hypercube']).optional(),
  precision: num((v) => v >= 0 && v < 0.5, (v) => `the precision ${fmt(v)} is not from 0 to 0.5`, 'Give the standard error of P(warm) to stop at, e.g. 0.01 (0: never stop early).').optional(),
  min_draws: num((v) => Number.isInteger(v) && v >= 1, (v) => `${fmt(v)} is not a whole number of draws`, 'Give a whole number of draws, e.g. 200.').optional(),
  samples: z.record(z.string(), inputList).optional(),
  site: inputList.optional()
})
