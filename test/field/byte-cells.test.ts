// The sizer reader's byte path (ByteCells, readNumberBytes, reader.pushBytes) against its text path: the same cells,
// the same numbers and NaNs, and the same records, reasons and errors for a whole file read either way.
import { describe, expect, it } from 'vitest'
import { ByteCells, readNumberBytes } from '../../src-core/field/byte-cells.ts'
import { CellSplitter, readNumber, type Delimiter } from '../../src-core/field/cells.ts'
import { createSizerReader, InputError, type SizerReaderOptions, type SizerRecord } from '../../src-core/index.ts'

// a fixed pseudo-random sequence (xorshift), so a failure repeats
let x = 0x2545f491
const next = () => ((x ^= x << 13), (x ^= x >>> 17), (x ^= x << 5), (x >>> 0) / 2 ** 32)
const pick = (s: string) => s[Math.floor(next() * s.length)]
const bytesOf = (s: string) => new TextEncoder().encode(s)

describe('readNumberBytes', () => {
  it('reads what readNumber reads from the same characters, NaN included, with a decimal point or comma', () => {
    const mismatches: string[] = []
    const cells = ['', '0', '-0', '+1', '1.', '.5', '1e', '1e+', '1e-5', '1E22', '1e23', '12345678901234567890', '1.2.3', '1,5', '1 000', '-', 'nan', '0.0000001234567', '9007199254740993', '1e-400', '1e400']
    for (let i = 0; i < 50_000; i++) {
      let c = ''
      const n = 1 + Math.floor(next() * 14)
      for (let k = 0; k < n; k++) c += pick('0123456789012345678901234567890123456789..,,eE+-x ')
      cells.push(c)
    }
    for (const c of cells) {
      const b = bytesOf(`;${c};`)
      for (const comma of [false, true]) {
        const want = readNumber(`;${c};`, 1, c.length + 1, comma)
        const got = readNumberBytes(b, 1, c.length + 1, comma)
        if (!Object.is(want, got) && mismatches.length < 5) mismatches.push(`"${c}" (${comma ? 'comma' : 'point'}): ${got} vs ${want}`)
      }
    }
    expect(mismatches).toEqual([])
  })
})

describe('ByteCells', () => {
  it('splits a plain line into the cells CellSplitter gives (spaces trimmed, trailing empty cells dropped), and refuses quotes and bytes beyond ASCII', () => {
    for (const d of [',', ';', '\t'] as Delimiter[]) {
      const text = new CellSplitter(d)
      const bytes = new ByteCells(d)
      for (let i = 0; i < 5_000; i++) {
        let line = ''
        const n = Math.floor(next() * 30)
        for (let k = 0; k < n; k++) line += pick(`12.5e- \t\rab${d}${d}${d}`)
        const b = bytesOf(`xx${line}yy`)
        const count = bytes.split(b, 2, b.length - 2)
        expect(count).toBe(text.split(line))
        for (let k = 0; k <= count; k++) {
          expect(bytes.cell(k)).toBe(text.cell(k))
          expect(bytes.isEmpty(k)).toBe(text.isEmpty(k))
          expect(Object.is(bytes.number(k, false), text.number(k, false))).toBe(true)
        }
      }
      // numbers read in the split's own pass (digits and one decimal mark) and the rest by readNumberBytes: long
      // digit runs (beyond 2^53, more than 22 after the mark), either mark, as the table's mark or the other
      const marks = d === ',' ? [false] : [false, true]
      for (const comma of marks) {
        const cells = new ByteCells(d, comma)
        for (let i = 0; i < 5_000; i++) {
          let line = ''
          const n = Math.floor(next() * 12)
          for (let k = 0; k < n; k++) {
            const len = next() < 0.1 ? 15 + Math.floor(next() * 20) : 1 + Math.floor(next() * 8)
            for (let j = 0; j < len; j++) line += pick(d === ',' ? '0123456789012345678901234567890123456789.e- ' : '0123456789012345678901234567890123456789.,e- ')
            line += d
          }
          const b = bytesOf(line)
          const count = cells.split(b, 0, b.length)
          expect(count).toBe(text.split(line))
          for (let k = 0; k <= count; k++) {
            for (const c of marks) expect(Object.is(cells.number(k, c), text.number(k, c)), `"${text.cell(k)}", ${c ? 'comma' : 'point'}`).toBe(true)
          }
          // a row's numbers at once (numbersInto), from any first cell to one beyond the last: each cell's number
          const first = Math.floor(next() * (count + 1))
          const span = count + 1 - first
          for (const c of marks) {
            const fromBytes = Array.from({ length: span }, () => -1)
            const fromText = Array.from({ length: span }, () => -1)
            cells.numbersInto(fromBytes, first, span, c)
            text.numbersInto(fromText, first, span, c)
            for (let j = 0; j < span; j++) {
              expect(Object.is(fromBytes[j], text.number(first + j, c)), `numbersInto, cell ${first + j}`).toBe(true)
              expect(Object.is(fromText[j], text.number(first + j, c))).toBe(true)
            }
          }
        }
      }
      // a line of more cells than the arrays first hold (they grow, keeping what they hold)
      const long = Array.from({ length: 600 }, (_, k) => (k % 7 === 0 ? ` ${k}.5 ` : k % 5 === 0 ? `x${k}` : `${k}.${k % 10}`)).join(d)
      const lb = bytesOf(long)
      expect(bytes.split(lb, 0, lb.length)).toBe(text.split(long))
      for (let k = 0; k < 600; k++) {
        expect(bytes.cell(k)).toBe(text.cell(k))
        expect(Object.is(bytes.number(k, false), text.number(k, false))).toBe(true)
      }
      expect(bytes.split(bytesOf(`1${d}"2"`), 0, 4)).toBe(-1)
      expect(bytes.split(bytesOf(`1${d}µ`), 0, 4)).toBe(-1)
    }
  })
})

/** Reads `text` line by line, every line offered as bytes first (as `series` does) or as text only. */
function readAll(text: string, options: SizerReaderOptions, asBytes: boolean): { records: SizerRecord[]; summary: unknown; error?: string } {
  const records: SizerRecord[] = []
  const reader = createSizerReader({ ...options, onRecord: (r) => records.push({ ...r, values: r.values.slice() }) })
  try {
    let line = 0
    for (const l of text.split('\n')) {
      line++
      const b = Buffer.from(l, 'utf8')
      if (!asBytes || !reader.pushBytes(b, 0, b.length, line)) reader.push(l, line)
    }
    return { records, summary: reader.end() }
  } catch (e) {
    if (!(e instanceof InputError)) throw e
    return { records, summary: undefined, error: e.message }
  }
}

describe('reader.pushBytes', () => {
  const file = [
    'units: nm',
    'quantity: dN/dlogDp',
    '# made up: good rows, bad cells, comments, a quoted row and one beyond ASCII',
    'time,10,20,40,80',
    '2024-01-01T00:00:00Z,1,2,3,4',
    '2024-01-01T00:01:00Z, 1.5 ,2e1,3E-1,-0',
    '',
    '# a comment line',
    '#,not a comment but a bad time,1,2,3',
    '2024-01-01T00:02:00Z,1,abc,3,4',
    '2024-01-01T00:03:00Z,1,,3,4',
    '2024-01-01T00:04:00Z,1,-2,3,4',
    '2024-01-01T00:05:00Z,1,2,3,4,5',
    '2024-01-01T00:06:00Z,"1",2,3,4',
    '2024-01-01T00:07:00Z,1,2µ,3,4',
    '2024-01-01T00:08,1,2,3,4',
    'yesterday,1,2,3,4',
    '2024-01-01T00:09:00Z,1,2,3,4,,,',
    '2024-01-01T00:10:00Z,1,2,3'
  ].join('\n')

  it('gives the records, the reasons (line, column) and the summary that pushing the same lines as text gives', () => {
    for (const negatives of [undefined, 'zero'] as const) {
      const text = readAll(file, { fileName: 'made-up.csv', negatives }, false)
      const bytes = readAll(file, { fileName: 'made-up.csv', negatives }, true)
      expect(text.error).toBeUndefined()
      expect(bytes).toEqual(text)
      expect(text.records.length).toBeGreaterThan(3)
      expect((text.summary as { rejected: unknown[] }).rejected.length).toBeGreaterThan(negatives ? 5 : 6)
    }
  })

  it('stops at the first bad row with the same message', () => {
    const text = readAll(file, { fileName: 'made-up.csv', onBadRow: 'stop' }, false)
    const bytes = readAll(file, { fileName: 'made-up.csv', onBadRow: 'stop' }, true)
    expect(text.error).toMatch(/made-up\.csv line 9 column 1/)
    expect(bytes).toEqual(text)
  })

  it('takes no line before the table is recognised, nor while the date order is unknown', () => {
    const reader = createSizerReader({ fileName: 'x.csv' })
    const b = bytesOf('time,10,20')
    expect(reader.pushBytes(b, 0, b.length)).toBe(false)
    const dmy = ['time,10,20', ...Array.from({ length: 50 }, (_, i) => `0${1 + (i % 9)}/01/2024 10:00,1,2`), '13/01/2024 10:00,1,2', '02/01/2024 11:00,1,2'].join('\n')
    expect(readAll(dmy, { fileName: 'x.csv' }, true)).toEqual(readAll(dmy, { fileName: 'x.csv' }, false))
  })
})
