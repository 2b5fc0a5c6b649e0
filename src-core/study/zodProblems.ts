// Turning zod's issues with a study document into problems: the JSON path, what is wrong in plain words and how
// to fix it (with a "did you mean" for a misspelt field name).
import type * as z from 'zod'
import { studySchema, type StudyProblem } from './schema.ts'

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

export function describe(v: unknown): string {
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

export function issueToProblems(issue: z.core.$ZodIssue, root: unknown): StudyProblem[] {
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
