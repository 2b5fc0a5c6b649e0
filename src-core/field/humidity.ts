/**
 * Relative humidity recorded in an instrument file (a sizer export's or a nephelometer's "RH" column): which header
 * cells name it, and which cells are kept. One place for the sizer reader and the optical-file reader.
 *
 * A header names the humidity when it is RH, R.H., relative humidity or humidity, with "sample" before or after and
 * an optional percent unit: "RH", "RH (%)", "rh [%]", "RH%", "sample RH", "RH sample", "Sample RH (%)",
 * "humidity %", "Relative humidity (%)". Other units (a fraction, g/kg) are not read as percent: such a column stays
 * an ignored one.
 *
 * A cell is kept when it is a number from 0 to 100 %; an empty cell (or NaN, NA) means no value; anything else,
 * outside 0–100 % or not a number, is left out with its reason, and the row's distribution or coefficients are kept.
 * `humidityOnRows` averages a file's values onto a campaign record's rows.
 */
import { stampTimeBase, TimeAverager } from './timebase.ts'

/** A cell that means "no value": empty, NaN, NA or n/a (any case). Shared with the optical-file reader. */
export const MISSING_CELL = /^(|nan|na|n\/a)$/i

const HUMIDITY_HEADER = /^(?:sample[\s_-]*)?(?:rh|r\.h\.|rel(?:ative|\.)?[\s_-]*humidity|humidity)(?:[\s_-]*sample)?(?:[\s_-]*(?:[([]\s*%\s*[)\]]|%|percent|pct))?$/i

/** True when a header cell names a relative-humidity column in percent. */
export function isHumidityHeader(cell: string): boolean {
  return HUMIDITY_HEADER.test(cell.trim())
}

/** What is wrong with a humidity cell, or undefined when it is kept (a value) or empty (no value). */
export function humidityProblem(cell: string, value: number): { reason: string; fix: string } | undefined {
  const t = cell.trim()
  if (MISSING_CELL.test(t)) return undefined
  if (!Number.isFinite(value)) return { reason: `the relative humidity "${t}" is not a number; the row's humidity is left out (its other values are kept)`, fix: 'Write the humidity in percent as a plain number, or leave the cell empty when there is none.' }
  if (value < 0 || value > 100) return { reason: `the relative humidity ${t} % is outside 0–100 %; the row's humidity is left out (its other values are kept)`, fix: 'Check the humidity sensor and its column (a fraction such as 0.45 is to be written 45); leave the cell empty when there is no good value.' }
  return undefined
}

/** The value of a humidity cell: its number from 0 to 100, else NaN (empty, or left out by humidityProblem). */
export function humidityValue(cell: string, value: number): number {
  return Number.isFinite(value) && value >= 0 && value <= 100 && cell.trim() !== '' ? value : NaN
}

/**
 * A file's recorded humidity averaged onto a record's rows: per row (a step from its time to the next row's, at
 * most `intervalMs` long: stampTimeBase), the mean of the file's values whose time falls in it; NaN where none does.
 */
export function humidityOnRows(rowTimesMs: ArrayLike<number>, intervalMs: number, timesMs: ArrayLike<number>, rh: ArrayLike<number>): Float64Array {
  const n = rowTimesMs.length
  const out = new Float64Array(n).fill(NaN)
  if (n === 0) return out
  const averager = new TimeAverager(stampTimeBase(rowTimesMs, intervalMs), 2)
  const pair = new Float64Array(2)
  for (let i = 0; i < timesMs.length; i++) {
    const v = rh[i]
    if (!(v === v)) continue
    pair[0] = v
    pair[1] = 1
    averager.add(timesMs[i], pair)
  }
  const means = averager.means()
  for (let k = 0; k < n; k++) {
    const m = means[k]
    if (m && m[1] > 0) out[k] = m[0] / m[1]
  }
  return out
}

/** Where a sample made from measured rows takes its humidity: the files' record, or the sample it starts from. */
export type SampleHumidity = { from: 'files'; file: string; rows: number; percent: number } | { from: 'study'; percent: number; why: string }

/**
 * The humidity of a sample made from measured rows: the mean of the values `file` recorded over them (`sum` of
 * `rows` values), rounded to 0.1 %, unless no row records one, or the mean is not below 100 % (cloud, not
 * aerosol: the growth laws hold below saturation); then `own`, the humidity of the sample it starts from, with
 * why. One rule for a stretch of the station record and for the mean of a sizer file's rows.
 */
export function recordedHumidity(file: string, sum: number, rows: number, own: number): SampleHumidity {
  if (rows === 0) return { from: 'study', percent: own, why: `${file} records no humidity in these rows` }
  const mean = Math.round((sum / rows) * 10) / 10
  if (!(mean < 100)) return { from: 'study', percent: own, why: `the humidity recorded in ${file} averages ${mean} % here, not below 100 % (cloud, not aerosol)` }
  return { from: 'files', file, rows, percent: mean }
}

/** The humidity values of an instrument file, counted as they are read: how many, their sum, lowest and highest. */
export class HumidityTally {
  rows = 0
  sum = 0
  min = Infinity
  max = -Infinity
  /** One record's humidity (NaN or undefined: none). */
  add(v: number | undefined): void {
    if (v === undefined || !(v === v)) return
    this.rows++
    this.sum += v
    if (v < this.min) this.min = v
    if (v > this.max) this.max = v
  }
}

/**
 * The note a comparison of computed with measured scattering carries when the nephelometer's file records the
 * humidity it measured at: the rows are computed at the sample's humidity, so where the two differ the ratios
 * include the particles' growth between them (a nephelometer is usually run dried, below 40 %: common practice).
 * Undefined when the file records none. The same words in `motebench series` and the station record's export.
 */
export function humidityComparisonNote(file: string, t: HumidityTally, samplePercent: number): string | undefined {
  if (t.rows === 0) return undefined
  const r1 = (v: number) => Math.round(v * 10) / 10
  return `humidity: the rows are computed at the sample's ${samplePercent} %; ${file} recorded ${r1(t.sum / t.rows)} % on average (${r1(t.min)} to ${r1(t.max)} %, ${t.rows} records), so where they differ the scattering ratios include the particles' growth between the two humidities`
}
