// A sizer file read in parts (src-core/field/campaign-read.ts: sizerCut, readSizerPart, partsJoin, finishSizer), as
// the app's two record workers read it, gives what one reader gives: the same packed rows bit for bit and the same
// reading summary, wherever the cut falls; where a later part cannot continue the first (a time out of order at the
// cut, another zone form), partsJoin says so and one reader reads the file.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { finishSizer, partsJoin, readCampaignInstrument, readCampaignSizer, readSizerPart, sizerCut, type CampaignInput } from '../../src-core/field/campaign-read.ts'
import { packInstrument, packSizerPart, unpackInstrument, unpackSizerPart } from '../../src-core/field/campaign-pack.ts'
import { addCampaignFile, buildCampaignRecord, campaignRecord, demoStudy, readingForAnotherRecord, type CampaignBuild, type CampaignFiles, type CampaignSettings, type ReadAhead } from '../../src-core/index.ts'
import { repo } from '../cli/helpers.ts'

const demo = (name: string): CampaignInput => ({ kind: 'mobility', name, text: readFileSync(join(repo, 'resources/field', name), 'utf8') })

/** Where two arrays of numbers first differ in their bits (-1: nowhere; their lengths first). */
function firstDifference(a: Float64Array | undefined, b: Float64Array | undefined): number {
  if (!a || !b) return a === b ? -1 : 0
  if (a.length !== b.length) return Math.min(a.length, b.length)
  const x = new BigUint64Array(a.buffer, a.byteOffset, a.length)
  const y = new BigUint64Array(b.buffer, b.byteOffset, b.length)
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return i
  return -1
}

/** The file read in two parts cut at `share`, or undefined when it is not cut there or the parts do not join. */
function inParts(input: CampaignInput, share: number, density?: number) {
  const cut = sizerCut(input, share, 0)
  if (!cut) return undefined
  const head = readSizerPart(input, undefined, cut.from)
  const tail = readSizerPart(input, cut)
  if (!partsJoin(head, tail)) return 'no join' as const
  return { cut, read: finishSizer(input, [head, tail], density) }
}

function expectSame(input: CampaignInput, shares: number[], density?: number): number {
  const whole = readCampaignSizer(input, density)
  if (!('table' in whole)) throw new Error(`the whole file was refused: ${JSON.stringify(whole.summary.error)}`)
  let compared = 0
  for (const share of shares) {
    const got = inParts(input, share, density)
    if (got === undefined || got === 'no join') continue
    const { read } = got
    expect(read.summary).toEqual(whole.summary)
    expect(read.table).toEqual(whole.table)
    expect(read.timeText).toEqual(whole.timeText)
    expect(firstDifference(read.values, whole.values)).toBe(-1)
    expect(firstDifference(read.timesMs, whole.timesMs)).toBe(-1)
    expect(firstDifference(read.rh, whole.rh)).toBe(-1)
    expect(firstDifference(read.edgesUm, whole.edgesUm)).toBe(-1)
    expect(firstDifference(read.factor, whole.factor)).toBe(-1)
    expect([read.rows, read.bins, read.zoned]).toEqual([whole.rows, whole.bins, whole.zoned])
    compared++
  }
  return compared
}

const shares = Array.from({ length: 41 }, (_, i) => 0.02 + (0.96 * i) / 40)

describe('a sizer file read in two parts', () => {
  it('gives the invented campaign files (a gap, bad rows) as one reader does, wherever the cut falls', () => {
    for (const name of ['campaign-mobility.csv', 'campaign-aerodynamic.csv']) {
      const input = demo(name)
      const whole = readCampaignSizer(input, 1.8)
      expect(whole.summary.ok).toBe(true)
      if (name === 'campaign-mobility.csv') expect(whole.summary.leftOut).toBeGreaterThan(0) // its bad rows
      // every cut but those within the lines that recognise the table (the first 7 % of these small files)
      expect(expectSame(input, shares, 1.8)).toBe(shares.length - 3)
    }
  })

  it('gives a file with bad rows on either side of the cut, a gap, humidity and a decimal comma as one reader does', () => {
    const lines = ['units: nm', 'quantity: dN/dlogDp', 'time;10;20;40;80;RH']
    const t0 = Date.UTC(2026, 6, 14)
    for (let i = 0; i < 3000; i++) {
      if (i >= 1200 && i < 1300) continue // a gap
      const time = new Date(t0 + i * 300_000).toISOString().replace('.000Z', 'Z')
      const v = [10, 20, 40, 80].map((d) => ((1000 * Math.exp(-((Math.log(d / 30) / 0.6) ** 2)) * (1 + 0.1 * Math.sin(i))) / 7).toFixed(4).replace('.', ','))
      let rh = (40 + 20 * Math.sin(i / 90)).toFixed(1).replace('.', ',')
      if (i % 97 === 5) v[2] = 'n/a' // not a number: the row is left out
      if (i % 131 === 7) v[1] = '-3,2' // negative: left out
      if (i % 149 === 9) rh = '120' // humidity outside 0–100 %: the row is kept, its humidity left out
      if (i % 211 === 11) lines.push(`not a time;${v.join(';')};${rh}`)
      lines.push(`${time};${v.join(';')};${rh}`)
      if (i % 173 === 13) lines.push('') // blank lines are skipped
      if (i % 331 === 17) lines.push('# a comment')
    }
    const input: CampaignInput = { kind: 'mobility', name: 'bad.csv', text: lines.join('\r\n') + '\r\n' }
    const whole = readCampaignSizer(input)
    expect(whole.summary.ok).toBe(true)
    expect(whole.summary.leftOut).toBeGreaterThan(50)
    expect(whole.summary.humidity?.leftOut).toBeGreaterThan(10)
    expect(expectSame(input, shares)).toBeGreaterThanOrEqual(shares.length - 3)
  })

  it('says where parts cannot join: a time out of order or another zone form after the cut', () => {
    const lines = ['units: nm', 'quantity: dN/dlogDp', 'time,10,20,40']
    for (let i = 0; i < 400; i++) lines.push(`${new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString().replace('.000Z', 'Z')},1,2,3`)
    const outOfOrder = lines.slice()
    outOfOrder.splice(203, 0, '2025-12-01T00:00:00Z,1,2,3')
    const input: CampaignInput = { kind: 'mobility', name: 'order.csv', text: outOfOrder.join('\n') + '\n' }
    expect(readCampaignSizer(input).summary.ok).toBe(false) // one reader refuses it
    const cut = sizerCut(input, 0.5, 0)!
    expect(cut.line).toBe(204) // the cut falls on the row out of order
    expect(() => finishSizer(input, [readSizerPart(input, undefined, cut.from), readSizerPart(input, cut)])).not.toThrow()
    expect(partsJoin(readSizerPart(input, undefined, cut.from), readSizerPart(input, cut))).toBe(false)
    // rows without a zone, then with one from the cut on: one reader leaves those out, the second part keeps them
    const zoned = lines.map((l, i) => (i < 203 ? l.replace('Z,', ',') : l))
    const zones: CampaignInput = { kind: 'mobility', name: 'zones.csv', text: zoned.join('\n') + '\n' }
    const whole = readCampaignSizer(zones)
    expect([whole.summary.rows, whole.summary.leftOut]).toEqual([200, 200])
    const cut2 = sizerCut(zones, 0.5, 0)!
    expect(partsJoin(readSizerPart(zones, undefined, cut2.from), readSizerPart(zones, cut2))).toBe(false)
    // nor after it (the second part takes its own first row's form)
    const cut3 = sizerCut(zones, 0.8, 0)!
    expect(partsJoin(readSizerPart(zones, undefined, cut3.from), readSizerPart(zones, cut3))).toBe(false)
  })

  it('is not cut where rows would wait for the date order, nor in a small file', () => {
    const lines = ['units: nm', 'time,10,20,40']
    for (let i = 0; i < 300; i++) lines.push(`0${1 + (i % 9)}/0${1 + (i % 9)}/2026 10:${String(i % 60).padStart(2, '0')},1,2,3`)
    expect(sizerCut({ kind: 'mobility', name: 'dates.csv', text: lines.join('\n') }, 0.5, 0)).toBeUndefined()
    expect(sizerCut(demo('campaign-mobility.csv'), 0.5)).toBeUndefined() // under the default 4 MB
  })
})

describe('a part or a measured file handed to another worker (campaign-pack.ts)', () => {
  it('is unpacked as it was read, bit for bit', () => {
    const input = demo('campaign-mobility.csv')
    const cut = sizerCut(input, 0.5, 0)!
    const part = readSizerPart(input, cut)
    const back = unpackSizerPart(structuredClone(packSizerPart(part)))
    expect(firstDifference(back.values, part.values)).toBe(-1)
    expect(firstDifference(back.timesMs, part.timesMs)).toBe(-1)
    expect({ ...back, values: 0, timesMs: 0 }).toEqual({ ...part, values: 0, timesMs: 0 })
    for (const name of ['campaign-nephelometer.csv', 'campaign-absorption.csv']) {
      const r = readCampaignInstrument({ kind: name.includes('neph') ? 'scattering' : 'absorption', name, text: readFileSync(join(repo, 'resources/field', name), 'utf8') })
      if (!('records' in r)) throw new Error(`${name} was refused`)
      const u = unpackInstrument(structuredClone(packInstrument(r)))
      expect(u.summary).toEqual(r.summary)
      expect(u.header).toEqual(r.header)
      expect(u.records.length).toBe(r.records.length)
      u.records.forEach((x, i) => {
        const y = r.records[i]
        expect({ ...x, values: 0 }).toEqual({ ...y, values: 0 })
        expect(firstDifference(x.values, y.values)).toBe(-1)
      })
    }
  })
})

/** The invented campaign's three files (mobility sizer, nephelometer, absorption) and their record in one piece. */
function demoCampaign() {
  const study = demoStudy()
  const settings: CampaignSettings = { files: [], sample: study.samples[0].name, wavelength_nm: 550, shape_factor: 1 }
  const text = (name: string) => readFileSync(join(repo, 'resources/field', name), 'utf8')
  const inputs: CampaignInput[] = [demo('campaign-mobility.csv'), { kind: 'scattering', name: 'campaign-nephelometer.csv', text: text('campaign-nephelometer.csv') }, { kind: 'absorption', name: 'campaign-absorption.csv', text: text('campaign-absorption.csv') }]
  return { study, settings, inputs, whole: buildCampaignRecord(inputs, settings, study, { figures: 'charts' }) }
}

/** `got` is the record `whole` is, bit for bit: its summaries, arrays, texts and channels. */
function expectSameRecord(got: CampaignBuild, whole: CampaignBuild): void {
  const a = whole.record!
  const b = got.record!
  expect(got.files).toEqual(whole.files)
  for (const k of ['times', 'values', 'dNdlogD', 'edgesUm', 'cells', 'measured'] as const) expect(firstDifference(b[k], a[k])).toBe(-1)
  expect(firstDifference(b.rh, a.rh)).toBe(-1)
  expect(Array.from(b.present)).toEqual(Array.from(a.present))
  expect([b.timeText, b.columns, b.notes, b.gaps, b.figuresNm, b.channels]).toEqual([a.timeText, a.columns, a.notes, a.gaps, a.figuresNm, a.channels])
}

describe('the record from files read in parts', () => {
  it('is the record buildCampaignRecord makes, bit for bit', () => {
    const { study, settings, inputs, whole } = demoCampaign()
    const cut = sizerCut(inputs[0], 0.5, 0)!
    const files: CampaignFiles = { files: [], sizers: [], instruments: [] }
    addCampaignFile(files, finishSizer(inputs[0], [readSizerPart(inputs[0], undefined, cut.from), unpackSizerPart(structuredClone(packSizerPart(readSizerPart(inputs[0], cut))))]))
    for (const i of inputs.slice(1)) {
      const r = readCampaignInstrument(i)
      if (!('records' in r)) throw new Error(`${i.name} was refused`)
      addCampaignFile(files, unpackInstrument(structuredClone(packInstrument(r))))
    }
    expectSameRecord(campaignRecord(files, settings, study, { figures: 'charts' }), whole)
  })

  it('is the same with files read ahead (the app’s worker), and a file read ahead as another kind is read again', () => {
    const { study, settings, inputs, whole } = demoCampaign()
    const compare = (got: CampaignBuild) => expectSameRecord(got, whole)
    const ahead = (): ReadAhead[] => [
      { kind: 'mobility', name: inputs[0].name, part: readSizerPart(inputs[0]) },
      { kind: 'scattering', name: inputs[1].name, instrument: readCampaignInstrument(inputs[1]) },
      { kind: 'absorption', name: inputs[2].name, instrument: readCampaignInstrument(inputs[2]) }
    ]
    compare(buildCampaignRecord(inputs, settings, study, { figures: 'charts', ahead: ahead() }))
    // what was read ahead is what the record takes (here a sizer part of the file's first 100 lines only)
    const short = { ...inputs[0], text: inputs[0].text.split('\n').slice(0, 100).join('\n') }
    expect(buildCampaignRecord(inputs, settings, study, { figures: 'charts', ahead: [{ kind: 'mobility', name: inputs[0].name, part: readSizerPart(short) }] }).record!.times.length).toBeLessThan(whole.record!.times.length)
    // read ahead as other kinds (or under another name): not taken
    const wrong = ahead()
    wrong[0] = { ...wrong[0], kind: 'merged' }
    wrong[1] = { kind: 'absorption', name: inputs[1].name, instrument: readCampaignInstrument({ ...inputs[1], kind: 'absorption' }) }
    wrong[2] = { ...wrong[2], name: 'another.csv' }
    compare(buildCampaignRecord(inputs, settings, study, { figures: 'charts', ahead: wrong }))
    // a refused file read ahead keeps its summary
    const bad = { ...inputs[2], text: 'time,absorption 520 nm\n' }
    const refused = buildCampaignRecord([inputs[0], bad], settings, study, { figures: 'charts' })
    expect(buildCampaignRecord([inputs[0], bad], settings, study, { figures: 'charts', ahead: [undefined, { kind: 'absorption', name: bad.name, instrument: readCampaignInstrument(bad) }] }).files).toEqual(refused.files)
    expect(refused.files[1].ok).toBe(false)
  })

  it('is the same again from the same readings given to record after record (readingForAnotherRecord), at another wavelength too', () => {
    const { study, settings, inputs, whole } = demoCampaign()
    const readings: ReadAhead[] = [
      { kind: 'mobility', name: inputs[0].name, part: readSizerPart(inputs[0]) },
      { kind: 'scattering', name: inputs[1].name, instrument: readCampaignInstrument(inputs[1]) },
      { kind: 'absorption', name: inputs[2].name, instrument: readCampaignInstrument(inputs[2]) }
    ]
    const before = structuredClone(readings)
    const at700 = { ...settings, wavelength_nm: 700 }
    const fresh700 = buildCampaignRecord(inputs, at700, study, { figures: 'charts' })
    for (let i = 0; i < 3; i++) {
      expectSameRecord(buildCampaignRecord(inputs, settings, study, { figures: 'charts', ahead: readings.map(readingForAnotherRecord) }), whole)
      expectSameRecord(buildCampaignRecord(inputs, at700, study, { figures: 'charts', ahead: readings.map(readingForAnotherRecord) }), fresh700)
    }
    // the readings themselves as they were read: a record wrote its notes into its own copies
    expect(readings).toEqual(before)
    // given as they are, a second record's summaries would carry the first one's notes too
    buildCampaignRecord(inputs, settings, study, { figures: 'charts', ahead: readings })
    expect(buildCampaignRecord(inputs, settings, study, { figures: 'charts', ahead: readings }).files).not.toEqual(whole.files)
  })
})
