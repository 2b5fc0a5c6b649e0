// The record's charts keep their series in typed arrays (recordColumns: NaN where a line has no value), and
// recordSeries (numbers and nulls) is made from them: both give the points and figures the code before gave, bit for
// bit (that code is kept below as the reference), on the invented valley campaign (a gap, bad rows, two sizers,
// both measured files), with and without the truncation correction and over a part of the rows.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { absorptionAt, angstromExponent, buildCampaignRecord, demoStudy, recordColumns, recordSeries, RECORD_SERIES, type CampaignInput, type CampaignRecord, type CampaignSettings, type RecordSeries } from '../../src-core/index.ts'
import { angstromPairNm, nearestScattering } from '../../src-core/field/campaign.ts'
import { repo } from '../cli/helpers.ts'

const input = (kind: CampaignInput['kind'], name: string): CampaignInput => ({ kind, name, text: readFileSync(join(repo, 'resources/field', name), 'utf8') })
const files = [input('mobility', 'valley-mobility.csv'), input('aerodynamic', 'valley-aerodynamic.csv'), input('scattering', 'valley-nephelometer.csv'), input('absorption', 'valley-absorption.csv')]
const settings = (more: Partial<CampaignSettings> = {}): CampaignSettings => ({ files: files.map((f) => ({ kind: f.kind, path: f.name })), sample: 'Quarry dust event', wavelength_nm: 550, density_g_cm3: 1.8, shape_factor: 1, ...more })

/** recordSeries as it was before the typed arrays (one push of a number or a null per point). */
function before(r: CampaignRecord, from = 0, to = r.times.length): RecordSeries {
  const finite = (v: number): number | null => (Number.isFinite(v) ? v : null)
  const col = (name: string) => r.columns.indexOf(name)
  const w = r.chosenNm
  const [iExt, iSca, iAbs, iSsa, iG, iN, iM] = [`ext_${w}nm_Mm-1`, `sca_${w}nm_Mm-1`, `abs_${w}nm_Mm-1`, `ssa_${w}nm`, `g_${w}nm`, 'dry_number_cm-3', 'dry_mass_ug_m-3'].map(col)
  const pair = angstromPairNm(r.wavelengthsNm, w)
  const iLo = col(`ext_${pair[0]}nm_Mm-1`)
  const iHi = col(`ext_${pair[1]}nm_Mm-1`)
  const absCh = r.channels.map((c, i) => ({ c, i })).filter((x) => x.c.quantity === 'absorption')
  const nearest = nearestScattering(r.channels, w)
  const iScaAt = nearest ? col(`sca_${nearest.wavelengthNm}nm_Mm-1`) : -1
  const iScaCorr = nearest ? col(`sca_meas_corr_${nearest.wavelengthNm}nm_Mm-1`) : -1
  const absWl = absCh.map((x) => x.c.wavelengthNm)
  const absVals = new Float64Array(absCh.length)
  const width = r.columns.length
  const nc = r.channels.length
  const out: RecordSeries = { x: [], row: [], values: Object.fromEntries(RECORD_SERIES.map((k) => [k, []])) as unknown as RecordSeries['values'], angstromPairNm: pair, scatteringAtNm: nearest?.wavelengthNm ?? NaN, absorptionAtNm: absCh.length > 0 ? w : NaN, scatteringCorrected: iScaCorr >= 0 }
  const push = (t: number, row: number) => {
    out.x.push(t / 1000)
    out.row.push(row)
    const v = out.values
    if (row < 0 || !r.present[row]) {
      for (const k of RECORD_SERIES) v[k].push(null)
      return
    }
    const c = row * width
    v.ext.push(finite(r.cells[c + iExt]))
    v.sca.push(finite(r.cells[c + iSca]))
    v.abs.push(finite(r.cells[c + iAbs]))
    v.ssa.push(finite(r.cells[c + iSsa]))
    v.g.push(finite(r.cells[c + iG]))
    v.angstrom.push(finite(angstromExponent(r.cells[c + iLo], pair[0], r.cells[c + iHi], pair[1])))
    v.number.push(finite(r.cells[c + iN]))
    v.mass.push(finite(r.cells[c + iM]))
    const sm = iScaCorr >= 0 ? r.cells[c + iScaCorr] : nearest ? r.measured[row * nc + nearest.index] : NaN
    v.sca_meas.push(finite(sm))
    v.sca_ratio.push(sm > 0 ? finite(r.cells[c + iScaAt] / sm) : null)
    for (let j = 0; j < absCh.length; j++) absVals[j] = r.measured[row * nc + absCh[j].i]
    const am = absCh.length > 0 ? absorptionAt(w, absWl, absVals) : NaN
    v.abs_meas.push(finite(am))
    v.abs_ratio.push(am > 0 ? finite(r.cells[c + iAbs] / am) : null)
  }
  const lo = Math.max(0, from)
  const hi = Math.min(r.times.length, to)
  for (let k = lo; k < hi; k++) {
    if (k > lo && r.times[k] - r.times[k - 1] > 1.5 * r.intervalMs) push((r.times[k - 1] + r.times[k]) / 2, -1)
    push(r.times[k], k)
  }
  return out
}

describe('the charts’ series in typed arrays', () => {
  for (const [what, more] of [['plain', {}], ['truncation-corrected', { truncation: { angles_deg: [7, 170] as [number, number] } }]] as const) {
    it(`gives the points and figures of the code before, bit for bit (${what})`, () => {
      const r = buildCampaignRecord(files, settings(more), demoStudy(), { figures: 'charts' }).record!
      const n = r.times.length
      for (const [from, to] of [[0, n], [17, n - 40], [n - 1, n], [5, 5]]) {
        const want = before(r, from, to)
        const got = recordSeries(r, from, to)
        const typed = recordColumns(r, from, to)
        expect(got).toEqual(want)
        expect(Array.from(typed.x)).toEqual(want.x)
        expect(Array.from(typed.row)).toEqual(want.row)
        for (const k of RECORD_SERIES) {
          // Object.is: the same bits (−0 kept), NaN exactly where the code before gave null
          typed.values[k].forEach((y, i) => {
            const w = want.values[k][i]
            if (!(w === null ? Number.isNaN(y) : Object.is(y, w))) expect.fail(`${k} at ${i}: ${y} against ${w}`)
          })
          got.values[k].forEach((y, i) => {
            if (!Object.is(y, want.values[k][i])) expect.fail(`${k} at ${i}: ${y} against ${want.values[k][i]}`)
          })
        }
        expect({ ...typed, x: 0, row: 0, values: 0 }).toEqual({ ...want, x: 0, row: 0, values: 0 })
      }
      // the merged campaign has rows without a distribution (its gap)
      const all = before(r)
      expect(all.values.ext.some((y, i) => y === null && all.row[i] >= 0)).toBe(true)
      expect(all.values.abs_ratio.some((y) => y !== null)).toBe(true)
    })
  }

  it('gives the code before’s points across a gap in the times (a break inserted), bit for bit', () => {
    // one sizer taken row by row, 10 of its lines cut out: its times jump, so the series get a break
    const lines = files[0].text.split('\n')
    const at = lines.findIndex((l) => /^\d{4}-/.test(l)) + 20
    const cut: CampaignInput = { ...files[0], text: [...lines.slice(0, at), ...lines.slice(at + 10)].join('\n') }
    const inputs = [cut, files[2], files[3]]
    const r = buildCampaignRecord(inputs, { ...settings(), files: inputs.map((f) => ({ kind: f.kind, path: f.name })) }, demoStudy(), { figures: 'charts' }).record!
    const want = before(r)
    expect(want.row).toContain(-1)
    const typed = recordColumns(r)
    expect(recordSeries(r)).toEqual(want)
    expect(Array.from(typed.x)).toEqual(want.x)
    expect(Array.from(typed.row)).toEqual(want.row)
    for (const k of RECORD_SERIES) typed.values[k].forEach((y, i) => {
      const w = want.values[k][i]
      if (!(w === null ? Number.isNaN(y) : Object.is(y, w))) expect.fail(`${k} at ${i}: ${y} against ${w}`)
    })
  })
})
