/**
 * What is made from a campaign's record: the series the charts draw (null in gaps, never a made-up number), a
 * stretch of time turned into a sample (the mean distribution with its spread, named by its ISO 8601 time
 * interval, keeping where it came from), and the record as CSV in the columns `motebench series` writes.
 */
import { InputError } from '../errors.ts'
import { angstromExponent } from '../optics/metrics.ts'
import type { Sample } from '../study/model.ts'
import { CAMPAIGN_KIND_WORDS } from './campaign-settings.ts'
import { angstromPairNm, completeRecord, nearestScattering, type CampaignRecord } from './campaign.ts'
import { recordedHumidity, type SampleHumidity } from './humidity.ts'
import { absorptionAt } from './optical.ts'

/** The figures the record's charts draw, each at the chosen wavelength unless its name says otherwise. */
export const RECORD_SERIES = ['ext', 'sca', 'abs', 'ssa', 'g', 'angstrom', 'number', 'mass', 'sca_meas', 'abs_meas', 'sca_ratio', 'abs_ratio'] as const
export type RecordSeriesName = (typeof RECORD_SERIES)[number]

/** What the charts' series tell beside their values. */
interface SeriesMeta {
  /** The Ångström exponent's two wavelengths: the computed ones on either side of the chosen one (nm). */
  angstromPairNm: [number, number]
  /** The wavelength each measured figure is compared at, nm (NaN when there is no such instrument). */
  scatteringAtNm: number
  absorptionAtNm: number
  /** true: `sca_meas` (and so `sca_ratio`) is the measured scattering corrected for the nephelometer's truncation. */
  scatteringCorrected: boolean
}

export interface RecordSeries extends SeriesMeta {
  /** Time, s since 1970 (uPlot's time unit), one per row, with a break (null everywhere) inserted in each gap. */
  x: number[]
  /** Row of the record behind each x (−1 for an inserted break). */
  row: number[]
  values: Record<RecordSeriesName, (number | null)[]>
}

/**
 * The charts' series in typed arrays (what the app's charts keep: a year's 12 series of numbers and nulls were
 * 1.2 million values boxed one by one): the same points as `recordSeries`, NaN where it gives null.
 */
export interface RecordColumns extends SeriesMeta {
  x: Float64Array
  row: Int32Array
  values: Record<RecordSeriesName, Float64Array>
}

/** A figure as the charts take it: NaN when it is not a finite number (no value to draw). */
const finite = (v: number): number => (Number.isFinite(v) ? v : NaN)

/**
 * The charts' series over rows [from, to) (default all). The Ångström exponent of extinction is taken between the
 * computed wavelengths on either side of the chosen one (as the optics table gives it at each wavelength,
 * localAngstromExponents). A row without a distribution gives null in every
 * computed figure; a spacing above 1.5 times the record's interval gets a break, so lines stop across gaps.
 * Measured scattering is the nephelometer's at its wavelength nearest the chosen one (compared with the computed
 * scattering there); measured absorption is carried to the chosen wavelength by its own Ångström exponent
 * (absorptionAt, as `series` carries it for ω). With the truncation correction on, the measured scattering and its
 * ratio are the corrected ones (`sca_meas_corr_…`, as `series --truncation` writes them).
 */
export function recordSeries(r: CampaignRecord, from = 0, to = r.times.length): RecordSeries {
  const c = recordColumns(r, from, to)
  const nulls = (v: Float64Array) => Array.from(v, (y) => (y === y ? y : null))
  return {
    x: Array.from(c.x),
    row: Array.from(c.row),
    values: Object.fromEntries(RECORD_SERIES.map((k) => [k, nulls(c.values[k])])) as RecordSeries['values'],
    angstromPairNm: c.angstromPairNm,
    scatteringAtNm: c.scatteringAtNm,
    absorptionAtNm: c.absorptionAtNm,
    scatteringCorrected: c.scatteringCorrected
  }
}

/** `recordSeries` in typed arrays: the same points and figures, NaN for null. */
export function recordColumns(r: CampaignRecord, from = 0, to = r.times.length): RecordColumns {
  const col = (name: string) => r.columns.indexOf(name)
  const w = r.chosenNm
  const iExt = col(`ext_${w}nm_Mm-1`)
  const iSca = col(`sca_${w}nm_Mm-1`)
  const iAbs = col(`abs_${w}nm_Mm-1`)
  const iSsa = col(`ssa_${w}nm`)
  const iG = col(`g_${w}nm`)
  const iN = col('dry_number_cm-3')
  const iM = col('dry_mass_ug_m-3')
  const pair = angstromPairNm(r.wavelengthsNm, w)
  const iLo = col(`ext_${pair[0]}nm_Mm-1`)
  const iHi = col(`ext_${pair[1]}nm_Mm-1`)
  const absCh = r.channels.map((c, i) => ({ c, i })).filter((x) => x.c.quantity === 'absorption')
  const nearest = nearestScattering(r.channels, w)
  const iScaAt = nearest ? col(`sca_${nearest.wavelengthNm}nm_Mm-1`) : -1
  // with the truncation correction on (campaign.truncation), the corrected measured scattering (RowComparer's)
  const iScaCorr = nearest ? col(`sca_meas_corr_${nearest.wavelengthNm}nm_Mm-1`) : -1
  const absWl = absCh.map((x) => x.c.wavelengthNm)
  const absVals = new Float64Array(absCh.length)
  const width = r.columns.length
  const nc = r.channels.length
  const lo = Math.max(0, from)
  const hi = Math.min(r.times.length, to)
  // the points: the rows and a break in each gap between them
  let n = Math.max(0, hi - lo)
  for (let k = lo + 1; k < hi; k++) if (r.times[k] - r.times[k - 1] > 1.5 * r.intervalMs) n++
  const x = new Float64Array(n)
  const rowOf = new Int32Array(n)
  const values = Object.fromEntries(RECORD_SERIES.map((k) => [k, new Float64Array(n).fill(NaN)])) as RecordColumns['values']
  const { ext, sca, abs, ssa, g, angstrom, number, mass, sca_meas, abs_meas, sca_ratio, abs_ratio } = values
  let p = 0
  for (let k = lo; k < hi; k++) {
    if (k > lo && r.times[k] - r.times[k - 1] > 1.5 * r.intervalMs) {
      x[p] = (r.times[k - 1] + r.times[k]) / 2 / 1000
      rowOf[p++] = -1
    }
    x[p] = r.times[k] / 1000
    rowOf[p] = k
    if (!r.present[k]) {
      p++
      continue
    }
    const c = k * width
    ext[p] = finite(r.cells[c + iExt])
    sca[p] = finite(r.cells[c + iSca])
    abs[p] = finite(r.cells[c + iAbs])
    ssa[p] = finite(r.cells[c + iSsa])
    g[p] = finite(r.cells[c + iG])
    angstrom[p] = finite(angstromExponent(r.cells[c + iLo], pair[0], r.cells[c + iHi], pair[1]))
    number[p] = finite(r.cells[c + iN])
    mass[p] = finite(r.cells[c + iM])
    const sm = iScaCorr >= 0 ? r.cells[c + iScaCorr] : nearest ? r.measured[k * nc + nearest.index] : NaN
    sca_meas[p] = finite(sm)
    if (sm > 0) sca_ratio[p] = finite(r.cells[c + iScaAt] / sm)
    for (let j = 0; j < absCh.length; j++) absVals[j] = r.measured[k * nc + absCh[j].i]
    const am = absCh.length > 0 ? absorptionAt(w, absWl, absVals) : NaN
    abs_meas[p] = finite(am)
    if (am > 0) abs_ratio[p] = finite(r.cells[c + iAbs] / am)
    p++
  }
  return { x, row: rowOf, values, angstromPairNm: pair, scatteringAtNm: nearest?.wavelengthNm ?? NaN, absorptionAtNm: absCh.length > 0 ? w : NaN, scatteringCorrected: iScaCorr >= 0 }
}

/** The rows whose start lies in [fromMs, toMs] (first and last index; last < first when none). */
export function rowsIn(r: CampaignRecord, fromMs: number, toMs: number): [number, number] {
  let a = 0
  while (a < r.times.length && r.times[a] < fromMs) a++
  let b = r.times.length - 1
  while (b >= 0 && r.times[b] > toMs) b--
  return [a, b]
}

/** A stretch of the record made into a sample: its mean distribution, the spread, the count and where it came from. */
export interface StretchSample {
  sample: Sample
  rows: number
  /** Rows in the stretch without a distribution (gaps), left out of the mean. */
  gapRows: number
  /** Where the sample's humidity came from: the files (the mean recorded over `rows` of the rows taken) or the study's sample. */
  humidity: SampleHumidity
}

/**
 * The sample of the rows whose start lies in [fromMs, toMs]: the arithmetic mean of their distributions bin by bin
 * (rows without one are left out and counted), each bin's sample standard deviation as its spread (0 for one
 * row), the campaign sample's composition and layer, the humidity recorded in the files where the rows have one
 * (their mean, `stretchHumidity`) or else the campaign sample's, named by the ISO 8601 interval of the rows taken;
 * its notes say where each came from.
 * Throws InputError when the stretch holds no distribution.
 */
export function stretchSample(r: CampaignRecord, fromMs: number, toMs: number): StretchSample {
  const [a, b] = rowsIn(r, fromMs, toMs)
  const n = r.bins
  const sum = new Float64Array(n)
  const sq = new Float64Array(n)
  let count = 0
  let gapRows = 0
  let first = -1
  let last = -1
  for (let k = a; k <= b; k++) {
    if (!r.present[k]) {
      gapRows++
      continue
    }
    if (first < 0) first = k
    last = k
    count++
    for (let j = 0; j < n; j++) sum[j] += r.values[k * n + j]
  }
  if (count === 0) {
    throw new InputError(
      'time range',
      b < a ? 'no row of the record starts in the marked stretch' : `the ${gapRows} row${gapRows === 1 ? '' : 's'} in the marked stretch ${gapRows === 1 ? 'is a gap' : 'are gaps'} without a distribution`,
      'Mark a stretch that holds at least one row with data (the colour map shows where the distributions are).'
    )
  }
  const mean = Array.from(sum, (s) => s / count)
  for (let k = first; k <= last; k++) {
    if (!r.present[k]) continue
    for (let j = 0; j < n; j++) {
      const d = r.values[k * n + j] - mean[j]
      sq[j] += d * d
    }
  }
  const spread = Array.from(sq, (s) => (count > 1 ? Math.sqrt(s / (count - 1)) : 0))
  const humidity = stretchHumidity(r, first, last)
  const name = `${r.timeText[first]}/${r.timeText[last]}`
  const files = r.files.filter((f) => f.ok && f.bins > 0).map((f) => `${f.name} (${CAMPAIGN_KIND_WORDS[f.kind]})`)
  const source = `campaign ${files.join(' + ')}, mean of ${count} row${count === 1 ? '' : 's'} ${name}${gapRows > 0 ? ` (${gapRows} gap row${gapRows === 1 ? '' : 's'} left out)` : ''}`
  const base = structuredClone(r.sample)
  const sample: Sample = {
    ...base,
    name,
    rh_percent: humidity.percent,
    notes:
      humidity.from === 'files'
        ? `Made from the campaign record: ${source}; humidity ${humidity.percent} % from the files: the mean relative humidity recorded in ${humidity.file} over ${humidity.rows} of the ${count} rows; composition and layer of the sample "${r.sample.name}".`
        : `Made from the campaign record: ${source}; composition, humidity and layer of the sample "${r.sample.name}" (humidity ${humidity.percent} %: ${humidity.why}).`,
    size: { kind: 'bins', bins: { diameters: r.layout.diameters.slice(), diameter_unit: r.layout.diameter_unit, edges: r.layout.edges, quantity: r.layout.quantity, values: mean, source, rows_averaged: count, spread } }
  }
  return { sample, rows: count, gapRows, humidity }
}

/**
 * The humidity of a stretch's sample: the mean of the humidity recorded in the files over the rows taken (those
 * with a distribution and a recorded value), rounded to 0.1 %; else the campaign sample's, saying why.
 */
function stretchHumidity(r: CampaignRecord, first: number, last: number): SampleHumidity {
  if (!r.rh || !r.rhFile) return { from: 'study', percent: r.sample.rh_percent, why: 'no file of the campaign records a humidity' }
  let sum = 0
  let rows = 0
  for (let k = first; k <= last; k++) {
    const v = r.rh[k]
    if (!r.present[k] || !(v === v)) continue
    sum += v
    rows++
  }
  return recordedHumidity(r.rhFile, sum, rows, r.sample.rh_percent)
}

/** A number as `motebench series` writes it: 7 significant digits, empty when not finite. */
export const recordCell = (v: number): string => (Number.isFinite(v) ? String(Number(v.toPrecision(7))) : '')

/**
 * The record as CSV, in the columns and number form of `motebench series` on the same files (its "#" lines
 * first when instruments are compared): the rows with a distribution whose start lies in [fromMs, toMs]. A record
 * made for its charts is completed first (completeRecord: every wavelength's figures).
 */
export function recordCsv(r: CampaignRecord, fromMs = -Infinity, toMs = Infinity): string {
  completeRecord(r)
  const lines = r.notes.map((x) => `# ${x}`)
  lines.push(['time', ...r.columns].join(','))
  const width = r.columns.length
  for (let k = 0; k < r.times.length; k++) {
    if (!r.present[k] || r.times[k] < fromMs || r.times[k] > toMs) continue
    let line = /[",\r\n]/.test(r.timeText[k]) ? `"${r.timeText[k].replace(/"/g, '""')}"` : r.timeText[k]
    for (let c = 0; c < width; c++) line += ',' + recordCell(r.cells[k * width + c])
    lines.push(line)
  }
  return lines.join('\n') + '\n'
}
