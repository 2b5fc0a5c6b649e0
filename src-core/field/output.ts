/**
 * The merged distribution as a sizer file that Motebench's own sizer reader takes as it is: metadata lines
 * (`key: value`) stating the unit, the quantity, that the diameters are volume-equivalent bin midpoints, and how
 * the file was made; then a comma-separated table, one row per time step: the step's start (ISO 8601), then
 * dN/dlogDp (cm⁻³) per merged bin. A bin no sizer with data covers at that step is an empty cell (never filled);
 * with `instrumentsColumn` a last column names the sizers that contributed to the row.
 */
import { formatDuration } from './timebase.ts'
import { OVERLAP_RULE, type DensityFit, type MergePlan } from './merge.ts'
import type { ConversionSettings } from './diameters.ts'

export interface MergedFileInfo {
  plan: MergePlan
  settings: ConversionSettings
  /** The averaging step, ms, and how it was chosen. */
  stepMs: number
  stepChosen: 'given' | 'coarsest interval'
  zoned: boolean
  densityFit?: DensityFit
  /** Steps written, and those in which at least one sizer had no data. */
  steps: number
  gapSteps: number
  /** 'keep': gap steps are written with their uncovered bins empty; 'omit': they are left out of the table. */
  gapRows?: 'keep' | 'omit'
  instrumentsColumn: boolean
  /** Who made it, e.g. "motebench 0.1.0 merge". */
  madeBy: string
}

/** Midpoints (geometric means of the edges) in nm, with enough digits to give the edges back. */
export function mergedMidpointsNm(plan: MergePlan): number[] {
  const e = plan.edges
  const out: number[] = []
  for (let k = 0; k + 1 < e.length; k++) out.push(Number((Math.sqrt(e[k] * e[k + 1]) * 1000).toPrecision(7)))
  return out
}

function range(lo: number, hi: number): string {
  return `${Number((lo * 1000).toPrecision(4))} to ${Number((hi * 1000).toPrecision(4))} nm`
}

/** The lines before the table, and the header row. Keys avoid words the reader takes for a unit or quantity. */
export function mergedFileHead(info: MergedFileInfo): string[] {
  const { plan, settings } = info
  const lines = [
    'Merged size distribution (volume-equivalent diameter) from several sizers',
    'units: nm',
    'quantity: dN/dlogDp',
    'diameters: midpoints',
    'diameter kind: volume-equivalent (bin midpoints)',
    `made by: ${info.madeBy}`
  ]
  plan.sizers.forEach((s) => {
    lines.push(
      `source ${s.kind}: ${s.label}; trusted ${range(s.rangeVe[0], s.rangeVe[1])} volume-equivalent` +
        (s.flagged.length > 0 ? `; ${s.flagged.length} bins flagged by the counter re-binning` : '')
    )
  })
  const conv = [`dynamic shape factor ${settings.shapeFactor}`]
  if (settings.density !== undefined) conv.push(`particle density ${Number(settings.density.toPrecision(4))} g/cm3${info.densityFit ? ' (fitted in the overlap after Khlystov et al. 2004)' : ''}`)
  if (settings.optical) conv.push(`counter index ${settings.optical.index.n}+${settings.optical.index.k}i at ${settings.optical.geometry.wavelengthNm} nm`)
  lines.push(`conversion: DeCarlo et al. 2004 with the Cunningham slip correction; ${conv.join('; ')}; per-bin counts conserved`)
  if (info.densityFit) lines.push(`density fit misfit: RMS ln ratio ${info.densityFit.misfit.toPrecision(3)} over ${info.densityFit.compared} compared values`)
  lines.push(`overlap rule: ${OVERLAP_RULE}`)
  for (const o of plan.overlaps) lines.push(`overlap: ${o.lower} hands over to ${o.upper} from ${range(o.fromUm, o.toUm)}`)
  lines.push(`time base: means of the records stamped inside each step of ${formatDuration(info.stepMs)} (${info.stepChosen}); the time is the step's start${info.zoned ? ' in UTC' : ' as the files give it (no zone)'}`)
  lines.push(`gaps: ${info.gapSteps} of ${info.steps} steps lack data from a sizer; ${info.gapRows === 'omit' ? 'they are left out of the table' : 'their uncovered bins are empty cells'}`)
  const header = ['time', ...mergedMidpointsNm(plan).map(String)]
  if (info.instrumentsColumn) header.push('instruments')
  // no separators inside the metadata lines: the reader detects the table's separator from the first lines
  const head = lines.map((l) => l.replace(/\s*[;,\t]\s*/g, ' - '))
  head.push('')
  head.push(header.join(','))
  return head
}

function cell(v: number): string {
  return Number.isNaN(v) ? '' : String(Number(v.toPrecision(6)))
}

/** One table row: the time, the merged values (NaN written empty), and the contributing sizers when asked. */
export function mergedFileRow(time: string, values: ArrayLike<number>, contributors?: readonly string[]): string {
  let s = time
  for (let k = 0; k < values.length; k++) s += ',' + cell(values[k])
  if (contributors) s += ',' + (contributors.length > 0 ? contributors.join('+') : 'none')
  return s
}
