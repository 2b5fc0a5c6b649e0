// The relative humidity recorded in instrument files (src-core/field/humidity.ts): read by the sizer reader and
// the optical-file reader (not ignored), carried into the campaign record per row, and given to a sample made from
// a stretch as the mean over its rows, its notes saying which file it came from; the study's humidity otherwise.
// Every file here is invented for the test.
import { describe, expect, it } from 'vitest'
import { averageRecords, buildCampaignRecord, demoStudy, isHumidityHeader, parseOpticalText, parseSizerText, recordedHumidity, stretchSample, type CampaignInput, type CampaignSettings } from '../../src-core/index.ts'

const BINS = [10, 15, 22, 33, 50, 75, 110, 165, 250, 370]
const stamp = (min: number) => new Date(Date.UTC(2026, 6, 14, 10, min)).toISOString().replace('.000Z', 'Z')
/** An invented mobility sizer export: 6 rows at 5 min with a humidity column before the bins and a total after. */
function sizerText(rh: string[], header = 'sample RH (%)'): string {
  const lines = ['Invented test station - mobility sizer', 'units: nm', 'quantity: dN/dlogDp', ['time', header, ...BINS, 'total'].join(',')]
  rh.forEach((h, i) => lines.push([stamp(5 * i), h, ...BINS.map((d) => Math.round((1000 + 100 * i) * Math.exp(-((Math.log(d / 60) / 0.6) ** 2) / 2))), 1].join(',')))
  return lines.join('\n') + '\n'
}
const SIZER_RH = ['40', '42', '44', '150', '', 'n/a']
const settings = (): CampaignSettings => ({ files: [], sample: 'Quarry dust event', wavelength_nm: 550, shape_factor: 1 })
const studyRh = demoStudy().samples.find((s) => s.name === 'Quarry dust event')!.rh_percent

describe('humidity columns', () => {
  it('recognises the usual header forms, and no other unit', () => {
    for (const h of ['RH', 'RH (%)', 'rh [%]', 'RH%', 'sample RH', 'Sample RH (%)', 'RH sample', 'humidity %', 'Relative humidity (%)']) expect(isHumidityHeader(h), h).toBe(true)
    for (const h of ['RH (fraction)', 'humidity (g/kg)', 'temperature', 'total', 'RHO']) expect(isHumidityHeader(h), h).toBe(false)
  })

  it('reads a sizer file\'s humidity per row, leaves out a value outside 0–100 % with its reason, and keeps the row', () => {
    const t = parseSizerText(sizerText(SIZER_RH), { fileName: 'mob.csv' })
    expect(t.humidityColumn).toEqual({ column: 2, name: 'sample RH (%)' })
    expect(t.ignoredColumns.map((c) => c.name)).toEqual(['total'])
    expect(t.records.length).toBe(6)
    expect(t.records.map((r) => r.rh)).toEqual([40, 42, 44, NaN, NaN, NaN])
    // the 150 % cell: left out, located, said why; empty and n/a cells mean no value and are not problems
    expect(t.humidityRejected).toHaveLength(1)
    expect(t.humidityRejected[0]).toMatchObject({ line: 8, column: 2 })
    expect(t.humidityRejected[0].reason).toMatch(/150 % is outside 0–100 %.*left out/)
    expect(t.rejected).toEqual([])
    // a fraction column is not read as percent: it stays an ignored column
    const fraction = parseSizerText(sizerText(['0.4', '0.42', '0.44', '0.5', '0.5', '0.5'], 'RH (fraction)'))
    expect(fraction.humidityColumn).toBeUndefined()
    expect(fraction.ignoredColumns.map((c) => c.name)).toEqual(['RH (fraction)', 'total'])
  })

  it("reads a nephelometer file's humidity column between its channels without moving the channels", () => {
    const text = ['# units: Mm-1', 'time,scattering 450 nm,RH,scattering 550 nm', '2026-07-14T10:00:30Z,30,55.5,20', '2026-07-14T10:01:30Z,31,-3,21', '2026-07-14T10:02:30Z,32,,22'].join('\n')
    const r = parseOpticalText(text, { fileName: 'neph.csv', allowed: ['scattering', 'backscattering'] })
    expect(r.header.channels.map((c) => [c.wavelengthNm, c.column])).toEqual([[450, 2], [550, 4]])
    expect(r.header.humidityColumn).toBe(3)
    expect(r.records.map((x) => Array.from(x.values))).toEqual([[30, 20], [31, 21], [32, 22]])
    expect(r.records.map((x) => x.rh)).toEqual([55.5, NaN, NaN])
    expect(r.humidityRejectedCount).toBe(1)
    expect(r.humidityRejected[0]).toMatchObject({ line: 4, column: 3 })
    expect(r.humidityRejected[0].reason).toMatch(/-3 % is outside 0–100 %/)
  })
})

describe('the humidity of a sample made from a stretch', () => {
  const mob: CampaignInput = { kind: 'mobility', name: 'mob.csv', text: sizerText(SIZER_RH) }

  it("takes the mean humidity the sizer file recorded over the stretch's rows, and says so", () => {
    const b = buildCampaignRecord([mob], settings(), demoStudy())
    const r = b.record!
    expect(r.rhFile).toBe('mob.csv')
    expect(b.files[0].humidity).toMatchObject({ column: '"sample RH (%)" (column 2)', rows: 3, leftOut: 1 })
    const all = stretchSample(r, r.times[0], r.times[5])
    // the rows' values 40, 42, 44 (150 left out, two rows without a value): mean 42
    expect(all.sample.rh_percent).toBe(42)
    expect(all.humidity).toEqual({ from: 'files', file: 'mob.csv', rows: 3, percent: 42 })
    expect(all.sample.notes).toMatch(/humidity 42 % from the files: the mean relative humidity recorded in mob\.csv over 3 of the 6 rows/)
    const two = stretchSample(r, r.times[1], r.times[2])
    expect(two.sample.rh_percent).toBe(43)
    // rows without a recorded value: the study's humidity, said so
    const none = stretchSample(r, r.times[3], r.times[5])
    expect(none.sample.rh_percent).toBe(studyRh)
    expect(none.humidity).toMatchObject({ from: 'study', why: 'mob.csv records no humidity in these rows' })
    expect(none.sample.notes).toMatch(new RegExp(`humidity ${studyRh} %: mob\\.csv records no humidity in these rows`))
  })

  it("prefers the nephelometer's humidity, averaged onto the rows", () => {
    // 1-minute records, RH rising by 1 % a minute from 50 %: row k (10:05k to 10:05k+5) holds 50+5k … 54+5k
    const lines = ['# units: Mm-1', 'time,scattering 550 nm,RH (%)']
    for (let m = 0; m < 30; m++) lines.push(`${stamp(m).replace(':00Z', ':30Z')},20,${50 + m}`)
    const neph: CampaignInput = { kind: 'scattering', name: 'neph.csv', text: lines.join('\n') + '\n' }
    const r = buildCampaignRecord([mob, neph], settings(), demoStudy()).record!
    expect(r.rhFile).toBe('neph.csv')
    expect(Array.from(r.rh!)).toEqual([52, 57, 62, 67, 72, 77])
    const s = stretchSample(r, r.times[0], r.times[1])
    expect(s.sample.rh_percent).toBe(54.5)
    expect(s.sample.notes).toMatch(/recorded in neph\.csv over 2 of the 2 rows/)
  })

  it("keeps the study's humidity when no file records one, and says so", () => {
    const plain: CampaignInput = { kind: 'mobility', name: 'plain.csv', text: sizerText(SIZER_RH).replace('sample RH (%)', 'flow') }
    const r = buildCampaignRecord([plain], settings(), demoStudy()).record!
    expect(r.rh).toBeUndefined()
    const s = stretchSample(r, r.times[0], r.times[5])
    expect(s.sample.rh_percent).toBe(studyRh)
    expect(s.sample.notes).toMatch(/no file of the campaign records a humidity/)
  })

  it('gives the mean of a sizer file\'s rows (the import dialog) the mean humidity of those rows that record one', () => {
    // rows 40, 42, 44, 150 (left out), '' and n/a: the whole file records 3 values, mean 42
    const t = parseSizerText(sizerText(SIZER_RH), { fileName: 'mob.csv' })
    const all = averageRecords(t.records)
    expect([all.count, all.rhRows, all.rhSum]).toEqual([6, 3, 126])
    expect(recordedHumidity('mob.csv', all.rhSum, all.rhRows, studyRh)).toEqual({ from: 'files', file: 'mob.csv', rows: 3, percent: 42 })
    // the rows from 10:05 to 10:15 record 42 and 44; from 10:20 on, none
    const some = averageRecords(t.records, { fromMs: Date.UTC(2026, 6, 14, 10, 5), toMs: Date.UTC(2026, 6, 14, 10, 15) })
    expect(recordedHumidity('mob.csv', some.rhSum, some.rhRows, studyRh)).toMatchObject({ from: 'files', rows: 2, percent: 43 })
    const none = averageRecords(t.records, { fromMs: Date.UTC(2026, 6, 14, 10, 20) })
    expect(none.rhRows).toBe(0)
    expect(recordedHumidity('mob.csv', none.rhSum, none.rhRows, studyRh)).toEqual({ from: 'study', percent: studyRh, why: 'mob.csv records no humidity in these rows' })
  })

  it('keeps the sample\'s own humidity where the recorded mean is not below 100 % (cloud, not aerosol: common practice)', () => {
    expect(recordedHumidity('f.csv', 2 * 99.96, 2, 55)).toEqual({ from: 'study', percent: 55, why: 'the humidity recorded in f.csv averages 100 % here, not below 100 % (cloud, not aerosol)' })
    // rounded to 0.1 % as the rows' mean: 99.94 stays below
    expect(recordedHumidity('f.csv', 99.94, 1, 55)).toEqual({ from: 'files', file: 'f.csv', rows: 1, percent: 99.9 })
  })
})
