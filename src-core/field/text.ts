// Reading units, quantities, diameters and metadata out of the text of a sizer file's header lines.
import Papa from 'papaparse/papaparse.js'
import { InputError } from '../errors.ts'
import type { BinQuantityName } from '../study/model.ts'
import { parseCellNumber, type Delimiter } from './cells.ts'

/** What the user must choose for a file to be read; the message says so and how (option or app choice). */
export type SizerChoice = 'diameterUnit' | 'quantity' | 'dateOrder' | 'year'

/** An InputError that a choice of the user settles (the app offers it; the CLI names the option). */
export class SizerChoiceNeeded extends InputError {
  constructor(
    where: string,
    problem: string,
    fix: string,
    readonly choice: SizerChoice
  ) {
    super(where, problem, fix)
    this.name = 'SizerChoiceNeeded'
  }
}

export function where(fileName: string | undefined, line: number, column?: number): string {
  return `${fileName ?? 'sizer file'} line ${line}${column !== undefined ? ` column ${column}` : ''}`
}

/** Cells of a line split by papaparse (header lines only; data rows use CellSplitter). */
export function splitCells(text: string, delimiter: string): string[] {
  if (text.trim() === '') return []
  const r = Papa.parse(text, { delimiter, newline: '\n', quoteChar: '"' })
  const cells = (r.data[0] ?? []).map((c) => c.trim())
  while (cells.length > 0 && cells[cells.length - 1] === '') cells.pop()
  return cells
}

export function toNumber(cell: string | undefined, decimal: '.' | ','): number | undefined {
  if (cell === undefined) return undefined
  const v = parseCellNumber(cell, decimal === ',')
  return Number.isNaN(v) ? undefined : v
}

/**
 * A bin diameter in a header cell: "15.1", "15.1 nm", "Dp=15.1nm", "d_15.1nm", "Diameter 0.3 µm", "0.0102 [µm]".
 * A bare letter before the number is not enough ("D50", "PM2.5" are statistics, not bins).
 */
const HEADER_DIAMETER = /^(?:(?:dp|d_p|d_|diameter|size)\s*[=:_]?\s*)?([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*[[(]?\s*(nm|um|µm|μm)?\s*[\])]?$/i

export function headerDiameter(cell: string, decimal: '.' | ','): { d: number; unit: 'nm' | 'um' | undefined } | undefined {
  const m = HEADER_DIAMETER.exec(cell.trim())
  if (!m) return undefined
  const d = toNumber(m[1], decimal)
  if (d === undefined) return undefined
  return { d, unit: m[2] === undefined ? undefined : m[2].toLowerCase() === 'nm' ? 'nm' : 'um' }
}

const UNIT_TEXT = /(?:^|[^A-Za-z])(nm|um|µm|μm|microns?|micrometers?|micrometres?|nanometers?|nanometres?)(?![A-Za-z])/i

export function unitIn(text: string): 'nm' | 'um' | undefined {
  const m = UNIT_TEXT.exec(text)
  if (!m) return undefined
  const u = m[1].toLowerCase()
  return u === 'nm' || u.startsWith('nano') ? 'nm' : 'um'
}

export function quantityIn(text: string): BinQuantityName | undefined {
  const m = /d\s*([NSVM])\s*\/\s*d\s*log\s*(?:10|₁₀)?\s*\(?\s*D\s*p?/i.exec(text)
  if (m) return `d${m[1].toUpperCase()}/dlogDp` as BinQuantityName
  if (/(?:^|[^A-Za-z])dN(?![A-Za-z/])/.test(text)) return 'dN'
  return undefined
}

export const METADATA = /^\s*(?:#|\/\/|;)*\s*([A-Za-z][A-Za-z0-9 _()./-]{0,40}?)\s*[:=]\s*(.*?)\s*$/
export const DIAMETER_LABEL = /diam|^\s*d\s*_?p\b|^\s*dp|size|^\s*d\s*[([]/i

/** A comment line: starts with '#', unless '#' is the first header cell ("#;Date;..."). */
export function isComment(text: string): boolean {
  const t = text.trimStart()
  return t.charCodeAt(0) === 35 && !/^#\s*[,;\t]/.test(t)
}

export function chooseDelimiter(texts: string[]): Delimiter | undefined {
  let best: Delimiter | undefined
  let bestScore = 0
  for (const d of ['\t', ';', ','] as const) {
    const counts = texts.map((t) => splitCells(t, d).length).filter((c) => c >= 2)
    if (counts.length === 0) continue
    const freq = new Map<number, number>()
    for (const c of counts) freq.set(c, (freq.get(c) ?? 0) + 1)
    const score = Math.max(...freq.values())
    if (score > bestScore) {
      bestScore = score
      best = d
    }
  }
  return best
}

export function chooseDecimal(rows: { cells: string[] }[]): '.' | ',' {
  let commas = 0
  let points = 0
  for (const r of rows) {
    for (const c of r.cells) {
      if (/^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(c)) commas++
      else if (/^[+-]?\d*\.\d+([eE][+-]?\d+)?$/.test(c)) points++
    }
  }
  return commas > points ? ',' : '.'
}

export const unitName = (u: 'nm' | 'um'): string => (u === 'um' ? 'µm' : 'nm')
