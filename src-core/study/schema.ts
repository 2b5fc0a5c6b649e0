/**
 * The study document's schema (zod): shapes, types and each value's range, each with a plain-language fix.
 * `parseStudy` (validate.ts) runs it, turns its issues into problems (zodProblems.ts) and then looks at the
 * relations between values (crossChecks.ts).
 */
import * as z from 'zod'
import { readableBeside } from '../numberText.ts'
import { BIN_QUANTITIES, MAX_GSD } from '../sizes/index.ts'
import { LONGWAVE_INPUT_RANGES, type LongwaveInputName } from '../climate/index.ts'
import { uncertaintySettingsSchema } from '../uncertainty/settings.ts'
import { campaignSettingsSchema } from '../field/campaign-settings.ts'
import { STUDY_FORMAT, STUDY_VERSION, type Study } from './model.ts'

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
export const fmt = (v: number): string => readableBeside(v, 0, 1, 100)

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

export const userMaterial = z.strictObject({
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
