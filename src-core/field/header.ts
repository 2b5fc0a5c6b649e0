// Recognising a sizer table from its first lines: separator, decimal mark, layout, header and units rows, the
// bin columns, the time columns and the columns that are ignored, the diameter unit and the quantity.
import { InputError } from '../errors.ts'
import type { BinQuantityName } from '../study/model.ts'
import {
  chooseDecimal,
  chooseDelimiter,
  DIAMETER_LABEL,
  headerDiameter,
  isComment,
  METADATA,
  quantityIn,
  SizerChoiceNeeded,
  splitCells,
  toNumber,
  unitIn,
  unitName,
  where
} from './text.ts'
import { isHumidityHeader } from './humidity.ts'
import { inferDiameterUnit, planTime, type PlanTime } from './plan.ts'
import type { SizerHeader, SizerLayout, SizerOptions } from './types.ts'

export interface Detected {
  header: SizerHeader
  /** Index into the buffer of the first data row. */
  dataStart: number
  /** Header cells (time-columns: time stamps per column). */
  headerCells: string[]
  /** time-rows: how each row's time is read. */
  time: PlanTime
  /** single and time-columns with no unit stated: decided from the diameters at the end. */
  unitPending: boolean
}

interface Row {
  line: number
  text: string
  cells: string[]
}

type Source = { unit: 'nm' | 'um'; from: string }

function unitFix(): string {
  return 'Add a line "units: nm" (or "units: um") above the table, write the unit in the diameter header (e.g. "Dp (nm)"), or choose it (--diameter-unit nm, or the unit choice of the import)'
}

export function detect(buffer: { line: number; text: string }[], options: SizerOptions, complete: boolean): Detected | undefined {
  const file = options.fileName
  const lines = buffer.filter((r) => r.text.trim() !== '')
  if (lines.length === 0) {
    if (complete) throw new InputError(file ?? 'sizer file', 'the file is empty', 'Export the size distribution from the instrument software again.')
    return undefined
  }
  const tableLike = lines.filter((r) => !isComment(r.text))
  const delimiter = options.delimiter ?? chooseDelimiter(tableLike.map((r) => r.text))
  if (!delimiter) {
    if (!complete) return undefined
    throw new InputError(file ?? 'sizer file', 'no table was found: no line has two or more cells separated by a comma, semicolon or tab', 'Export the distribution as a table with one diameter and one value per row (or one bin per column), separated by commas, semicolons or tabs.')
  }
  // comments and blank lines take no part in the table
  const rows: Row[] = buffer.map((r) => ({ ...r, cells: r.text.trim() === '' || isComment(r.text) ? [] : splitCells(r.text, delimiter) }))
  const decimal: '.' | ',' = delimiter === ',' ? '.' : (options.decimal ?? chooseDecimal(rows))
  const isNum = (c: string | undefined): boolean => toNumber(c, decimal) !== undefined
  const isDiam = (c: string): boolean => headerDiameter(c, decimal) !== undefined
  const isMeta = (r: Row): boolean => METADATA.test(r.text) && !isNum(r.cells[0]) && !(r.cells.length > 2 && r.cells.slice(1).filter(isDiam).length >= 2)

  const counts = rows.map((r) => r.cells.length).filter((c) => c >= 2)
  const freq = new Map<number, number>()
  for (const c of counts) freq.set(c, (freq.get(c) ?? 0) + 1)
  const modal = [...freq.entries()].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0]?.[0] ?? 2

  // f: the first row that looks like part of the table (a header with bin diameters, or a row of numbers).
  let f = -1
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]
    if (r.cells.length < 2 || r.cells.length < modal - 1 || isMeta(r)) continue
    const rest = r.cells.slice(1)
    const diam = rest.filter(isDiam).length
    if (diam * 2 < rest.length && diam < 2) continue
    if (!isNum(r.cells[0]) && r.cells.length < 3 && options.layout !== 'time-rows') continue // a header of one bin: free text
    f = i
    break
  }
  if (f < 0 || (!complete && f > rows.length - 4)) {
    if (!complete) return undefined
    throw new InputError(file ?? 'sizer file', 'no table was found: no row starts with a diameter or a time stamp followed by numbers', 'Check that the file is a size distribution export (diameters and values), and that the separator is a comma, semicolon or tab.')
  }

  const firstNumeric = isNum(rows[f].cells[0])
  let previous = -1
  for (let i = f - 1; i >= 0; i--) {
    if (rows[i].cells.length === 0) continue
    if (rows[i].cells.length >= 2 && !isMeta(rows[i])) previous = i
    break
  }
  let layout: SizerLayout
  let headerIndex: number
  if (options.layout) {
    layout = options.layout
    headerIndex = firstNumeric ? previous : f
  } else if (firstNumeric) {
    headerIndex = previous
    layout = modal <= 2 ? 'single' : 'time-columns'
  } else {
    headerIndex = f
    const first = rows[f].cells[0]
    layout = DIAMETER_LABEL.test(first) && !/time|date/i.test(first) && !rows[f].cells.slice(1).some((c) => headerDiameter(c, decimal)?.unit) ? 'time-columns' : 'time-rows'
  }
  if (layout !== 'single' && headerIndex < 0) {
    throw new InputError(
      where(file, rows[f].line),
      layout === 'time-rows' ? 'the table has no header row with the bin diameters' : 'the table has no header row with the time stamps',
      layout === 'time-rows' ? 'Add a header row: "time" followed by the bin diameters, e.g. time;15,1;16,3;...' : 'Add a header row: "diameter" followed by one time stamp per column.'
    )
  }
  const headerRow = headerIndex >= 0 ? rows[headerIndex] : undefined
  const headerLine = headerRow?.line ?? 0
  const headerCells = headerRow ? headerRow.cells : []

  // Metadata: key: value lines before the table; free-text lines are kept to look for a stated unit.
  const metadata: Record<string, string> = {}
  const metaLine: Record<string, number> = {}
  const freeText: Row[] = []
  const preambleEnd = headerIndex >= 0 ? headerIndex : f
  for (let i = 0; i < preambleEnd; i++) {
    const m = METADATA.exec(buffer[i].text)
    if (m) {
      const k = m[1].trim().toLowerCase()
      metadata[k] = m[2].replace(new RegExp(`[${delimiter === '\t' ? '\\t' : delimiter}\\s]+$`), '').trim()
      metaLine[k] = buffer[i].line
    } else if (buffer[i].text.trim() !== '') freeText.push(rows[i])
  }
  const metaValue = <T>(re: RegExp, read: (v: string) => T | undefined): [string, string, T] | undefined => {
    for (const [k, v] of Object.entries(metadata)) {
      const r = re.test(k) ? read(v) : undefined
      if (r !== undefined) return [k, v, r]
    }
    return undefined
  }

  // time-rows: the bin columns are the run of header cells holding diameters.
  const diameters: number[] = []
  const cellUnits: Source[] = []
  let firstBin = -1
  let binEnd = -1
  if (layout === 'time-rows' && headerRow) {
    const cells = headerRow.cells
    firstBin = cells.findIndex((c) => isDiam(c))
    if (firstBin < 0) throw new InputError(where(file, headerRow.line), 'the header row has no bin diameters', 'Put one diameter per bin column in the header row (e.g. "10.2", "10.2 nm" or "Dp=10.2nm").')
    binEnd = firstBin
    while (binEnd < cells.length && isDiam(cells[binEnd])) binEnd++
    const later = cells.findIndex((c, j) => j > binEnd && isDiam(c))
    if (later >= 0) {
      throw new InputError(where(file, headerRow.line, binEnd + 1), `the header cell "${cells[binEnd]}" is not a bin diameter, but bin diameters follow it (column ${later + 1})`, 'The bin columns must be side by side: move or delete the column, or give it its diameter.')
    }
    for (let j = firstBin; j < binEnd; j++) {
      const h = headerDiameter(cells[j], decimal)!
      const at = where(file, headerRow.line, j + 1)
      if (h.d <= 0) throw new InputError(at, `the bin diameter ${h.d} is not positive`, 'Diameters must be greater than 0.')
      if (diameters.length > 0 && !(h.d > diameters[diameters.length - 1])) {
        throw new InputError(at, `the bin diameter ${h.d} does not exceed the previous one (${diameters[diameters.length - 1]}); bin diameters must ascend`, 'Sort the bin columns by diameter (smallest first), keeping each value under its diameter, and remove duplicate columns.')
      }
      if (h.unit) cellUnits.push({ unit: h.unit, from: `the header cell "${cells[j]}" (line ${headerRow.line} column ${j + 1})` })
      diameters.push(h.d)
    }
  }

  // A units row directly under the header: no number in the bin (or value) columns.
  let dataStart = headerIndex >= 0 ? Math.max(headerIndex + 1, firstNumeric ? f : headerIndex + 1) : f
  let unitsRow: Row | undefined
  if (headerRow && layout !== 'time-columns') {
    let u = headerIndex + 1
    while (u < rows.length && rows[u].cells.length === 0) u++
    const cand = rows[u]
    const span = layout === 'time-rows' ? cand?.cells.slice(firstBin, binEnd) : cand?.cells.slice(1)
    if (cand && span && span.length > 0 && span.every((c) => !isNum(c)) && span.some((c) => c !== '') && !isMeta(cand)) {
      unitsRow = cand
      dataStart = u + 1
    }
  }

  // Diameter unit: every place the file states it must agree.
  const stated: Source[] = []
  const meta = metaValue(/unit|^dp$|diameter|size/, unitIn)
  if (meta) stated.push({ unit: meta[2], from: `the line "${meta[0]}: ${meta[1]}" (line ${metaLine[meta[0]]})` })
  for (const r of freeText) {
    const u = DIAMETER_LABEL.test(r.text) || /diam|\bdp\b/i.test(r.text) ? unitIn(r.text) : undefined
    if (u) stated.push({ unit: u, from: `line ${r.line} ("${r.text.trim().slice(0, 40)}")` })
  }
  if (headerRow && layout !== 'time-rows') {
    const u = layout === 'time-columns' ? unitIn(headerCells[0] ?? '') : unitIn(headerCells.join(' '))
    if (u) stated.push({ unit: u, from: `the header row (line ${headerLine})` })
  }
  stated.push(...cellUnits)
  if (unitsRow) {
    const span = layout === 'time-rows' ? unitsRow.cells.slice(firstBin, binEnd) : unitsRow.cells.slice(0, 1)
    const u = span.map(unitIn).find((x) => x)
    if (u) stated.push({ unit: u, from: `the units row (line ${unitsRow.line})` })
  }
  let diameterUnit = options.diameterUnit
  let unitSource = 'option'
  let unitPending = false
  const notes: string[] = []
  if (!diameterUnit) {
    const other = stated.find((s) => s.unit !== stated[0]?.unit)
    if (other) {
      throw new SizerChoiceNeeded(where(file, headerLine), `${stated[0].from} gives diameters in ${unitName(stated[0].unit)} but ${other.from} says ${unitName(other.unit)}`, 'Correct whichever is wrong, or choose the unit (--diameter-unit nm or um, or the unit choice of the import)', 'diameterUnit')
    }
    if (stated.length > 0) {
      diameterUnit = stated[0].unit
      unitSource = stated[0].from
    } else if (layout === 'time-rows') {
      const inferred = inferDiameterUnit(diameters)
      if (!inferred) throw new SizerChoiceNeeded(where(file, headerLine), `the diameter unit (nm or µm) is not stated, and the bin diameters (${diameters[0]} to ${diameters[diameters.length - 1]}, ${diameters.length} bins) leave it in doubt`, unitFix(), 'diameterUnit')
      diameterUnit = inferred.unit
      unitSource = inferred.note
      notes.push(inferred.note)
    } else {
      diameterUnit = 'nm' // placeholder until the diameters are known (see the reader's end)
      unitPending = true
      unitSource = ''
    }
  }

  // Quantity.
  let quantity = options.quantity
  if (!quantity) {
    const m = metaValue(/quantity|^values?$|^type$|^data$|^weight|unit/, quantityIn)
    const labelText = layout === 'time-rows' ? [...headerCells.slice(0, firstBin), ...(unitsRow ? unitsRow.cells.slice(firstBin, binEnd) : [])].join(' ') : headerCells.join(' ') + ' ' + (unitsRow?.cells.join(' ') ?? '')
    const fromHeader = quantityIn(labelText) ?? freeText.map((r) => quantityIn(r.text)).find((q) => q)
    if (m && fromHeader && m[2] !== fromHeader) {
      throw new SizerChoiceNeeded(where(file, headerLine), `the header says the values are ${fromHeader} but the line "${m[0]}: ${m[1]}" says ${m[2]}`, 'Correct whichever is wrong, or choose the quantity (--quantity dN/dlogDp, or the quantity choice of the import)', 'quantity')
    }
    quantity = m?.[2] ?? fromHeader
    if (!quantity) {
      throw new SizerChoiceNeeded(
        where(file, headerLine || rows[f].line),
        'the file does not say what its values are (dN/dlogDp, dN, dS/dlogDp, dV/dlogDp or dM/dlogDp)',
        'Add a line "quantity: dN/dlogDp" above the table, name it in the value header, or choose it (--quantity dN/dlogDp, or the quantity choice of the import)',
        'quantity'
      )
    }
  }

  let edges = options.edges
  if (edges === undefined) {
    const m = metaValue(/^(diameters|bins|bin diameters|diameter type|dp type)$/, (v) => (/edge|bound/i.test(v) ? true : /mid|cent/i.test(v) ? false : undefined))
    edges = m?.[2] ?? false
  }
  if (layout === 'time-rows' && diameters.length < (edges ? 2 : 1)) throw new InputError(where(file, headerLine), 'the header row has no bin diameters', 'Put one diameter per bin column after the time label.')
  if (layout === 'time-columns' && headerRow) {
    for (let j = 1; j < headerCells.length; j++) {
      if (headerCells[j] === '') throw new InputError(where(file, headerRow.line, j + 1), 'a column has no time stamp', 'Give every value column a time stamp in the header row, or delete the empty column.')
    }
  }

  // time-rows: which columns give the time, and which are ignored.
  const dataRows = rows.slice(dataStart).filter((r) => r.cells.length > 0).slice(0, 20)
  const time =
    layout === 'time-rows'
      ? planTime({ headerCells, unitsCells: unitsRow?.cells, firstBin, binEnd, dataRows, metadata, options, decimal })
      : ({ kind: 'none', columns: [], ignored: [], format: '', notes: [], dateCol: -1, clockCol: -1 } satisfies PlanTime)
  notes.push(...time.notes)
  // a relative-humidity column among the others is read (humidity.ts), not ignored
  const humidity = layout === 'time-rows' ? time.ignored.find((c) => isHumidityHeader(c.name)) : undefined
  const header: SizerHeader = {
    layout,
    diameterUnit,
    quantity: quantity as BinQuantityName,
    diameters,
    edges,
    delimiter,
    decimal,
    headerLine,
    unitsLine: unitsRow?.line ?? 0,
    metadata,
    firstBinColumn: firstBin + 1,
    timeColumns: time.columns,
    timeFormat: time.format,
    ...(time.order && time.kind !== 'none' ? { dateOrder: time.order } : {}),
    ignoredColumns: time.ignored.filter((c) => c !== humidity),
    ...(humidity ? { humidityColumn: humidity } : {}),
    unitSource,
    notes
  }
  return { header, dataStart, headerCells, time, unitPending }
}
