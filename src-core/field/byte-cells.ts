/**
 * Cells and numbers of a delimited line given as bytes (UTF-8 text), read without making a string of the line: the
 * cell boundaries as CellSplitter makes them for the same text, and a number straight from its bytes. Only a
 * plain line is taken (all ASCII, no quote); `split` says -1 for any other, which is then read as text.
 */
import type { Cells, Delimiter } from './cells.ts'

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22]
const EMPTY = new Uint8Array(0)

/** Spaces around a cell carry nothing (as CellSplitter's, within ASCII: space, tab, carriage return). */
function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 13
}

/** `into` (twice as long) with `from` copied to its start. */
function doubled<T extends Int32Array | Float64Array | Uint8Array>(from: T, into: T): T {
  into.set(from)
  return into
}

/** bytes[start, end) of ASCII as a string. */
export function asciiText(bytes: Uint8Array, start: number, end: number): string {
  let s = ''
  for (let at = start; at < end; at += 4096) s += String.fromCharCode.apply(null, bytes.subarray(at, Math.min(end, at + 4096)) as unknown as number[])
  return s
}

/** Cell boundaries of one byte line, reused from line to line (see the top of this file). */
export class ByteCells implements Cells {
  bytes: Uint8Array = EMPTY
  count = 0
  starts = new Int32Array(256)
  ends = new Int32Array(256)
  /** Per cell: its number, when `read` is 1 (a plain number read by `split`). */
  numbers = new Float64Array(256)
  read = new Uint8Array(256)
  private readonly code: number
  private readonly mark: number
  /** `decimalComma`: the decimal mark the numbers read by `split` take (`number` reads any cell with the other). */
  constructor(delimiter: Delimiter, private readonly decimalComma = false) {
    this.code = delimiter.charCodeAt(0)
    this.mark = decimalComma ? 44 : 46
  }

  /**
   * Splits bytes[start, end) (trailing empty cells dropped); -1 when the line has a quote or a byte beyond ASCII.
   * In the same pass over the bytes, a cell of digits with at most one decimal mark (no sign, exponent or space)
   * gets its number, by readNumberBytes's arithmetic; `number` reads every other cell with readNumberBytes. (One
   * pass instead of a split and then a read of each cell: see DEVELOPERS.md, the series pipeline.)
   */
  split(bytes: Uint8Array, start: number, end: number): number {
    const d = this.code
    const mark = this.mark
    let n = 0
    let from = start
    // the current cell: its digits as an integer, how many follow the mark, and whether it is still a plain number
    let mantissa = 0
    let digits = 0
    let fraction = 0
    let sawMark = false
    let plain = true
    for (let i = start; i <= end; i++) {
      if (i < end) {
        const c = bytes[i]
        if (c !== d) {
          const digit = c - 48
          if (digit >= 0 && digit <= 9) {
            if (mantissa >= 9007199254740991 / 10 - 9) plain = false
            mantissa = mantissa * 10 + digit
            digits++
            if (sawMark) fraction++
          } else if (c === mark && !sawMark) sawMark = true
          else if (c >= 128 || c === 34) return -1
          else plain = false
          continue
        }
      }
      let a = from
      let b = i
      while (a < b && isSpace(bytes[a])) a++
      while (b > a && isSpace(bytes[b - 1])) b--
      if (n >= this.starts.length) this.grow()
      this.starts[n] = a
      this.ends[n] = b
      if (plain && digits > 0 && fraction <= 22) {
        this.numbers[n] = mantissa / POW10[fraction]
        this.read[n] = 1
      } else this.read[n] = 0
      n++
      from = i + 1
      mantissa = 0
      digits = 0
      fraction = 0
      sawMark = false
      plain = true
    }
    while (n > 0 && this.starts[n - 1] === this.ends[n - 1]) n--
    this.bytes = bytes
    this.count = n
    return n
  }

  private grow(): void {
    this.starts = doubled(this.starts, new Int32Array(this.starts.length * 2))
    this.ends = doubled(this.ends, new Int32Array(this.ends.length * 2))
    this.numbers = doubled(this.numbers, new Float64Array(this.numbers.length * 2))
    this.read = doubled(this.read, new Uint8Array(this.read.length * 2))
  }

  /** The k-th cell as a string ('' beyond the last). */
  cell(k: number): string {
    return k < this.count ? asciiText(this.bytes, this.starts[k], this.ends[k]) : ''
  }

  isEmpty(k: number): boolean {
    return k >= this.count || this.starts[k] === this.ends[k]
  }

  /** The k-th cell as a number in this file's decimal format, or NaN when it is not a plain number (readNumber's rules). */
  number(k: number, decimalComma: boolean): number {
    if (k >= this.count) return NaN
    if (this.read[k] === 1 && decimalComma === this.decimalComma) return this.numbers[k]
    return readNumberBytes(this.bytes, this.starts[k], this.ends[k], decimalComma)
  }

  /**
   * `number`'s test of a number read by `split` is repeated here on purpose: a loop calling `number` alone (which
   * returns either that double or readNumberBytes's result) boxed every number again, 31 MB on 20,000 rows of
   * 100 bins (the allocation profile of DEVELOPERS.md's seventh round).
   */
  numbersInto(values: number[], first: number, n: number, decimalComma: boolean): void {
    const same = decimalComma === this.decimalComma
    for (let j = 0; j < n; j++) {
      const k = first + j
      values[j] = same && k < this.count && this.read[k] === 1 ? this.numbers[k] : this.number(k, decimalComma)
    }
  }

  /** The first byte of the k-th cell (-1: empty or beyond the last). */
  firstByte(k: number): number {
    return k < this.count && this.starts[k] < this.ends[k] ? this.bytes[this.starts[k]] : -1
  }
}

/**
 * readNumber (cells.ts) over ASCII bytes: the same numbers and the same NaNs for the same text (test/field/cells.test.ts
 * compares the two); a copy of its loop on bytes rather than characters, because a byte is much quicker to read.
 */
export function readNumberBytes(bytes: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  let i = start
  if (i >= end) return NaN
  const mark = decimalComma ? 44 : 46
  let negative = false
  let c = bytes[i]
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
    c = bytes[i]
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
    c = bytes[i]
    if (c !== 101 && c !== 69) return NaN
    i++
    let expNegative = false
    c = i < end ? bytes[i] : 0
    if (c === 43 || c === 45) {
      expNegative = c === 45
      i++
    }
    let expDigits = 0
    for (; i < end; i++) {
      c = bytes[i]
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
    let s = asciiText(bytes, start, end)
    if (decimalComma) s = s.replace(',', '.')
    v = Number(s)
  }
  if (!Number.isFinite(v)) return NaN
  return negative && !(v < 0) ? -v : v
}
