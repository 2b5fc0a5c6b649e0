/**
 * Writing a study as the text of a `.mote` file: pretty JSON, 2-space indent, trailing newline, keys in a
 * fixed order (so saving the same study twice gives the same bytes and diffs stay small), lists of plain
 * numbers on one line, and small objects of plain values (up to 120 characters with their indent) on one line. `parseStudy(serializeStudy(s))` gives back `s`.
 */
import type { Study } from './model.ts'

/** Preferred key order; keys not listed follow in their own order (e.g. inside `uncertainty`). */
const KEY_ORDER = [
  'format',
  'version',
  'name',
  'notes',
  'id',
  'kind',
  'by',
  'wavelengths_nm',
  'site',
  'latitude_deg',
  'day_of_year',
  'cloud_fraction',
  'transmittance',
  'surface',
  'surface_albedo',
  'verdict_margin_w_m2',
  'user_materials',
  'samples',
  'rh_percent',
  'rh_history',
  'temperature_k',
  'layer',
  'depth_m',
  'scale_height_m',
  'aod_550',
  'composition',
  'components',
  'material',
  'volume_fraction',
  'mixing',
  'density_g_cm3',
  'kappa',
  'size',
  'modes',
  'number_cm3',
  'volume_um3_cm3',
  'mass_ug_m3',
  'median_um',
  'gsd',
  'bins',
  'diameter_unit',
  'edges',
  'quantity',
  'diameters',
  'values',
  'index',
  'n',
  'k',
  'rows',
  'source',
  'rows_averaged',
  'spread',
  'uncertainty',
  'campaign'
]
/** Longest line (with its indent) for an object written on one line. */
const INLINE_WIDTH = 120
const RANK = new Map(KEY_ORDER.map((k, i) => [k, i]))

function orderedKeys(o: Record<string, unknown>): string[] {
  const keys = Object.keys(o).filter((k) => o[k] !== undefined)
  const known = keys.filter((k) => RANK.has(k)).sort((a, b) => (RANK.get(a) as number) - (RANK.get(b) as number))
  return [...known, ...keys.filter((k) => !RANK.has(k))]
}

function write(v: unknown, indent: string): string {
  if (Array.isArray(v)) {
    if (v.length === 0) return '[]'
    if (v.every((x) => typeof x === 'number')) return `[${v.map((x) => JSON.stringify(x)).join(', ')}]`
    const inner = indent + '  '
    return `[\n${v.map((x) => inner + write(x, inner)).join(',\n')}\n${indent}]`
  }
  if (v !== null && typeof v === 'object') {
    const o = v as Record<string, unknown>
    const keys = orderedKeys(o)
    if (keys.length === 0) return '{}'
    // Small objects of plain values (a layer, a component share) fit on one line.
    if (keys.every((k) => o[k] === null || typeof o[k] !== 'object')) {
      const line = `{ ${keys.map((k) => `${JSON.stringify(k)}: ${JSON.stringify(o[k]) ?? 'null'}`).join(', ')} }`
      if (indent.length + line.length <= INLINE_WIDTH) return line
    }
    const inner = indent + '  '
    return `{\n${keys.map((k) => `${inner}${JSON.stringify(k)}: ${write(o[k], inner)}`).join(',\n')}\n${indent}}`
  }
  // JSON.stringify writes non-finite numbers as null; a validated study has none.
  return JSON.stringify(v) ?? 'null'
}

/** The study as `.mote` file text: stable pretty JSON with a trailing newline. */
export function serializeStudy(study: Study): string {
  return write(study, '') + '\n'
}
