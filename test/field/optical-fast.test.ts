// The optical files' reader reads a plain data row from its characters (optical-file.ts, `plainRow`) and leaves
// every other row to its general path. Check: on the invented campaign's and the demo's measured files, and on
// copies of them with bad rows, odd cells and other layouts, it gives what the general path alone gives, with the
// lines split as text.split(/\r?\n/) splits them (what the reader did before): the same header, records (values bit
// for bit), rows left out with their line, column and reason, humidity cells left out, or the same error. And its
// plain time stamps (plainStampMs) against parseTimeStamp.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { createOpticalReader, parseOpticalText, type OpticalQuantity, type OpticalRecord } from '../../src-core/index.ts'
import { parseTimeStamp, plainStampMs } from '../../src-core/field/timebase.ts'

const FIELD = join(fileURLToPath(new URL('.', import.meta.url)), '../../resources/field')
const read = (name: string) => readFileSync(join(FIELD, name), 'utf8')

/** What the reader gave before: every row through the general path, lines from text.split(/\r?\n/). */
function before(text: string, allowed: readonly OpticalQuantity[]) {
  const records: OpticalRecord[] = []
  try {
    const reader = createOpticalReader({ fileName: 'f.csv', allowed, plainRows: false, onRecord: (r) => records.push(r) })
    for (const line of text.split(/\r?\n/)) reader.push(line)
    return { end: reader.end(), records }
  } catch (e) {
    return { error: String(e) }
  }
}

function now(text: string, allowed: readonly OpticalQuantity[]) {
  try {
    const r = parseOpticalText(text, { fileName: 'f.csv', allowed })
    const { header, records, ...rest } = r
    return { end: { ...header, recordCount: records.length, ...rest }, records }
  } catch (e) {
    return { error: String(e) }
  }
}

/** The values' bits, so that -0 and NaN are compared as they are. */
const bits = (records: OpticalRecord[]) => records.map((r) => Array.from(new Uint8Array(r.values.buffer, r.values.byteOffset, r.values.byteLength)))

function same(text: string, allowed: readonly OpticalQuantity[]) {
  const a = before(text, allowed)
  const b = now(text, allowed)
  expect(b.error).toEqual(a.error)
  if (a.error) return a
  expect(b.end).toEqual(a.end)
  expect(b.records!.map(({ values: _v, ...r }) => r)).toEqual(a.records!.map(({ values: _v, ...r }) => r))
  expect(bits(b.records!)).toEqual(bits(a.records!))
  return a
}

/** The time of line i (1-based). */
const timeOf = (text: string, i: number) => text.split('\n')[i - 1].split(',')[0]

/** The file with line i (1-based) replaced. */
const withLine = (text: string, i: number, line: string) => {
  const lines = text.split('\n')
  lines[i - 1] = line
  return lines.join('\n')
}

const NEPH: OpticalQuantity[] = ['scattering', 'backscattering']
const ABS: OpticalQuantity[] = ['absorption']

describe('the optical reader: plain rows read from their characters give what the general path gives', () => {
  it('on the invented campaign and the demo files', () => {
    for (const [name, allowed] of [['campaign-nephelometer.csv', NEPH], ['campaign-absorption.csv', ABS], ['valley-nephelometer.csv', NEPH], ['valley-absorption.csv', ABS]] as const) {
      const r = same(read(name), allowed)
      expect(r.records!.length).toBeGreaterThan(100)
    }
  })

  it('on rows left out, odd cells and the lines around them', () => {
    const neph = read('campaign-nephelometer.csv')
    const cases: [number, string][] = [
      [10, `${timeOf(neph, 10)},33.1,x,19.5,3.8,3.3,2.8`], // not a number
      [11, ',33.1,25.4,19.5,3.8,3.3,2.8'], // no time
      [12, '2026-13-14T00:41:30Z,33.1,25.4,19.5,3.8,3.3,2.8'], // no such month
      [13, `${timeOf(neph, 13)},33.1,25.4,19.5,3.8,3.3,2.8,9`], // a cell more than the header
      [14, `${timeOf(neph, 14)},NaN,na,,N/A,3.3,2.8`], // no data, written four ways
      [15, `${timeOf(neph, 15)}, 33.1 ,25.4,\t19.5,3.8,3.3,2.8  `], // spaces and a tab around cells
      [16, `${timeOf(neph, 16)},"33.1",25.4,19.5,3.8,3.3,2.8`], // a quoted cell
      [17, `${timeOf(neph, 17)},-0,+1.5e1,.5,5.,1e400,2.8`], // signs, exponents, a number too large
      [18, `${timeOf(neph, 18)},33.1,25.4,19.5,3.8,3.3,2.8,,,`], // trailing separators
      [19, '# a comment between rows'],
      [20, ''],
      [21, `\uFEFF${timeOf(neph, 21)},33.1,25.4,19.5,3.8,3.3,2.8`],
      [22, `${timeOf(neph, 22).replace('T', ' ')},1.2.3,25.4,19.5,3.8,3.3,2.8`],
      [23, `${timeOf(neph, 23)},3,4`], // fewer cells than the header
      [24, `${timeOf(neph, 24).replace('Z', '+00:00')},33.1,25.4,19.5,3.8,3.3,2.8`]
    ]
    let text = neph
    for (const [i, line] of cases) text = withLine(text, i, line)
    const r = same(text, NEPH)
    expect(r.end!.rejectedCount).toBeGreaterThan(3)
    // each alone too (a row left out must not change how the next is read)
    for (const [i, line] of cases) same(withLine(neph, i, line), NEPH)
    // with carriage returns, without a final line break, a lone carriage return
    same(text.replace(/\n/g, '\r\n'), NEPH)
    same(text.trimEnd(), NEPH)
    same(withLine(text, 30, '2026-07-14T02:26:30Z,1,2,3,4,5,6\r2026-07-14T02:27:30Z,1,2,3,4,5,6'), NEPH)
  })

  it('on what stops the reading', () => {
    const abs = read('campaign-absorption.csv')
    expect(same(withLine(abs, 10, '2026-07-14T00:32:10,1,2,3'), ABS).error).toMatch(/zone/) // zone form changes
    expect(same(withLine(abs, 10, '2026-07-14T00:01:40Z,1,2,3'), ABS).error).toMatch(/does not follow/) // out of order
    expect(same(withLine(abs, 5, '2026-07-14T00:02:10Z,1,2,3'), ABS).error).toMatch(/does not follow/) // repeated
  })

  it('on other layouts: tabs, semicolons, a humidity column, day/month/year dates', () => {
    const abs = read('campaign-absorption.csv')
    same(abs.replace(/,/g, '\t'), ABS)
    same(abs.replace(/,/g, ';'), ABS)
    // a humidity column between the channels, with values outside 0–100 % and not numbers
    let rh = abs.split('\n').map((l, i) => {
      const c = l.split(',')
      if (c.length < 4) return l
      c.splice(2, 0, i === 2 ? 'RH (%)' : i % 17 === 0 ? '140' : i % 23 === 0 ? 'wet' : i % 29 === 0 ? '' : String(30 + (i % 40)))
      return c.join(',')
    }).join('\n')
    const r = same(rh, ABS)
    expect(r.end!.humidityRejectedCount).toBeGreaterThan(10)
    rh = withLine(rh, 40, '2026-07-14T03:01:40Z,5,NA,4,3')
    same(rh, ABS)
    // day/month/year: the order stated, and detected from a later row (earlier rows held until then)
    const dmy = abs.replace(/^(\d{4})-(\d{2})-(\d{2})T(\d{2}:\d{2}:\d{2})Z/gm, '$3/$2/$1 $4')
    expect(same(dmy.replace('# units', '# date format: dd/mm/yyyy\n# units'), ABS).records!.length).toBeGreaterThan(100)
    expect(same(dmy, ABS).records!.length).toBeGreaterThan(100)
  })
})

describe('plainStampMs: the plain ISO 8601 stamps without parseTimeStamp', () => {
  it('gives parseTimeStamp’s milliseconds and zone, or NaN where parseTimeStamp is to read the text', () => {
    const two = (n: number) => String(n).padStart(2, '0')
    let plain = 0
    const check = (cell: string) => {
      const ms = plainStampMs(cell, 0, cell.length)
      const t = parseTimeStamp(cell)
      if (ms === ms) {
        plain++
        expect(t).toEqual({ ms, zoned: cell.length === 20 })
      }
    }
    // every day of a leap year, a common year and the years the two-digit quirk of Date.UTC covers, at a few times
    for (const y of [2024, 2026, 1999, 2000, 1900, 50, 0]) {
      for (let m = 0; m <= 13; m++) for (let d = 0; d <= 32; d++) {
        const date = `${String(y).padStart(4, '0')}-${two(m)}-${two(d)}`
        for (const time of ['00:00:00', '23:59:59', '24:00:00', '12:60:00', '12:00:60', '12:00:61', '7:05:00']) {
          for (const [sep, zone] of [['T', 'Z'], [' ', ''], ['T', ''], [' ', 'Z'], ['T', 'z'], ['T', '+01:00']]) check(`${date}${sep}${time}${zone}`)
        }
      }
    }
    for (const odd of ['2026-07-14T00:00:00.5Z', '2026-07-14T00:00Z', '2026/07/14T00:00:00Z', '2026-07-14X00:00:00Z', '2026-07-1aT00:00:00Z', '+026-07-14T00:00:00Z', '2026-07-14T00:00:00 Z']) {
      expect(plainStampMs(odd, 0, odd.length)).toBeNaN()
    }
    expect(plain).toBeGreaterThan(10000)
  })
})
