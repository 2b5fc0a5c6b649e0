/**
 * A user component's refractive-index table typed or exported as CSV: rows of wavelength, n, k. Comma,
 * semicolon or tab separated (papaparse detects it); a header row and lines starting with # are skipped; the
 * wavelength column's unit comes from its header ("nm", "um"/"µm") or the caller (default µm). The rows it
 * returns feed `defineUserMaterial({ index: { kind: 'table', rows } })`.
 */
import Papa from 'papaparse/papaparse.js'
import { InputError } from '../errors.ts'

export interface IndexTableOptions {
  /** Unit of the wavelength column when the header does not say; default 'um'. */
  wavelengthUnit?: 'nm' | 'um'
  /** Names the table in messages (a file name or the component). */
  source?: string
}

/** Parses CSV text into [wavelength µm, n, k] rows; every bad cell is an InputError with its line and column. */
export function parseIndexTableCsv(text: string, options: IndexTableOptions = {}): [number, number, number][] {
  const source = options.source ?? 'index table'
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/)
  let unit = options.wavelengthUnit ?? 'um'
  const rows: [number, number, number][] = []
  const parsed = Papa.parse(lines.join('\n'), { skipEmptyLines: false })
  parsed.data.forEach((cells, i) => {
    const line = i + 1
    const first = (cells[0] ?? '').trim()
    if (cells.every((c) => c.trim() === '') || first.startsWith('#')) return
    const numbers = cells.slice(0, 3).map((c) => Number(c.trim()))
    if (rows.length === 0 && numbers.some((v) => !Number.isFinite(v))) {
      // a header row: it may name the wavelength unit
      const head = first.toLowerCase()
      if (/\bnm\b|\(nm\)|_nm/.test(head)) unit = 'nm'
      else if (/µm|um\b|\(um\)|_um|micro/.test(head)) unit = 'um'
      return
    }
    if (cells.length < 3) throw new InputError(`${source} line ${line}`, `${cells.length} cells where wavelength, n and k are needed`, 'Give three columns: wavelength, n, k.')
    const names = ['wavelength', 'n', 'k']
    numbers.forEach((v, j) => {
      if (!Number.isFinite(v)) {
        throw new InputError(`${source} line ${line} column ${j + 1} (${names[j]})`, `"${cells[j].trim()}" is not a number`, 'Write a plain number with a decimal point.')
      }
    })
    rows.push([unit === 'nm' ? numbers[0] / 1000 : numbers[0], numbers[1], numbers[2]])
  })
  if (rows.length < 2) throw new InputError(source, `${rows.length} data row${rows.length === 1 ? '' : 's'} found`, 'Give at least two rows of wavelength, n, k to interpolate between.')
  return rows
}
