// A sizer file read from its bytes (src-core/field/campaign-read.ts: readSizerBytes, as the app's record worker reads
// a web page's file) gives what reading the text those bytes decode to gives (readSizerPart): the same packed rows
// bit for bit, the same rows left out with their lines and reasons, the same summary; or the same error. Checked on
// every sizer file in resources/ and on variants of one with what the byte path must not read differently: line
// breaks of each kind, byte-order marks, blank and comment lines, text beyond ASCII in the header and in a row,
// bytes that are not UTF-8, no final line break, rows held until the date order is known.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { readSizerBytes, readSizerPart, type SizerPart } from '../../src-core/field/campaign-read.ts'
import { InputError } from '../../src-core/index.ts'
import { repo } from '../cli/helpers.ts'

const file = (path: string): Uint8Array => new Uint8Array(readFileSync(join(repo, 'resources', path)))
const bytesOf = (text: string): Uint8Array => new TextEncoder().encode(text)
const join8 = (...parts: (Uint8Array | string)[]): Uint8Array => {
  const xs = parts.map((p) => (typeof p === 'string' ? bytesOf(p) : p))
  const out = new Uint8Array(xs.reduce((n, x) => n + x.length, 0))
  let at = 0
  for (const x of xs) (out.set(x, at), (at += x.length))
  return out
}

/** A reading's outcome: the part, or the error's where, message and fix. */
function outcome(read: () => SizerPart): SizerPart | { error: string } {
  try {
    return read()
  } catch (e) {
    if (!(e instanceof InputError)) throw e
    return { error: `${e.where} | ${e.message} | ${e.fix}` }
  }
}

/** The bits of a Float64Array, so that two readings compare bit for bit (and NaN as NaN). */
const bits = (a: Float64Array | undefined) => (a ? Array.from(new BigUint64Array(a.buffer, a.byteOffset, a.length)) : a)

function expectSameAsText(bytes: Uint8Array): SizerPart | { error: string } {
  const input = { kind: 'mobility' as const, name: 'sizer.csv' }
  const fromText = outcome(() => readSizerPart({ ...input, text: new TextDecoder().decode(bytes) }))
  const fromBytes = outcome(() => readSizerBytes(input, bytes))
  if ('error' in fromText || 'error' in fromBytes) {
    expect(fromBytes).toEqual(fromText)
    return fromText
  }
  const { values, timesMs, rh, ...rest } = fromBytes
  const { values: v, timesMs: t, rh: h, ...restText } = fromText
  expect(rest).toEqual(restText)
  expect(bits(values)).toEqual(bits(v))
  expect(bits(timesMs)).toEqual(bits(t))
  expect(bits(rh)).toEqual(bits(h))
  return fromText
}

const campaign = file('field/campaign-mobility.csv')
const campaignText = new TextDecoder().decode(campaign)
const lines = campaignText.split('\n')
const firstRow = lines.findIndex((l) => /^\d{4}-/.test(l))

describe('a sizer file read from its bytes', () => {
  it('reads every sizer file of resources/ as its decoded text is read', () => {
    const files = ['field/campaign-mobility.csv', 'field/campaign-aerodynamic.csv', 'field/valley-mobility.csv', 'field/valley-aerodynamic.csv', 'field-valley-sizer.txt', 'field-ridge-counter.csv', 'sizer-series-semicolon.csv', 'sizer-single-comma.csv']
    const rows = files.map((f) => {
      const r = expectSameAsText(file(f))
      return 'rows' in r ? r.rows : r.error
    })
    // the invented campaign's file holds rows and rows left out (a gap, bad rows): both compared above
    const c = expectSameAsText(campaign)
    expect('rows' in c && c.rows > 100 && c.end.rejectedCount > 0).toBe(true)
    expect(rows.filter((r) => typeof r === 'number' && r > 0).length).toBeGreaterThanOrEqual(5)
  })

  it('reads each kind of line break, byte-order marks and a missing last break as the text is read', () => {
    expectSameAsText(bytesOf(campaignText.replace(/\n/g, '\r\n')))
    expectSameAsText(bytesOf(campaignText.replace(/\n/g, '\r')))
    expectSameAsText(bytesOf(lines.slice(0, -3).join('\n') + '\r\n' + lines.slice(-3).join('\n'))) // one \r late
    expectSameAsText(bytesOf('\ufeff' + campaignText))
    expectSameAsText(bytesOf('\ufeff\ufeff' + campaignText))
    expectSameAsText(bytesOf(campaignText.replace(/\n+$/, '')))
    expectSameAsText(bytesOf(campaignText + '\n\n'))
    const midMark = [...lines]
    midMark[firstRow + 3] = '\ufeff' + midMark[firstRow + 3]
    // that row is not plain ASCII, so it is decoded and read as text: the mark is trimmed as a space and the row kept
    const r = expectSameAsText(bytesOf(midMark.join('\n')))
    expect('rows' in r && r.rows).toBe((expectSameAsText(campaign) as SizerPart).rows)
  })

  it('reads blank and comment lines, text beyond ASCII and bytes that are not UTF-8 as the text is read', () => {
    const edited = [...lines]
    edited.splice(firstRow + 2, 0, '', '# a note: filter changed at 10:00', '#')
    edited[firstRow - 1] = edited[firstRow - 1].replace('time', 'time (UTC, “ISO”)')
    edited[firstRow + 6] = edited[firstRow + 6].replace(/,([^,]*)$/, ',4·5e1')
    edited[1] = 'units: µm'
    expectSameAsText(bytesOf(edited.join('\n')))
    edited[1] = 'units: nm'
    const bad = bytesOf(edited.join('\n'))
    // a lone continuation byte, a truncated two-byte sequence at a line's end and an overlong encoding, each in a row
    const rowStart = (k: number) => bytesOf(edited.slice(0, k).join('\n') + '\n').length
    const at = rowStart(firstRow + 8) + 30
    const broken = join8(bad.subarray(0, at), new Uint8Array([0x80]), bad.subarray(at, rowStart(firstRow + 10) - 1), new Uint8Array([0xc3]), bad.subarray(rowStart(firstRow + 10) - 1, rowStart(firstRow + 12) + 25), new Uint8Array([0xc0, 0xaf]), bad.subarray(rowStart(firstRow + 12) + 25))
    const r = expectSameAsText(broken)
    expect('rows' in r && r.end.rejectedCount >= 3).toBe(true)
  })

  it('reads rows held until the date order is known, and a file refused, as the text is read', () => {
    const dmy = ['units: nm', 'quantity: dN/dlogDp', 'time,20,40,80,160']
    for (let d = 1; d <= 14; d++) dmy.push(`${String(d).padStart(2, '0')}/03/2026 10:00,${d},2,3,4`)
    expectSameAsText(bytesOf(dmy.join('\n') + '\n'))
    expectSameAsText(bytesOf(['units: nm', 'time,20,40,80', '01/02/2026 10:00,1,2,3', '02/01/2026 11:00,1,2,3'].join('\n')))
    const refused = expectSameAsText(bytesOf('no table here\njust words\n'))
    expect('error' in refused).toBe(true)
    expectSameAsText(new Uint8Array(0))
  })
})
