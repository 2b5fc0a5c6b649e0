/**
 * Upgrading older study documents to the current version (STUDY_VERSION).
 *
 * Version 1 — the earlier format of this project's study files — differed from version 2 in three places:
 *
 *   version 1                                        version 2
 *   -----------------------------------------------  ----------------------------------------------------
 *   "wavelengths_um": [0.35, 0.55, ...]  (µm)        "wavelengths_nm": [350, 550, ...]  (nm)
 *   samples[i]."rh": 0.85  (a fraction, 0 to < 1)    samples[i]."rh_percent": 85  (percent, 0 to < 100)
 *   no hysteresis branch                             samples[i]."rh_history": "rising" | "falling"
 *
 * Everything else (format name, samples' size, composition and layer, user materials, site, verdict margin)
 * had the same shape. A version 1 sample is on the rising branch ("rising"), the only one version 1 modelled.
 *
 * Migration is tolerant: it converts what it can and copies the rest unchanged, so the version 2 validation
 * that follows reports any remaining problem; `renamedPaths` lets that report name the version 1 field.
 */
import { STUDY_VERSION } from './model.ts'

export interface MigrationResult {
  /** The document in the current version's shape (a new object; the input is not changed). */
  document: unknown
  /** The version the input had (STUDY_VERSION when nothing was done). */
  fromVersion: number
  /** What was changed, in plain words, for the user. */
  warnings: string[]
  /** New JSON path → the path of the field it came from in the older file (for problem reports). */
  renamedPaths: Record<string, string>
}

type Json = Record<string, unknown>

const isObject = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v)

/** ×1000 or ×100 without binary noise such as 0.55 × 1000 = 550.0000000000001. */
const scaled = (v: number, factor: number): number => Number((v * factor).toPrecision(12))

function fromVersion1(doc: Json, renamedPaths: Record<string, string>): Json {
  const out: Json = {}
  for (const [key, value] of Object.entries(doc)) {
    if (key === 'version') out.version = 2
    else if (key === 'wavelengths_um') {
      out.wavelengths_nm = Array.isArray(value) ? value.map((w) => (typeof w === 'number' ? scaled(w, 1000) : w)) : value
      renamedPaths.wavelengths_nm = 'wavelengths_um (µm, multiplied by 1000)'
    } else if (key === 'samples' && Array.isArray(value)) {
      out.samples = value.map((s, i) => {
        if (!isObject(s)) return s
        const sample: Json = {}
        for (const [k, v] of Object.entries(s)) {
          if (k === 'rh') {
            sample.rh_percent = typeof v === 'number' ? scaled(v, 100) : v
            renamedPaths[`samples[${i}].rh_percent`] = `samples[${i}].rh (a fraction 0 to 1, multiplied by 100)`
          } else sample[k] = v
        }
        if (!('rh_history' in sample)) sample.rh_history = 'rising'
        return sample
      })
    } else out[key] = value
  }
  return out
}

/**
 * Upgrades a parsed study document to version STUDY_VERSION. Documents that are not objects, that already
 * have the current version or a version this program does not know are returned unchanged (validation
 * reports them). The input is not modified.
 */
export function migrateStudy(json: unknown): MigrationResult {
  const renamedPaths: Record<string, string> = {}
  if (!isObject(json) || json.version !== 1) {
    return { document: json, fromVersion: isObject(json) && typeof json.version === 'number' ? json.version : STUDY_VERSION, warnings: [], renamedPaths }
  }
  const copy = JSON.parse(JSON.stringify(json)) as Json
  const document = fromVersion1(copy, renamedPaths)
  const warnings = [
    `migrated from version 1 to version ${STUDY_VERSION}: wavelengths converted from µm to nm, relative humidity from a fraction to percent, and every sample set on the rising humidity branch ("rh_history": "rising"); saving writes version ${STUDY_VERSION}, which older Motebench releases cannot open`
  ]
  return { document, fromVersion: 1, warnings, renamedPaths }
}
