// Which columns of a time-rows table give the time and how they are read; the diameter unit when the file
// leaves it unsaid but the diameters leave no doubt; reading each row's time.
import { InputError } from '../errors.ts'
import type { Cells, CellSplitter } from './cells.ts'
import { SizerChoiceNeeded, toNumber } from './text.ts'
import {
  DATE_ORDER_NAMES,
  dateParts,
  epochNamed,
  orderEvidence,
  readClock,
  readDateTime,
  readDayOfYear,
  readEpochSeconds,
  statedOrder,
  zoneMinutes,
  zoneText,
  type DateOrder,
  type ParsedTime
} from './time.ts'
import type { SizerColumn, SizerOptions, TimeRole } from './types.ts'

/**
 * The diameter unit from the diameters alone, only where they leave no doubt: 5–1000 with at least 20 bins
 * (a mobility sizer's channel count) and above 50 (so not µm), or 0.1–50 and below 5 (so not nm).
 */
export function inferDiameterUnit(d: readonly number[]): { unit: 'nm' | 'um'; note: string } | undefined {
  if (d.length === 0) return undefined
  const lo = d[0]
  const hi = d[d.length - 1]
  if (lo >= 5 && hi <= 1000 && hi > 50 && d.length >= 20) {
    return { unit: 'nm', note: `diameter unit nm inferred: the file does not state it, and ${d.length} bins from ${lo} to ${hi} fit only nm (a mobility sizer's range and channel count)` }
  }
  if (lo >= 0.1 && hi <= 50 && lo < 5) {
    return { unit: 'um', note: `diameter unit µm inferred: the file does not state it, and bins from ${lo} to ${hi} fit only µm` }
  }
  return undefined
}

export interface PlanTime {
  kind: 'none' | 'label' | 'datetime' | 'date+clock' | 'date' | 'doy' | 'epoch'
  columns: (SizerColumn & { role: TimeRole })[]
  ignored: SizerColumn[]
  format: string
  notes: string[]
  /** 0-based columns of the date (or the whole time) and of the time of day; -1 when none. */
  dateCol: number
  clockCol: number
  /** Numeric date order; undefined while it is still to be detected from the rows. */
  order?: DateOrder
  year?: number
  epoch?: { clockMs: number; zone: number | undefined; text: string }
  zone?: number
}

interface PlanInput {
  headerCells: string[]
  unitsCells: string[] | undefined
  firstBin: number
  binEnd: number
  dataRows: { line: number; cells: string[] }[]
  metadata: Record<string, string>
  options: SizerOptions
  decimal: '.' | ','
}

const isDateTime = (v: string): boolean => {
  const p = dateParts(v)
  return !!p && p.rest !== '' && Number.isFinite(readClock(p.rest).seconds)
}
const isDate = (v: string): boolean => {
  const p = dateParts(v)
  return !!p && p.rest === ''
}
const isClock = (v: string): boolean => Number.isFinite(readClock(v).seconds)

export function planTime(x: PlanInput): PlanTime {
  const file = x.options.fileName ?? 'sizer file'
  const candidates: number[] = []
  for (let j = 0; j < x.headerCells.length; j++) if (j < x.firstBin || j >= x.binEnd) candidates.push(j)
  const values = (j: number): string[] => x.dataRows.map((r) => r.cells[j] ?? '').filter((v) => v !== '')
  // a column is of a kind when most of its first cells are (the others become bad rows, located)
  const all = (j: number, test: (v: string) => boolean): boolean => {
    const v = values(j)
    return v.length > 0 && v.filter(test).length * 2 >= v.length
  }
  const name = (j: number): string => x.headerCells[j] ?? ''
  const meta = Object.entries(x.metadata)

  let zone: number | undefined
  const zoneMeta = meta.find(([k]) => /time ?zone|utc ?offset|^zone$/.test(k))
  if (zoneMeta) {
    zone = zoneMinutes(zoneMeta[1])
    if (zone === undefined || !Number.isFinite(zone)) throw new InputError(`${file} (line "${zoneMeta[0]}: ${zoneMeta[1]}")`, `the time zone "${zoneMeta[1]}" is not understood`, 'Write it as UTC, or as an offset from UTC such as +01:00 or -05:00.')
  }

  const plan: PlanTime = { kind: 'none', columns: [], ignored: [], format: '', notes: [], dateCol: -1, clockCol: -1, zone }
  const dt = candidates.find((j) => all(j, isDateTime))
  const date = candidates.find((j) => all(j, isDate))
  const clock = candidates.find((j) => j !== date && all(j, isClock))
  const numeric = (j: number): boolean => all(j, (v) => toNumber(v, x.decimal) !== undefined)
  const doy = candidates.find((j) => /\bdoy\b|day.?of.?year|julian/i.test(name(j)) && numeric(j))
  const epochMeta = meta.find(([k, v]) => /epoch|time/.test(k) && epochNamed(v))
  const epochCol = candidates.find((j) => numeric(j) && (epochNamed(name(j)) || (epochMeta && /\b(s|sec|secs|seconds)\b|time_s/i.test(name(j)))))
  const col = (j: number, role: TimeRole) => ({ column: j + 1, name: name(j), role })
  const zoneNote = zone !== undefined ? `, zone ${zoneText(zone)} (line "${zoneMeta![0]}")` : ''

  if (dt !== undefined || date !== undefined) {
    plan.dateCol = dt ?? date!
    plan.kind = dt !== undefined ? 'datetime' : clock !== undefined ? 'date+clock' : 'date'
    plan.columns.push(col(plan.dateCol, dt !== undefined ? 'date and time' : 'date'))
    if (plan.kind === 'date+clock') {
      plan.clockCol = clock!
      plan.columns.push(col(clock!, 'time of day'))
    }
    // The order of numeric dates: the caller's, as stated in the file, or detected from the rows.
    const stated =
      meta.map(([k, v]) => (/date|format|order/.test(k) ? statedOrder(v) : undefined)).find((o) => o) ??
      statedOrder(name(plan.dateCol)) ??
      (x.unitsCells ? statedOrder(x.unitsCells[plan.dateCol] ?? '') : undefined)
    // year-first when most dates are (like every kind above: the others become bad rows, located)
    const sample = values(plan.dateCol).map((v) => dateParts(v))
    const yearFirst = sample.length > 0 && sample.filter((p) => !p || p.aDigits === 4).length * 2 >= sample.length
    if (yearFirst) plan.order = 'ymd'
    else if (x.options.dateOrder) plan.order = x.options.dateOrder
    else if (stated) {
      plan.order = stated
      plan.notes.push(`dates read as ${DATE_ORDER_NAMES[stated]}, as the file states`)
    }
    const where = plan.kind === 'date+clock' ? `columns ${plan.dateCol + 1} and ${plan.clockCol + 1}` : `column ${plan.dateCol + 1}`
    plan.format = yearFirst ? `ISO 8601 (year-month-day) in ${where}${zoneNote}` : `dates in ${where}${zoneNote}`
  } else if (doy !== undefined) {
    plan.kind = 'doy'
    plan.dateCol = doy
    plan.columns.push(col(doy, 'day of year'))
    let year = x.options.year
    let from = 'option'
    if (year === undefined) {
      const y = meta.find(([k, v]) => /^year$/.test(k) && /^\d{4}$/.test(v.trim())) ?? meta.find(([k, v]) => /date|start|year/.test(k) && /\b(19|20)\d{2}\b/.test(v))
      if (y) {
        year = Number(/\b(19|20)\d{2}\b/.exec(y[1])![0])
        from = `the line "${y[0]}: ${y[1]}"`
      }
    }
    if (year === undefined) {
      throw new SizerChoiceNeeded(`${file} column ${doy + 1}`, `the times are decimal days of year ("${name(doy)}"), but the file does not say which year`, 'Add a line "year: 2024" above the table, or give the year (--year 2024, or the year choice of the import)', 'year')
    }
    plan.year = year
    plan.format = `decimal day of year in column ${doy + 1}, year ${year} (from ${from})${zoneNote}; rounded to the second`
  } else if (epochCol !== undefined) {
    plan.kind = 'epoch'
    plan.dateCol = epochCol
    plan.epoch = epochNamed(name(epochCol)) ?? epochNamed(epochMeta![1])
    plan.columns.push(col(epochCol, 'seconds since epoch'))
    plan.format = `seconds since ${plan.epoch!.text} in column ${epochCol + 1}`
  } else {
    const labelled = candidates.find((j) => j < x.firstBin && /time|date|stamp|utc|when/i.test(name(j)))
    const label = labelled ?? (x.firstBin === 1 ? 0 : undefined)
    if (label !== undefined) {
      plan.kind = 'label'
      plan.dateCol = label
      plan.columns.push(col(label, 'label'))
      plan.format = `labels in column ${label + 1}, kept as written (not read as dates)`
      if (values(label).length > 0) plan.notes.push(`the time column "${name(label)}" holds no dates that can be read: its cells are kept as written, and the rows cannot be averaged by time`)
    }
  }
  const used = new Set(plan.columns.map((c) => c.column - 1))
  for (const j of candidates) if (!used.has(j)) plan.ignored.push({ column: j + 1, name: name(j) })
  return plan
}

/** Reads each row's time by the plan; detects the date order from the rows when the file does not state it. */
export class RowTime {
  /** Where the order was detected ("line 40: 13/01/2024"), for the summary. */
  detectedAt = ''
  constructor(readonly plan: PlanTime) {}

  get needsOrder(): boolean {
    return (this.plan.kind === 'datetime' || this.plan.kind === 'date+clock' || this.plan.kind === 'date') && this.plan.order === undefined
  }

  /** While the order is unknown: what this row's date says about it. */
  evidence(cells: CellSplitter, line: number): DateOrder | undefined {
    const cell = cells.cell(this.plan.dateCol)
    const p = dateParts(cell)
    if (!p || p.aDigits === 4) return undefined
    const e = orderEvidence(p)
    if (e === 'dmy' || e === 'mdy') {
      this.plan.order = e
      this.detectedAt = `line ${line}: ${cell}`
      return e
    }
    return undefined
  }

  /** The row's time, or a problem with its column. */
  read(cells: Cells): ParsedTime | { column: number; reason: string; fix: string } {
    const p = this.plan
    switch (p.kind) {
      case 'none':
        return { iso: '', ms: NaN }
      case 'label':
        return { iso: cells.cell(p.dateCol), ms: NaN }
      case 'doy':
      case 'epoch': {
        const v = cells.number(p.dateCol, false)
        const t = Number.isFinite(v) ? (p.kind === 'doy' ? readDayOfYear(v, p.year!, p.zone) : readEpochSeconds(v, p.epoch!)) : undefined
        if (t) return t
        const cell = cells.cell(p.dateCol)
        return p.kind === 'doy'
          ? { column: p.dateCol + 1, reason: `the day of year "${cell}" is not a number from 1 to the end of ${p.year}`, fix: 'Write the decimal day of year with a decimal point (1.0 is 1 January 00:00).' }
          : { column: p.dateCol + 1, reason: `the time "${cell}" is not a number of seconds`, fix: `Write the seconds since ${p.epoch!.text} as a plain number.` }
      }
      default: {
        const dateCell = cells.cell(p.dateCol)
        const order = p.order ?? 'ymd'
        let t: ParsedTime | undefined
        const ord = /^\d{4}/.test(dateCell) ? 'ymd' : order
        if (p.kind === 'date+clock') {
          const clockCell = cells.cell(p.clockCol)
          t = readDateTime(dateCell, clockCell, ord, p.zone)
          if (!t && readDateTime(dateCell, undefined, ord, p.zone)) return { column: p.clockCol + 1, reason: clockCell === '' ? 'the time of day is missing' : `"${clockCell}" is not a time of day`, fix: 'Write the time as HH:MM or HH:MM:SS (24-hour, or with AM/PM).' }
        } else t = readDateTime(dateCell, undefined, ord, p.zone)
        if (t) return t
        const what = p.order && p.order !== 'ymd' ? `a date in ${DATE_ORDER_NAMES[p.order]} order${this.detectedAt ? ` (detected from ${this.detectedAt})` : ''}` : 'a date (year-month-day)'
        return { column: p.dateCol + 1, reason: dateCell === '' ? 'the date is missing' : `"${dateCell}" is not ${what}${p.kind === 'datetime' ? ' with a time of day' : ''}`, fix: 'Correct the date, or choose the date order (--date-order dmy, mdy or ymd, or the date order choice of the import).' }
      }
    }
  }
}
