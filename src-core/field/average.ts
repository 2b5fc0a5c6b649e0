// The mean of the distributions of a sizer table over a range of time (or of records), as one distribution.
import { InputError } from '../errors.ts'
import type { SizerRecord } from './types.ts'

export interface AveragedRecords {
  /** Mean value of each bin over the records taken. */
  values: number[]
  /** How many records were averaged. */
  count: number
  /** Times (as in the records) of the first and last record taken. */
  firstTime: string
  lastTime: string
  /** The relative humidity recorded in the records taken (a file with a humidity column): the sum of the values and how many records have one. */
  rhSum: number
  rhRows: number
}

/**
 * The arithmetic mean, bin by bin, of the records whose time lies in [fromMs, toMs] (inclusive; either end
 * open when undefined) and whose index lies in [fromIndex, toIndex] (the same). Records without a time
 * (timeMs NaN) are taken only when no time bound is given. Throws InputError when no record is in range.
 */
export function averageRecords(records: readonly SizerRecord[], range: { fromMs?: number; toMs?: number; fromIndex?: number; toIndex?: number } = {}): AveragedRecords {
  const byTime = range.fromMs !== undefined || range.toMs !== undefined
  const lo = range.fromMs ?? -Infinity
  const hi = range.toMs ?? Infinity
  const i0 = Math.max(0, range.fromIndex ?? 0)
  const i1 = Math.min(records.length - 1, range.toIndex ?? records.length - 1)
  let sum: Float64Array | undefined
  let count = 0
  let firstTime = ''
  let lastTime = ''
  let rhSum = 0
  let rhRows = 0
  for (let i = i0; i <= i1; i++) {
    const r = records[i]
    if (byTime && !(r.timeMs >= lo && r.timeMs <= hi)) continue
    sum ??= new Float64Array(r.values.length)
    for (let j = 0; j < sum.length; j++) sum[j] += r.values[j]
    if (count === 0) firstTime = r.time
    lastTime = r.time
    count++
    if (r.rh !== undefined && r.rh === r.rh) {
      rhSum += r.rh
      rhRows++
    }
  }
  if (!sum || count === 0) {
    throw new InputError('time range', 'no distribution of the file lies in the chosen range', 'Widen the range so that it holds at least one row of the file.')
  }
  const values = Array.from(sum, (s) => s / count)
  return { values, count, firstTime, lastTime, rhSum, rhRows }
}
