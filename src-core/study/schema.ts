/**
 * The study document's schema (zod) and its validation: `parseStudy` reads the text of a `.mote` file and
 * reports every problem at once, each with a JSON path (e.g. `samples[2].size.modes[0].gsd`), what is wrong
 * in plain words and how to fix it.
 *
 * Two passes: the zod schema checks shapes, types and each value's range; then `crossChecks` looks at
 * relations between values (fractions summing to 1, ascending wavelengths, material ids, bin counts, the
 * surface). The second pass reads the raw document defensively, so it also runs when the first found problems.
 */
import * as z from 'zod'
import { InputError } from '../errors.ts'
import { readableBeside } from '../numberText.ts'
import { defineUserMaterial, listMaterials } from '../materials/index.ts'
import { BIN_QUANTITIES, MAX_GSD } from '../sizes/index.ts'
import { LONGWAVE_INPUT_RANGES, SURFACE_TYPES, type LongwaveInputName } from '../climate/index.ts'
import { findJsonSyntaxError, looksLikeDelimitedTable } from './jsonSyntax.ts'
import { migrateStudy } from './migrate.ts'
import { uncertaintySettingsSchema } from '../uncertainty/settings.ts'
import { campaignProblems, campaignSettingsSchema } from '../field/campaign-settings.ts'
import { STUDY_FORMAT, STUDY_VERSION, type Study } from './model.ts'
import type { CampaignSettings } from '../field/campaign-settings.ts'

/** One thing wrong with a study document. */
export interface StudyProblem {
  /** JSON path like `samples[2].size.modes[0].gsd`; `document` for the whole document; `line 3 column 7` for syntax errors. */
  path: string
  /** What is wrong, in plain words. */
  message: string
  /** How to fix it. */
  fix: string
  /** For syntax errors: 1-based line and column in the file. */
  line?: number
  column?: number
}

export type ParseStudyResult = { ok: true; study: Study; warnings: string[] } | { ok: false; problems: StudyProblem[] }

/** Lowest and highest wavelength a study may use, nm (UV-B to thermal infrared). */
export const STUDY_WAVELENGTH_RANGE_NM = [200, 40000] as const

// ---------------------------------------------------------------------------------------------------------------
// Value checks with their plain-language fixes.

/** A value in a message: about four significant digits, more where fewer would read as a usual limit (0, 1, 100). */
const fmt = (v: number): string => readableBeside(v, 0, 1, 100)

/** A finite number that passes `ok`; otherwise a custom issue with `problem(v)` and `fix`. */
function num(ok: (v: number) => boolean, problem: (v: number) => string, fix: string) {
  return z.number().superRefine((v, ctx) => {
    if (!ok(v)) ctx.addIssue({ code: 'custom', message: problem(v), params: { fix } })
  })
}

const positive = (what: string, unit: string, example: string, max = Infinity) =>
  num(
    (v) => v > 0 && v <= max,
    (v) => (v <= 0 ? `${what} must be greater than 0 (it is ${fmt(v)}${unit})` : `${what} of ${fmt(v)}${unit} is implausibly large (at most ${fmt(max)}${unit})`),
    `Give ${what} in${unit || ' plain numbers'}, e.g. ${example}.`
  )

const fraction = (what: string) => num((v) => v >= 0 && v <= 1, (v) => `${what} must be from 0 to 1 (it is ${fmt(v)})`, `Write ${what} as a fraction: 0.25 means 25 %.`)

const nonEmptyText = (what: string, example: string) =>
  z.string().superRefine((v, ctx) => {
    if (v.trim() === '') ctx.addIssue({ code: 'custom', message: `${what} is empty`, params: { fix: `Give ${what}, e.g. "${example}".` } })
  })

const gsd = num(
  (v) => v > 1 && v <= MAX_GSD,
  (v) => (v <= 1 ? `the geometric standard deviation must be greater than 1 (it is ${fmt(v)})` : `the geometric standard deviation ${fmt(v)} is wider than any aerosol mode (at most ${MAX_GSD})`),
  `A geometric standard deviation of 1 means every particle has the same size; use 1.05 or more (typical modes: 1.4 to 2.2), at most ${MAX_GSD}.`
)

/** The largest median diameter a mode may have, µm (1 mm: beyond any aerosol). */
export const MAX_MEDIAN_UM = 1000

const median = positive('the median diameter', ' µm', '0.15 (150 nm)', MAX_MEDIAN_UM)

const rhPercent = num(
  (v) => v >= 0 && v < 100,
  (v) => (v < 0 ? `relative humidity cannot be negative (it is ${fmt(v)} %)` : `relative humidity ${fmt(v)} % is not below 100 %`),
  'Give relative humidity in percent, 0 ≤ RH < 100: 100 % and above is cloud, not aerosol. (A fraction like 0.85 means 0.85 %; write 85.)'
)

const composition = z.strictObject({
  components: z
    .array(
      z.strictObject({
        material: nonEmptyText('the material id', 'ammonium-sulfate'),
        volume_fraction: fraction('the volume fraction')
      })
    )
    .min(1),
  mixing: z.enum(['volume-average', 'maxwell-garnett', 'bruggeman', 'core-shell']),
  density_g_cm3: positive('the dry density', ' g cm⁻³', '1.7', 25).optional(),
  kappa: num((v) => v >= 0 && v <= 2, (v) => `hygroscopicity κ must be from 0 to 2 (it is ${fmt(v)})`, 'Use 0 for insoluble material, about 0.6 for ammonium sulfate, at most 2.').optional()
})

const modeCommon = { median_um: median, gsd, name: z.string().optional(), composition: composition.optional() }

const mode = z.discriminatedUnion('by', [
  z.strictObject({ by: z.literal('number'), number_cm3: num((v) => v >= 0 && v <= 1e9, (v) => `the number concentration must be from 0 to 1e9 cm⁻³ (it is ${fmt(v)})`, 'Give N in particles per cm³, e.g. 5000.'), ...modeCommon }),
  z.strictObject({ by: z.literal('volume'), volume_um3_cm3: num((v) => v >= 0 && v <= 1e7, (v) => `the volume concentration must be from 0 to 1e7 µm³ cm⁻³ (it is ${fmt(v)})`, 'Give V in µm³ cm⁻³, e.g. 20.'), ...modeCommon }),
  z.strictObject({ by: z.literal('mass'), mass_ug_m3: num((v) => v >= 0 && v <= 1e7, (v) => `the mass concentration must be from 0 to 1e7 µg m⁻³ (it is ${fmt(v)})`, 'Give the mass in µg m⁻³, e.g. 35.'), ...modeCommon })
])

const bins = z.strictObject({
  diameters: z.array(positive('a bin diameter', '', '0.1')).min(2),
  diameter_unit: z.enum(['nm', 'um']),
  edges: z.boolean(),
  quantity: z.enum(BIN_QUANTITIES),
  values: z.array(num((v) => v >= 0, (v) => `a bin value cannot be negative (it is ${fmt(v)})`, 'Check the instrument export; replace negative values (noise after inversion) by 0 or remove the bin.')).min(1),
  source: z.string().optional(),
  rows_averaged: z.number().int().min(1).optional(),
  spread: z.array(num((v) => v >= 0, (v) => `a bin's spread cannot be negative (it is ${fmt(v)})`, 'The spread is a standard deviation over the averaged rows: 0 or more.')).optional()
})

const size = z.discriminatedUnion('kind', [z.strictObject({ kind: z.literal('modes'), modes: z.array(mode).min(1) }), z.strictObject({ kind: z.literal('bins'), bins })])

const layer = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('depth'), depth_m: positive('the layer depth', ' m', '1500', 50000) }),
  z.strictObject({ kind: z.literal('scale-height'), scale_height_m: positive('the scale height', ' m', '1200', 50000) }),
  z.strictObject({ kind: z.literal('optical-depth'), aod_550: positive('the aerosol optical depth at 550 nm', '', '0.2', 10) })
])

const sample = z.strictObject({
  name: nonEmptyText('the sample name', 'winter smoke'),
  notes: z.string().optional(),
  size,
  composition,
  rh_percent: rhPercent,
  rh_history: z.enum(['rising', 'falling']),
  temperature_k: num((v) => v >= 180 && v <= 330, (v) => `the temperature ${fmt(v)} K is outside 180 to 330 K`, 'Give the temperature in kelvin (0 °C = 273.15 K), e.g. 268.').optional(),
  layer
})

const userIndex = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('constant'), n: positive('n (real part of the index)', '', '1.55', 10), k: num((v) => v >= 0 && v <= 10, (v) => `k must be from 0 to 10 (it is ${fmt(v)})`, 'k is the absorbing part of the index: 0 for no absorption, e.g. 0.01 for brown carbon.') }),
  z.strictObject({ kind: z.literal('table'), rows: z.array(z.tuple([z.number(), z.number(), z.number()])).min(2) }),
  z.strictObject({ kind: z.literal('expression'), n: nonEmptyText('the n expression', '1.5'), k: nonEmptyText('the k expression', '0.02 * (wl_nm/550)^-5') })
])

const userMaterial = z.strictObject({
  id: z.string().superRefine((v, ctx) => {
    if (!/^[a-z0-9]+(-[a-z0-9]+)*$/.test(v)) ctx.addIssue({ code: 'custom', message: `"${v}" is not lowercase letters, digits and single hyphens`, params: { fix: 'Use an id like "my-smoke".' } })
  }),
  name: nonEmptyText('the material name', 'Valley smoke'),
  index: userIndex,
  density_g_cm3: positive('the dry density', ' g cm⁻³', '1.5', 25),
  kappa: num((v) => v >= 0 && v <= 2, (v) => `hygroscopicity κ must be from 0 to 2 (it is ${fmt(v)})`, 'Use 0 for insoluble material, at most 2.'),
  source: z.string().optional()
})

const [wlLo, wlHi] = STUDY_WAVELENGTH_RANGE_NM

/** An infrared site input, checked against its range in climate/longwave.ts, the reason said. */
function longwaveField(name: LongwaveInputName, what: string, example: string) {
  const r = LONGWAVE_INPUT_RANGES[name]
  const u = r.unit ? ` ${r.unit}` : ''
  return num((v) => v >= r.lo && v <= r.hi, (v) => `${what} ${fmt(v)}${u} is outside ${fmt(r.lo)} to ${fmt(r.hi)}${u} (${r.why})`, `Give ${what} from ${fmt(r.lo)} to ${fmt(r.hi)}${u}, e.g. ${example}${u}.`)
}

const site = z.strictObject({
  name: z.string().optional(),
  latitude_deg: num((v) => v >= -90 && v <= 90, (v) => `latitude ${fmt(v)}° is outside −90° to 90°`, 'Give the latitude in degrees, north positive, south negative (e.g. 47.2 or -33.9).'),
  day_of_year: num((v) => Number.isInteger(v) && v >= 1 && v <= 366, (v) => `day of year ${fmt(v)} is not a whole number from 1 to 366`, 'Give the day of the year: 1 is 1 January, 172 is about 21 June, 366 only in leap years.'),
  cloud_fraction: fraction('the cloud fraction'),
  transmittance: num((v) => v > 0 && v <= 1, (v) => `the atmospheric transmittance must be greater than 0 and at most 1 (it is ${fmt(v)})`, 'Give the fraction of sunlight that reaches the layer, e.g. 0.76.'),
  surface: nonEmptyText('the surface id', 'cropland'),
  surface_albedo: fraction('the surface albedo').optional(),
  surface_temperature_k: longwaveField('surface_temperature_k', 'the surface temperature', '288').optional(),
  surface_emissivity: longwaveField('surface_emissivity', 'the surface infrared emissivity', '0.95').optional(),
  layer_height_km: longwaveField('layer_height_km', "the height of the layer's middle", '1').optional(),
  water_column_cm: longwaveField('water_column_cm', 'the water-vapour column', '2.5').optional()
})

/** The zod schema of the current study version. Its output type is checked against `Study` (model.ts). */
export const studySchema: z.ZodType<Study> = z.strictObject({
  format: z.literal(STUDY_FORMAT),
  version: z.literal(STUDY_VERSION),
  name: nonEmptyText('the study name', 'Harrowmere winter'),
  notes: z.string().optional(),
  wavelengths_nm: z
    .array(num((v) => v >= wlLo && v <= wlHi, (v) => `wavelength ${fmt(v)} nm is outside ${wlLo} to ${wlHi} nm`, `Give wavelengths in nanometres from ${wlLo} to ${wlHi} (550 nm is green light; 0.55 would be micrometres).`))
    .min(1),
  samples: z.array(sample).min(1),
  user_materials: z.array(userMaterial).optional(),
  site,
  verdict_margin_w_m2: num((v) => v >= 0 && v <= 100, (v) => `the verdict margin must be from 0 to 100 W m⁻² (it is ${fmt(v)})`, 'Give the margin in W m⁻², e.g. 0.5.').optional(),
  uncertainty: uncertaintySettingsSchema.optional(),
  campaign: campaignSettingsSchema.optional()
})

// ---------------------------------------------------------------------------------------------------------------
// Turning zod issues into problems.

type Path = readonly PropertyKey[]

/** `samples[2].size.modes[0].gsd`; `document` for the root. */
export function formatJsonPath(path: Path): string {
  let out = ''
  for (const p of path) {
    if (typeof p === 'number') out += `[${p}]`
    else out += out === '' ? String(p) : `.${String(p)}`
  }
  return out === '' ? 'document' : out
}

function valueAt(root: unknown, path: Path): unknown {
  let v = root
  for (const p of path) {
    if (v === null || typeof v !== 'object') return undefined
    v = (v as Record<PropertyKey, unknown>)[p]
  }
  return v
}

function describe(v: unknown): string {
  if (v === null) return 'null'
  if (Array.isArray(v)) return 'a list'
  if (typeof v === 'string') return v.length > 40 ? `the text "${v.slice(0, 37)}..."` : `the text "${v}"`
  if (typeof v === 'object') return 'an object'
  return `${typeof v === 'number' && !Number.isFinite(v) ? 'the out-of-range number ' : ''}${String(v)}`
}

const TYPE_WORDS: Record<string, [string, string]> = {
  number: ['a number', 'Write a plain number without quotes, with a point as decimal separator (e.g. 1.5).'],
  string: ['text in double quotes', 'Write the value in double quotes, e.g. "cropland".'],
  boolean: ['true or false', 'Write true or false without quotes.'],
  array: ['a list', 'Write a list in square brackets, e.g. [350, 550, 1000].'],
  object: ['an object', 'Write an object in braces, e.g. { "kind": "depth", "depth_m": 1500 }.'],
  record: ['an object', 'Write an object in braces.'],
  tuple: ['a list of three numbers', 'Write each row as [wavelength µm, n, k], e.g. [0.55, 1.53, 0.005].']
}

/** What each discriminator means, for a missing or unknown one. */
const DISCRIMINATOR_HELP: Record<string, string> = {
  by: 'Say how the mode is given: "by": "number" (with number_cm3), "volume" (with volume_um3_cm3) or "mass" (with mass_ug_m3).',
  'size.kind': 'Use "kind": "modes" (lognormal modes) or "bins" (measured bins).',
  'layer.kind': 'Use "kind": "depth" (with depth_m), "scale-height" (with scale_height_m) or "optical-depth" (with aod_550).',
  'index.kind': 'Use "kind": "constant" (n, k), "table" (rows of [wavelength µm, n, k]) or "expression" (n and k as formulas of wl_um or wl_nm).'
}

/** Every field name the schema knows, for "did you mean" suggestions. */
const KNOWN_FIELDS: string[] = (() => {
  const seen = new Set<string>()
  const walk = (s: unknown, depth: number): void => {
    if (!s || depth > 20) return
    const def = (s as { _zod?: { def?: Record<string, unknown> } })._zod?.def
    if (!def) return
    if (def.type === 'object') {
      for (const [k, v] of Object.entries(def.shape as Record<string, unknown>)) {
        seen.add(k)
        walk(v, depth + 1)
      }
    } else if (def.type === 'array') walk(def.element, depth + 1)
    else if (def.type === 'union') for (const o of def.options as unknown[]) walk(o, depth + 1)
    else if (def.type === 'optional') walk(def.innerType, depth + 1)
  }
  walk(studySchema, 0)
  return [...seen]
})()

function editDistance(a: string, b: string): number {
  const d = Array.from({ length: b.length + 1 }, (_, j) => j)
  for (let i = 1; i <= a.length; i++) {
    let prev = d[0]
    d[0] = i
    for (let j = 1; j <= b.length; j++) {
      const t = d[j]
      d[j] = Math.min(d[j] + 1, d[j - 1] + 1, prev + (a[i - 1] === b[j - 1] ? 0 : 1))
      prev = t
    }
  }
  return d[b.length]
}

function closestField(key: string): string | undefined {
  // A name without its unit, e.g. "latitude" for "latitude_deg".
  const withUnit = KNOWN_FIELDS.filter((f) => f.startsWith(`${key.toLowerCase()}_`))
  if (withUnit.length === 1) return withUnit[0]
  let best: string | undefined
  let bestD = Infinity
  for (const f of KNOWN_FIELDS) {
    const dist = editDistance(key.toLowerCase(), f)
    if (dist < bestD) {
      bestD = dist
      best = f
    }
  }
  return best !== undefined && bestD <= Math.max(2, Math.floor(key.length / 3)) ? best : undefined
}

function issueToProblems(issue: z.core.$ZodIssue, root: unknown): StudyProblem[] {
  const path = issue.path
  const at = formatJsonPath(path)
  const key = path.length > 0 ? String(path[path.length - 1]) : 'document'
  const value = valueAt(root, path)
  switch (issue.code) {
    case 'custom': {
      const fix = (issue.params as { fix?: string } | undefined)?.fix ?? 'Correct this value.'
      return [{ path: at, message: issue.message, fix }]
    }
    case 'invalid_type': {
      const [word, fix] = TYPE_WORDS[issue.expected] ?? [issue.expected, 'Correct this value.']
      if (value === undefined) return [{ path: at, message: `"${key}" is missing`, fix: `Add "${key}" here (${word}).` }]
      return [{ path: at, message: `must be ${word}, not ${describe(value)}`, fix }]
    }
    case 'invalid_value': {
      const options = issue.values.map((v) => JSON.stringify(v)).join(', ')
      if (value === undefined) return [{ path: at, message: `"${key}" is missing`, fix: `Add "${key}": one of ${options}.` }]
      return [{ path: at, message: `${describe(value)} is not an accepted value`, fix: `Use one of: ${options}.` }]
    }
    case 'invalid_union': {
      const disc = (issue as { discriminator?: string }).discriminator
      const options = (issue as { options?: unknown[] }).options ?? []
      const parent = path.length >= 2 ? String(path[path.length - 2]) : ''
      const help = (disc && (DISCRIMINATOR_HELP[`${parent}.${disc}`] ?? DISCRIMINATOR_HELP[disc])) || `Use one of: ${options.map((o) => JSON.stringify(o)).join(', ')}.`
      if (value === undefined) return [{ path: at, message: `"${key}" is missing, so this entry cannot be read`, fix: help }]
      return [{ path: at, message: `${describe(value)} is not an accepted "${key}"`, fix: help }]
    }
    case 'unrecognized_keys':
      return issue.keys.map((k) => {
        const guess = closestField(k)
        return {
          path: formatJsonPath([...path, k]),
          message: `"${k}" is not a field the study format knows here`,
          fix: guess && guess !== k ? `Did you mean "${guess}"? Rename it, or remove it.` : 'Remove it (check the spelling and the units in the name).'
        }
      })
    case 'too_small':
      if (issue.origin === 'array') {
        const what = key === 'samples' ? 'Add at least one sample.' : key === 'wavelengths_nm' ? 'Add at least one wavelength, e.g. [550].' : key === 'rows' ? 'Give at least two rows [wavelength µm, n, k].' : key === 'diameters' ? 'Give at least two bin diameters.' : `Add at least ${String(issue.minimum)} entry.`
        return [{ path: at, message: `the list has ${Array.isArray(value) ? value.length : 0} entries; at least ${String(issue.minimum)} needed`, fix: what }]
      }
      return [{ path: at, message: issue.message, fix: 'Correct this value.' }]
    default:
      return [{ path: at, message: issue.message, fix: 'Correct this value.' }]
  }
}

// ---------------------------------------------------------------------------------------------------------------
// Cross checks on the raw document.

type Json = Record<string, unknown>
const isObject = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v)
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v)

/** Same tolerance as the mixing rules (src-core/materials/mixing.ts). */
const FRACTION_SUM_TOLERANCE = 1e-6

interface CrossContext {
  problems: StudyProblem[]
  warnings: string[]
  /** Catalogue and user material ids. */
  materialIds: Set<string>
  userIds: Set<string>
  /** Study wavelengths (nm) that are valid numbers. */
  wavelengthsNm: number[]
}

function checkComposition(c: unknown, at: string, ctx: CrossContext): void {
  if (!isObject(c) || !Array.isArray(c.components)) return
  const comps = c.components
  const fractions = comps.map((x) => (isObject(x) ? x.volume_fraction : undefined))
  if (comps.length > 0 && fractions.every((f) => isNum(f) && f >= 0 && f <= 1)) {
    const sum = (fractions as number[]).reduce((a, b) => a + b, 0)
    if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) {
      ctx.problems.push({
        path: `${at}.components`,
        message: `the volume fractions sum to ${fmt(sum)}, not 1`,
        fix: `Make the volume fractions of the components add up to 1 (now ${(fractions as number[]).map(fmt).join(' + ')}).`
      })
    }
  }
  if (c.mixing === 'core-shell' && comps.length < 2) {
    ctx.problems.push({ path: `${at}.components`, message: 'core-shell mixing needs a core and a shell, but there is only one component', fix: 'Add a shell component after the core, or choose "volume-average" mixing.' })
  }
  const catalogue = listMaterials()
  const lo = Math.min(...ctx.wavelengthsNm) / 1000
  const hi = Math.max(...ctx.wavelengthsNm) / 1000
  comps.forEach((comp, j) => {
    if (!isObject(comp) || typeof comp.material !== 'string' || comp.material.trim() === '') return
    const id = comp.material
    const path = `${at}.components[${j}].material`
    if (!ctx.materialIds.has(id)) {
      const users = [...ctx.userIds]
      ctx.problems.push({
        path,
        message: `"${id}" is not a known material`,
        fix: `Use a catalogue id: ${catalogue.map((m) => m.id).join(', ')}${users.length > 0 ? `; or one of this study's user materials: ${users.join(', ')}` : ''}; or define "${id}" under user_materials.`
      })
      return
    }
    const m = catalogue.find((x) => x.id === id)
    if (m && ctx.wavelengthsNm.length > 0) {
      const [rlo, rhi] = m.rangeUm
      const slack = 1e-9
      if (lo < rlo * (1 - slack) || hi > rhi * (1 + slack)) {
        ctx.problems.push({
          path,
          message: `the catalogue's ${m.name} index covers ${fmt(rlo * 1000)} to ${fmt(rhi * 1000)} nm, but the study's wavelengths reach from ${fmt(lo * 1000)} to ${fmt(hi * 1000)} nm`,
          fix: `Keep the study's wavelengths within ${fmt(rlo * 1000)}–${fmt(rhi * 1000)} nm, or define a user material whose index covers them.`
        })
      }
    }
  })
}

function checkBins(b: unknown, at: string, ctx: CrossContext): void {
  if (!isObject(b) || !Array.isArray(b.diameters) || !Array.isArray(b.values)) return
  const d = b.diameters
  for (let i = 1; i < d.length; i++) {
    const prev = d[i - 1]
    const cur = d[i]
    if (isNum(prev) && isNum(cur) && !(cur > prev)) {
      ctx.problems.push({
        path: `${at}.diameters[${i}]`,
        message: cur === prev ? `diameter ${fmt(cur)} repeats the one before it (a bin of zero width)` : `diameter ${fmt(cur)} comes after the larger ${fmt(prev)}; bin diameters must ascend`,
        fix: 'Sort the bins by diameter (smallest first) and remove duplicates, keeping each value with its diameter.'
      })
    }
  }
  if (Array.isArray(b.spread) && b.spread.length !== b.values.length) {
    ctx.problems.push({ path: `${at}.spread`, message: `${b.spread.length} spreads for ${b.values.length} values`, fix: 'Give one spread (standard deviation over the averaged rows) per bin value, or leave "spread" out.' })
  }
  if (typeof b.edges === 'boolean') {
    const expected = b.edges ? b.values.length + 1 : b.values.length
    if (d.length !== expected) {
      ctx.problems.push({
        path: `${at}.values`,
        message: b.edges
          ? `${b.values.length} values need ${b.values.length + 1} bin edges, but ${d.length} diameters are given`
          : `${b.values.length} values need ${b.values.length} bin midpoints, but ${d.length} diameters are given`,
        fix: b.edges ? 'With "edges": true give one more diameter than values (the lower edge of each bin and the upper edge of the last).' : 'With "edges": false give one midpoint diameter per value (or set "edges": true if the diameters are the bin edges).'
      })
    }
  }
}

function crossChecks(doc: unknown, problems: StudyProblem[], warnings: string[]): void {
  if (!isObject(doc)) return
  const userIds = new Set<string>()
  const ctx: CrossContext = {
    problems,
    warnings,
    materialIds: new Set(listMaterials().map((m) => m.id)),
    userIds,
    wavelengthsNm: Array.isArray(doc.wavelengths_nm) ? doc.wavelengths_nm.filter((w): w is number => isNum(w) && w >= wlLo && w <= wlHi) : []
  }

  // The campaign: one file per kind, what the merge needs, a sample that exists. A campaign being set up is
  // not a broken study: these are warnings (the study opens and saves), and the record is not made until they
  // are settled (buildCampaignRecord refuses it with the same words).
  const campaign = campaignSettingsSchema.safeParse(doc.campaign)
  if (doc.campaign !== undefined && campaign.success) {
    const names = Array.isArray(doc.samples) ? doc.samples.filter(isObject).map((x) => x.name).filter((n): n is string => typeof n === 'string') : []
    for (const p of campaignProblems(campaign.data as CampaignSettings, names)) warnings.push(`${p.path}: ${p.message}; ${p.fix}`)
  }

  // Wavelengths ascending.
  if (Array.isArray(doc.wavelengths_nm)) {
    const w = doc.wavelengths_nm
    for (let i = 1; i < w.length; i++) {
      const a = w[i - 1]
      const b = w[i]
      const inRange = (x: unknown): x is number => isNum(x) && x >= wlLo && x <= wlHi
      if (inRange(a) && inRange(b) && !(b > a)) {
        problems.push({
          path: `wavelengths_nm[${i}]`,
          message: b === a ? `wavelength ${fmt(b)} nm appears twice` : `wavelength ${fmt(b)} nm comes after ${fmt(a)} nm; wavelengths must ascend`,
          fix: 'List each wavelength once, from shortest to longest.'
        })
      }
    }
  }

  // User materials: unique ids, not catalogue ids, and a working index at the study's wavelengths.
  if (Array.isArray(doc.user_materials)) {
    doc.user_materials.forEach((u, i) => {
      if (!isObject(u) || typeof u.id !== 'string') return
      const at = `user_materials[${i}]`
      if (ctx.materialIds.has(u.id)) {
        problems.push({
          path: `${at}.id`,
          message: userIds.has(u.id) ? `the id "${u.id}" is used by an earlier user material` : `"${u.id}" is already a catalogue material id`,
          fix: 'Give each user material its own id, different from the catalogue ids.'
        })
        return
      }
      userIds.add(u.id)
      ctx.materialIds.add(u.id)
      const r = userMaterial.safeParse(u)
      if (!r.success || ctx.wavelengthsNm.length === 0) return
      try {
        defineUserMaterial(
          { id: r.data.id, name: r.data.name, densityGcm3: r.data.density_g_cm3, kappa: r.data.kappa, index: r.data.index, source: r.data.source },
          ctx.wavelengthsNm.map((w) => w / 1000)
        )
      } catch (e) {
        if (!(e instanceof InputError)) throw e
        const text = e.message
        const head = `${e.where}: `
        const problem = text.startsWith(head) && text.endsWith(e.fix) ? text.slice(head.length, text.length - e.fix.length).replace(/\.\s*$/, '') : text
        problems.push({ path: `${at}.index`, message: `${e.where}: ${problem}`, fix: e.fix })
      }
    })
  }

  // Samples: compositions, bins, duplicate names.
  if (Array.isArray(doc.samples)) {
    const names = new Map<string, number>()
    doc.samples.forEach((s, i) => {
      if (!isObject(s)) return
      const at = `samples[${i}]`
      checkComposition(s.composition, `${at}.composition`, ctx)
      if (isObject(s.size)) {
        if (s.size.kind === 'modes' && Array.isArray(s.size.modes)) {
          s.size.modes.forEach((m, j) => {
            if (isObject(m) && m.composition !== undefined) checkComposition(m.composition, `${at}.size.modes[${j}].composition`, ctx)
          })
        }
        if (s.size.kind === 'bins') checkBins(s.size.bins, `${at}.size.bins`, ctx)
      }
      if (typeof s.name === 'string' && s.name.trim() !== '') {
        const first = names.get(s.name)
        if (first !== undefined) warnings.push(`${at}.name: "${s.name}" is also the name of samples[${first}]; results will be hard to tell apart`)
        else names.set(s.name, i)
      }
    })
  }

  // Site surface.
  if (isObject(doc.site) && typeof doc.site.surface === 'string' && doc.site.surface.trim() !== '') {
    const id = doc.site.surface
    const albedo = doc.site.surface_albedo
    if (id === 'custom') {
      if (albedo === undefined) {
        problems.push({ path: 'site.surface_albedo', message: 'the surface is "custom" but no surface_albedo is given', fix: 'Add "surface_albedo": the broadband albedo from 0 to 1 (e.g. 0.18 for cropland), or pick a surface id.' })
      }
    } else if (!SURFACE_TYPES.some((t) => t.id === id)) {
      problems.push({
        path: 'site.surface',
        message: `"${id}" is not a known surface`,
        fix: `Use one of: ${SURFACE_TYPES.map((t) => t.id).join(', ')}; or "custom" together with "surface_albedo".`
      })
    } else if (albedo !== undefined) {
      warnings.push(`site.surface_albedo: ignored because the surface is "${id}" (typical albedo ${SURFACE_TYPES.find((t) => t.id === id)?.albedo}); set "surface": "custom" to use your own value`)
    }
  }
}

// ---------------------------------------------------------------------------------------------------------------

/**
 * Validates an already-parsed document (e.g. one being edited in the app), migrating older versions first.
 * Reports every problem at once.
 */
export function validateStudy(json: unknown): ParseStudyResult {
  if (!isObject(json)) {
    return { ok: false, problems: [{ path: 'document', message: `the file holds ${describe(json)}, not a study object`, fix: `A study file is a JSON object starting with { and containing "format": "${STUDY_FORMAT}".` }] }
  }
  if (json.format !== STUDY_FORMAT) {
    return {
      ok: false,
      problems: [
        {
          path: 'format',
          message: json.format === undefined ? 'the document has no "format" field, so it is not a Motebench study' : `the format is ${describe(json.format)}, not "${STUDY_FORMAT}"`,
          fix: `Open a study (.mote) file saved by Motebench; if this is one, add "format": "${STUDY_FORMAT}".`
        }
      ]
    }
  }
  const v = json.version
  if (!isNum(v) || !Number.isInteger(v) || v < 1) {
    return { ok: false, problems: [{ path: 'version', message: v === undefined ? 'the document has no "version" field' : `the version is ${describe(v)}, not a whole number from 1`, fix: `Add "version": ${STUDY_VERSION} if the file was written for this program.` }] }
  }
  if (v > STUDY_VERSION) {
    return {
      ok: false,
      problems: [
        {
          path: 'version',
          message: `the file has study version ${v}, but this program reads versions 1 to ${STUDY_VERSION}`,
          fix: `Open it with a newer Motebench (one that reads version ${v}), or ask for a copy saved as version ${STUDY_VERSION}.`
        }
      ]
    }
  }
  const migration = migrateStudy(json)
  const doc = migration.document
  const problems: StudyProblem[] = []
  const warnings: string[] = [...migration.warnings]
  const r = studySchema.safeParse(doc)
  if (!r.success) for (const issue of r.error.issues) problems.push(...issueToProblems(issue, doc))
  crossChecks(doc, problems, warnings)
  if (problems.length > 0) {
    for (const p of problems) {
      const old = Object.entries(migration.renamedPaths).find(([now]) => p.path === now || p.path.startsWith(`${now}[`) || p.path.startsWith(`${now}.`))
      if (old) p.message += ` (in this version ${migration.fromVersion} file: ${old[1]})`
    }
    return { ok: false, problems }
  }
  return { ok: true, study: r.data as Study, warnings }
}

/**
 * Reads a study from the text of a `.mote` file: JSON syntax (with line and column), format name, version
 * (older versions are migrated with a warning; newer ones are refused), then every value.
 */
export function parseStudy(text: string, fileName?: string): ParseStudyResult {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text
  let json: unknown
  try {
    json = JSON.parse(body)
  } catch {
    const where = findJsonSyntaxError(text)
    const file = fileName ? `${fileName} ` : ''
    if (looksLikeDelimitedTable(body)) {
      return {
        ok: false,
        problems: [
          {
            path: `${file}document`.trim(),
            message: 'this is a table of values (CSV or similar, such as a sizer export), not a Motebench study',
            fix: 'Import it as a sizer file instead (in the app: Import sizer file…; on the command line: motebench series or motebench closure --sizer); studies are .mote files saved by Motebench.'
          }
        ]
      }
    }
    if (where) {
      return { ok: false, problems: [{ path: `${file}line ${where.line} column ${where.column}`, message: `not valid JSON: ${where.message}`, fix: where.fix, line: where.line, column: where.column }] }
    }
    return { ok: false, problems: [{ path: `${file}document`.trim(), message: 'not valid JSON', fix: 'Check the file in a text editor; it may be damaged.' }] }
  }
  return validateStudy(json)
}
