/**
 * Cells and numbers of a delimited text line, read without allocating per cell: a line is split into cell
 * boundaries (start/end offsets into the line, kept in reused arrays), and a number is read straight from its
 * characters. Lines with quotes go through papaparse, then the same boundaries are made over the unquoted cells.
 */
import Papa from 'papaparse/papaparse.js'

export type Delimiter = ',' | ';' | '\t'

/** A split line's cells, as the readers of a row take them (CellSplitter over text, ByteCells over bytes). */
export interface Cells {
  readonly count: number
  /** The k-th cell as a string ('' beyond the last). */
  cell(k: number): string
  isEmpty(k: number): boolean
  /** The k-th cell as a number in this file's decimal format, or NaN when it is not a plain number. */
  number(k: number, decimalComma: boolean): number
  /**
   * Cells first .. first + n − 1 as numbers (number's), into values[0 .. n − 1]. One call per row rather than
   * one per cell: a row's cells reach the reader through two kinds of Cells, and a call of `number` that can meet
   * either gave each number back boxed (a heap object, 1.5 kB of garbage a row of 100 bins; DEVELOPERS.md, the
   * series pipeline).
   */
  numbersInto(values: number[], first: number, n: number, decimalComma: boolean): void
}

/** Cell boundaries of one line, reused from line to line. `text` is the line (or its unquoted cells joined). */
export class CellSplitter implements Cells {
  text = ''
  count = 0
  starts = new Int32Array(256)
  ends = new Int32Array(256)
  constructor(readonly delimiter: Delimiter) {}

  /** Splits `line`; trailing empty cells are dropped (exports often end rows with a separator). */
  split(line: string): number {
    if (line.indexOf('"') >= 0) return this.splitQuoted(line)
    const d = this.delimiter
    this.text = line
    const len = line.length
    let n = 0
    let start = 0
    for (;;) {
      let end = line.indexOf(d, start)
      const last = end < 0
      if (last) end = len
      if (n >= this.starts.length) this.grow()
      // spaces around a cell carry nothing
      while (start < end && isSpace(line.charCodeAt(start))) start++
      let e = end
      while (e > start && isSpace(line.charCodeAt(e - 1))) e--
      this.starts[n] = start
      this.ends[n] = e
      n++
      if (last) break
      start = end + 1
    }
    this.count = n
    this.trimTrailing()
    return this.count
  }

  private splitQuoted(line: string): number {
    const r = Papa.parse(line, { delimiter: this.delimiter, newline: '\n', quoteChar: '"' })
    const cells = r.data[0] ?? []
    // cells joined by a character that cannot be a delimiter, so boundaries work as for a plain line
    this.text = cells.join('\u0001')
    let at = 0
    for (let k = 0; k < cells.length; k++) {
      this.push(k, at, at + cells[k].length)
      at += cells[k].length + 1
    }
    this.count = cells.length
    this.trimTrailing()
    return this.count
  }

  private push(k: number, start: number, end: number): void {
    if (k >= this.starts.length) this.grow()
    const t = this.text
    while (start < end && isSpace(t.charCodeAt(start))) start++
    while (end > start && isSpace(t.charCodeAt(end - 1))) end--
    this.starts[k] = start
    this.ends[k] = end
  }

  private grow(): void {
    const s = new Int32Array(this.starts.length * 2)
    s.set(this.starts)
    this.starts = s
    const e = new Int32Array(this.ends.length * 2)
    e.set(this.ends)
    this.ends = e
  }

  private trimTrailing(): void {
    while (this.count > 0 && this.starts[this.count - 1] === this.ends[this.count - 1]) this.count--
  }

  /** The k-th cell as a string ('' beyond the last). */
  cell(k: number): string {
    return k < this.count ? this.text.slice(this.starts[k], this.ends[k]) : ''
  }

  isEmpty(k: number): boolean {
    return k >= this.count || this.starts[k] === this.ends[k]
  }

  /** The k-th cell as a number in this file's decimal format, or NaN when it is not a plain number. */
  number(k: number, decimalComma: boolean): number {
    if (k >= this.count) return NaN
    return readNumber(this.text, this.starts[k], this.ends[k], decimalComma)
  }

  numbersInto(values: number[], first: number, n: number, decimalComma: boolean): void {
    for (let j = 0; j < n; j++) values[j] = this.number(first + j, decimalComma)
  }

  /** All cells as strings (for header rows and messages; allocates). */
  all(): string[] {
    const out: string[] = []
    for (let k = 0; k < this.count; k++) out.push(this.cell(k))
    return out
  }
}

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 160 || c === 13
}

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22]

/**
 * A plain decimal number in text[start, end): optional sign, digits with one decimal mark ('.' or, with
 * decimalComma, ','), optional exponent. NaN for anything else (thousands separators, units, "1.2.3", "").
 * The value is the correctly rounded double, as Number() gives: while the digits fit in 2^53 and the power of
 * ten is at most 10^22 one multiplication or division rounds correctly (Clinger 1990, "How to read floating
 * point numbers accurately", PLDI); otherwise Number() reads the text.
 */
export function readNumber(text: string, start: number, end: number, decimalComma: boolean): number {
  let i = start
  if (i >= end) return NaN
  const mark = decimalComma ? 44 : 46
  let negative = false
  let c = text.charCodeAt(i)
  if (c === 43 || c === 45) {
    negative = c === 45
    i++
  }
  let mantissa = 0
  let digits = 0
  let fraction = 0
  let sawMark = false
  let exact = true
  for (; i < end; i++) {
    c = text.charCodeAt(i)
    if (c >= 48 && c <= 57) {
      if (mantissa >= 9007199254740991 / 10 - 9) exact = false
      mantissa = mantissa * 10 + (c - 48)
      digits++
      if (sawMark) fraction++
    } else if (c === mark && !sawMark) {
      sawMark = true
    } else break
  }
  if (digits === 0) return NaN
  let exponent = 0
  if (i < end) {
    c = text.charCodeAt(i)
    if (c !== 101 && c !== 69) return NaN
    i++
    let expNegative = false
    c = text.charCodeAt(i)
    if (c === 43 || c === 45) {
      expNegative = c === 45
      i++
    }
    let expDigits = 0
    for (; i < end; i++) {
      c = text.charCodeAt(i)
      if (c < 48 || c > 57) return NaN
      exponent = exponent * 10 + (c - 48)
      expDigits++
    }
    if (expDigits === 0) return NaN
    if (expNegative) exponent = -exponent
  }
  const p = exponent - fraction
  let v: number
  if (exact && p >= -22 && p <= 22) v = p < 0 ? mantissa / POW10[-p] : mantissa * POW10[p]
  else {
    let s = text.slice(start, end)
    if (decimalComma) s = s.replace(',', '.')
    v = Number(s)
  }
  if (!Number.isFinite(v)) return NaN
  return negative && !(v < 0) ? -v : v
}

/** readNumber over a whole string. */
export function parseCellNumber(cell: string, decimalComma: boolean): number {
  const s = cell.trim()
  return readNumber(s, 0, s.length, decimalComma)
}
