// The options of every command that reads a sizer file (check, series, closure --sizer, truncation --sizer):
// one definition of their flags, their help lines and their checks.
import { BIN_QUANTITIES, type BinQuantityName, type DateOrder, type SizerLayout, type SizerOptions } from '../../src-core/index.ts'
import { UsageError } from './common.ts'

/** parseArgs definitions of the sizer flags. */
export const sizerFlags = {
  'diameter-unit': { type: 'string' },
  quantity: { type: 'string' },
  layout: { type: 'string' },
  negatives: { type: 'string' },
  'date-order': { type: 'string' },
  year: { type: 'string' }
} as const

export type SizerFlagValues = { [K in keyof typeof sizerFlags]?: string }

/** Help lines for the sizer flags (`prefix` e.g. "sizer file: "). */
export function sizerHelp(prefix = ''): string {
  return [
    `  --diameter-unit U     ${prefix}nm or um, when the file does not say (or to override it)`,
    `  --quantity Q          ${prefix}${BIN_QUANTITIES.join(', ')}, when the file does not say`,
    `  --layout L            ${prefix}single, time-rows or time-columns, when the guess is wrong`,
    `  --negatives N         ${prefix}drop (default: leave a row with a negative value out, listed) or zero`,
    `                        (set negative values to 0; the summary counts the cells and rows changed)`,
    `  --date-order O        ${prefix}dmy, mdy or ymd, for dates like 03/04/2024 (default: as the file states,`,
    `                        else detected from the whole column; refused when no date settles it)`,
    `  --year Y              ${prefix}year of decimal day-of-year times, when the file does not give it`
  ].join('\n')
}

/** Checks the sizer flags and turns them into reader options. */
export function readSizerFlags(command: string, values: SizerFlagValues): SizerOptions {
  const o: SizerOptions = {}
  const unit = values['diameter-unit']
  if (unit !== undefined) {
    const u = unit.replace(/[µμ]m/, 'um')
    if (u !== 'nm' && u !== 'um') throw new UsageError(`${command}: --diameter-unit "${unit}" is not nm or um`)
    o.diameterUnit = u
  }
  if (values.quantity !== undefined) {
    if (!(BIN_QUANTITIES as readonly string[]).includes(values.quantity)) throw new UsageError(`${command}: --quantity "${values.quantity}" is not one of ${BIN_QUANTITIES.join(', ')}`)
    o.quantity = values.quantity as BinQuantityName
  }
  if (values.layout !== undefined) {
    if (!['single', 'time-rows', 'time-columns'].includes(values.layout)) throw new UsageError(`${command}: --layout "${values.layout}" is not single, time-rows or time-columns`)
    o.layout = values.layout as SizerLayout
  }
  if (values.negatives !== undefined) {
    if (values.negatives !== 'zero' && values.negatives !== 'drop') throw new UsageError(`${command}: --negatives "${values.negatives}" is not zero or drop`)
    o.negatives = values.negatives
  }
  if (values['date-order'] !== undefined) {
    const d = values['date-order'].toLowerCase()
    if (d !== 'dmy' && d !== 'mdy' && d !== 'ymd') throw new UsageError(`${command}: --date-order "${values['date-order']}" is not dmy, mdy or ymd`)
    o.dateOrder = d as DateOrder
  }
  if (values.year !== undefined) {
    const y = Number(values.year)
    if (!/^\d{4}$/.test(values.year.trim()) || y < 1900 || y > 2200) throw new UsageError(`${command}: --year "${values.year}" is not a four-digit year`)
    o.year = y
  }
  return o
}

/** What the reader decided or left out, for a summary: unit source, time, ignored columns, notes, negatives. */
export function readingLines(h: {
  unitSource: string
  timeFormat: string
  ignoredColumns: { column: number; name: string }[]
  notes: string[]
  unitsLine: number
  negativesZeroed?: { cells: number; rows: number }
}): string[] {
  const lines: string[] = []
  if (h.timeFormat) lines.push(`time: ${h.timeFormat}`)
  if (h.unitsLine) lines.push(`units row: line ${h.unitsLine}`)
  if (h.ignoredColumns.length) lines.push(`ignored: ${h.ignoredColumns.map((c) => `column ${c.column} "${c.name}"`).join(', ')}`)
  if (h.unitSource && h.unitSource !== 'option' && !h.notes.includes(h.unitSource)) lines.push(`diameter unit from ${h.unitSource}`)
  for (const n of h.notes) lines.push(`note: ${n}`)
  if (h.negativesZeroed && h.negativesZeroed.cells > 0) lines.push(`negatives set to 0: ${h.negativesZeroed.cells} cell${h.negativesZeroed.cells === 1 ? '' : 's'} in ${h.negativesZeroed.rows} row${h.negativesZeroed.rows === 1 ? '' : 's'}`)
  return lines
}
