/**
 * The uncertain inputs of a run, resolved against the sample and the site: each input's variate (its quantile
 * function, with the bounds' truncation or clamping), the valid range of each perturbed quantity, and how a
 * drawn variate is applied (factor, offset or value). Used by planUncertainty (propagate.ts).
 */
import { InputError } from '../errors.ts'
import { LONGWAVE_INPUT_RANGES } from '../climate/index.ts'
import { getMaterial, refractiveIndexAt, type Material } from '../materials/index.ts'
import { resolveComposition, resolveMaterial, siteLongwaveInputs, siteSurfaceAlbedo } from '../optics/index.ts'
import { MAX_GSD } from '../sizes/index.ts'
import type { Composition, Sample, Site } from '../study/model.ts'
import { normalCdf, normalQuantile } from './random.ts'
import { UNCERTAINTY_WAVELENGTH_NM, type UncertainInput } from './settings.ts'
import type { ResolvedInput } from './propagate.ts'

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

export function applyOp(op: UncertainInput['apply'], base: number, v: number): number {
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
export function copyJson<T>(v: T): T {
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
export function resolveInput(spec: UncertainInput, sample: Sample, site: Site, own: Material[], where: string): ResolvedInput {
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
