/**
 * The campaign of a study (`study.campaign`): references to a station's instrument files (paths relative to the
 * study file where possible, never a copy of their data), what kind each is, and the parameters the merge and
 * the optics need. The record itself is made from the files' texts by `buildCampaignRecord` (campaign.ts).
 *
 * Example:
 * "campaign": {
 *   "files": [ { "kind": "mobility", "path": "field/valley-mobility.csv" },
 *              { "kind": "aerodynamic", "path": "field/valley-aerodynamic.csv" },
 *              { "kind": "scattering", "path": "field/valley-nephelometer.csv" } ],
 *   "sample": "Quarry dust event", "wavelength_nm": 550,
 *   "density_g_cm3": 1.8, "shape_factor": 1, "step_s": 300
 * }
 */
import * as z from 'zod'
export { fileChange, sampledFingerprint, textFingerprint, wholeTextFingerprint, FINGERPRINT_SPAN, WHOLE_FINGERPRINT } from './fingerprint.ts'

/** What an instrument file holds: a sizer's distributions (or an already merged file), or measured coefficients. */
export const CAMPAIGN_FILE_KINDS = ['mobility', 'aerodynamic', 'optical', 'merged', 'scattering', 'absorption'] as const
export type CampaignFileKind = (typeof CAMPAIGN_FILE_KINDS)[number]

/** Words for each kind, for summaries and menus. */
export const CAMPAIGN_KIND_WORDS: Record<CampaignFileKind, string> = {
  mobility: 'mobility sizer',
  aerodynamic: 'aerodynamic sizer',
  optical: 'optical particle counter',
  merged: 'merged size distribution',
  scattering: 'nephelometer (scattering)',
  absorption: 'absorption photometer'
}

export const isSizerKind = (k: CampaignFileKind): boolean => k === 'mobility' || k === 'aerodynamic' || k === 'optical' || k === 'merged'

export type CampaignFileRef = {
  kind: CampaignFileKind
  /** Relative to the study file's folder (forward slashes), or absolute when the study is unsaved or on another drive. */
  path: string
  /** The file's size and a hash of its text when it was added, to say when it changed. */
  size?: number
  hash?: string
}

export type CampaignSettings = {
  files: CampaignFileRef[]
  /** The study's sample whose composition, humidity and layer the record (and every sample made from it) takes. */
  sample: string
  /** The wavelength of the record's computed figures, nm. */
  wavelength_nm: number
  /** Particle density, g cm⁻³: needed with an aerodynamic sizer. */
  density_g_cm3?: number
  /** Dynamic shape factor χ (1: spheres). */
  shape_factor: number
  /** Optical particle counter: the particles' index at its laser and its collection angles. */
  counter?: { n: number; k: number; wavelength_nm: number; angles_deg: [number, number] }
  /** Averaging step of the merge, s (default: the coarsest sizer's interval). */
  step_s?: number
  /**
   * Correct the measured scattering for the nephelometer's angular truncation (as `series --truncation`): the
   * angles it sees, degrees (default DEFAULT_NEPHELOMETER_ANGLES, 7–170°). Absent: compared as measured.
   */
  truncation?: { angles_deg: [number, number] }
}

const positive = (what: string, example: string, lo = 0, hi = Infinity) =>
  z.number().superRefine((v, ctx) => {
    if (!(v > lo && v <= hi)) ctx.addIssue({ code: 'custom', message: `${what} ${v} is outside ${lo} to ${hi}`, params: { fix: `Give ${what}, e.g. ${example}.` } })
  })

const fileRef = z.strictObject({
  kind: z.enum(CAMPAIGN_FILE_KINDS),
  path: z.string().superRefine((v, ctx) => {
    if (v.trim() === '') ctx.addIssue({ code: 'custom', message: 'the file path is empty', params: { fix: 'Give the path of the instrument file relative to the study file, e.g. "field/mobility.csv".' } })
  }),
  size: z.number().int().min(0).optional(),
  hash: z.string().optional()
})

/** The zod schema of `study.campaign` (relations between fields are checked by `campaignProblems`). */
export const campaignSettingsSchema = z.strictObject({
  files: z.array(fileRef),
  sample: z.string(),
  wavelength_nm: positive('the wavelength in nm', '550', 200, 40000),
  density_g_cm3: positive('the particle density in g cm⁻³', '1.8', 0.1, 25).optional(),
  shape_factor: z.number().superRefine((v, ctx) => {
    if (!(v >= 1 && v <= 5)) ctx.addIssue({ code: 'custom', message: `the dynamic shape factor ${v} is outside 1 to 5`, params: { fix: 'Give 1 for spheres, about 1.1–1.4 for compact irregular particles.' } })
  }),
  counter: z
    .strictObject({
      n: positive('the real part n of the counter index', '1.53', 1, 3),
      k: z.number().min(0).max(3),
      wavelength_nm: positive("the counter's laser wavelength in nm", '780', 200, 2000),
      angles_deg: z.tuple([z.number().min(0).max(180), z.number().min(0).max(180)])
    })
    .optional(),
  step_s: positive('the averaging step in seconds', '300', 0, 86400 * 31).optional(),
  truncation: z.strictObject({ angles_deg: z.tuple([z.number().min(0).max(90), z.number().gt(90).max(180)]) }).optional()
})

/** One relation the schema cannot see: where (a JSON path under `campaign`), what and how to fix it. */
export interface CampaignProblem {
  path: string
  message: string
  fix: string
}

/** Relations between the campaign's fields and the study: one file per kind, what the merge needs, the sample. */
export function campaignProblems(c: CampaignSettings, sampleNames: readonly string[]): CampaignProblem[] {
  const out: CampaignProblem[] = []
  const seen = new Map<CampaignFileKind, number>()
  c.files.forEach((f, i) => {
    const before = seen.get(f.kind)
    if (before !== undefined) out.push({ path: `campaign.files[${i}].kind`, message: `a second ${CAMPAIGN_KIND_WORDS[f.kind]} file (the first is files[${before}])`, fix: 'Keep one file per instrument kind: remove one, or join the two exports into one file.' })
    else seen.set(f.kind, i)
  })
  const kinds = new Set(c.files.map((f) => f.kind))
  if (kinds.has('merged') && (kinds.has('mobility') || kinds.has('aerodynamic') || kinds.has('optical'))) {
    out.push({ path: 'campaign.files', message: 'a merged size distribution together with sizer files', fix: 'Give either the sizers to merge or one already merged file, not both.' })
  }
  if (kinds.has('aerodynamic') && c.density_g_cm3 === undefined) {
    out.push({ path: 'campaign.density_g_cm3', message: 'an aerodynamic sizer needs the particle density to convert its diameters', fix: 'Give the particle density in g cm⁻³, e.g. 1.8.' })
  }
  if (kinds.has('optical') && c.counter === undefined) {
    out.push({ path: 'campaign.counter', message: 'an optical particle counter needs the particle index at its laser and its collection angles', fix: 'Give e.g. "counter": { "n": 1.53, "k": 0.01, "wavelength_nm": 780, "angles_deg": [35, 120] }.' })
  }
  if (c.counter && !(c.counter.angles_deg[1] > c.counter.angles_deg[0])) {
    out.push({ path: 'campaign.counter.angles_deg', message: `the collection angles ${c.counter.angles_deg[0]}–${c.counter.angles_deg[1]}° do not ascend`, fix: 'Give the lower angle first, e.g. [35, 120].' })
  }
  if (c.truncation && !(c.truncation.angles_deg[1] > c.truncation.angles_deg[0])) {
    out.push({ path: 'campaign.truncation.angles_deg', message: `the nephelometer's angles ${c.truncation.angles_deg[0]}–${c.truncation.angles_deg[1]}° do not ascend`, fix: 'Give the lower angle first, e.g. [7, 170].' })
  }
  if (!sampleNames.includes(c.sample)) {
    out.push({ path: 'campaign.sample', message: `no sample is named "${c.sample}"`, fix: `Name the sample whose composition and humidity the record takes: ${sampleNames.map((n) => `"${n}"`).join(', ')}.` })
  }
  return out
}

// ---------------------------------------------------------------------------------------------------------------
// Paths: pure string work (no file system here), so the app and the CLI agree on what a reference means.

const isAbsolute = (p: string): boolean => p.startsWith('/') || /^[A-Za-z]:[\\/]/.test(p) || p.startsWith('\\\\')
const parts = (p: string): string[] => p.replace(/\\/g, '/').split('/').filter((s) => s !== '' && s !== '.')
const root = (p: string): string => (p.startsWith('/') ? '/' : /^[A-Za-z]:/.test(p) ? p.slice(0, 2).toUpperCase() + '/' : '')

/** The folder of a file path ("/a/b/study.mote" → "/a/b"). */
export function folderOf(filePath: string): string {
  const p = filePath.replace(/\\/g, '/')
  const i = p.lastIndexOf('/')
  return i <= 0 ? (i === 0 ? '/' : '') : p.slice(0, i)
}

/** A file's path as the study keeps it: relative to the study's folder when both are on the same root, else absolute. */
export function relativeFilePath(studyPath: string | undefined, filePath: string): string {
  if (!studyPath || !isAbsolute(filePath) || !isAbsolute(studyPath)) return filePath.replace(/\\/g, '/')
  const dir = folderOf(studyPath)
  if (root(dir) !== root(filePath)) return filePath.replace(/\\/g, '/')
  const a = parts(dir.slice(root(dir).length))
  const b = parts(filePath.slice(root(filePath).length))
  let i = 0
  while (i < a.length && i < b.length && a[i] === b[i]) i++
  return [...a.slice(i).map(() => '..'), ...b.slice(i)].join('/')
}

/** The absolute path of a kept reference, from the study's own path (undefined when it cannot be known). */
export function resolveFilePath(studyPath: string | undefined, kept: string): string | undefined {
  if (isAbsolute(kept)) return kept
  if (!studyPath || !isAbsolute(studyPath)) return undefined
  const dir = folderOf(studyPath)
  const r = root(dir)
  const out = parts(dir.slice(r.length))
  for (const s of parts(kept)) {
    if (s === '..') out.pop()
    else out.push(s)
  }
  return r + out.join('/')
}

/**
 * The campaign's file references for a study saved at `toStudy` (its first save, or "save as" elsewhere): each file
 * found where it was (an absolute path, or one relative to `fromStudy`) is kept relative to the new study file where
 * both share a root. A relative path with no known folder (`fromStudy` undefined) stays as it is. Returns the
 * settings (the same object when nothing changes) and each changed path, old → new.
 */
export function rebaseCampaignPaths(c: CampaignSettings, fromStudy: string | undefined, toStudy: string): { settings: CampaignSettings; moved: Map<string, string> } {
  const moved = new Map<string, string>()
  const files = c.files.map((f) => {
    const abs = isAbsolute(f.path) ? f.path : resolveFilePath(fromStudy, f.path)
    if (abs === undefined) return f
    const kept = relativeFilePath(toStudy, abs)
    if (kept === f.path) return f
    moved.set(f.path, kept)
    return { ...f, path: kept }
  })
  return { settings: moved.size > 0 ? { ...c, files } : c, moved }
}

