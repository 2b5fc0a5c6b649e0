// The station record's truncation correction of the measured scattering (campaign.truncation), as
// `motebench series --truncation` makes it: the same RowComparer columns, and the charts' measured scattering and
// its ratio taken from the corrected figures when it is on.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { buildCampaignRecord, demoStudy, parseStudy, recordSeries, serializeStudy, type CampaignInput, type CampaignSettings } from '../../src-core/index.ts'
import { repo } from '../cli/helpers.ts'

const input = (kind: CampaignInput['kind'], name: string): CampaignInput => ({ kind, name, text: readFileSync(join(repo, 'resources/field', name), 'utf8') })
const files = [input('mobility', 'valley-mobility.csv'), input('aerodynamic', 'valley-aerodynamic.csv'), input('scattering', 'valley-nephelometer.csv'), input('absorption', 'valley-absorption.csv')]
const settings = (over: Partial<CampaignSettings> = {}): CampaignSettings => ({ files: files.map((f) => ({ kind: f.kind, path: f.name })), sample: 'Quarry dust event', wavelength_nm: 550, density_g_cm3: 1.8, shape_factor: 1, ...over })
const median = (v: number[]) => {
  const s = v.slice().sort((a, b) => a - b)
  return s[s.length >> 1]
}
const finite = (v: (number | null)[]) => v.filter((x): x is number => x !== null)

describe('truncation correction in the station record', () => {
  const plain = buildCampaignRecord(files, settings(), demoStudy()).record!
  const corrected = buildCampaignRecord(files, settings({ truncation: { angles_deg: [7, 170] } }), demoStudy()).record!

  it('is kept in study.campaign and read back; angles that do not ascend are said', () => {
    const c = settings({ truncation: { angles_deg: [7, 170] } })
    const r = parseStudy(JSON.stringify({ ...JSON.parse(serializeStudy(demoStudy())), campaign: c }))
    expect(r.ok).toBe(true)
    if (r.ok) expect(r.study.campaign?.truncation).toEqual({ angles_deg: [7, 170] })
    const bad = parseStudy(JSON.stringify({ ...JSON.parse(serializeStudy(demoStudy())), campaign: settings({ truncation: { angles_deg: [7, 80] } }) }))
    expect(bad.ok).toBe(false)
  })

  it('adds the CLI columns and the note, and the charts compare with the corrected scattering', () => {
    expect(plain.columns).not.toContain('truncation_C_550nm')
    expect(corrected.columns).toContain('truncation_C_550nm')
    expect(corrected.columns).toContain('sca_meas_corr_550nm_Mm-1')
    expect(corrected.notes.join('\n')).toMatch(/truncation: measured scattering multiplied by C/)
    const a = recordSeries(plain)
    const b = recordSeries(corrected)
    expect(a.scatteringCorrected).toBe(false)
    expect(b.scatteringCorrected).toBe(true)
    // the demo nephelometer reads σ/C, C from src-core's nephelometer tool on the known modes
    // (test/field/make-optical-demo-files.ts), so uncorrected ratios lie above 1.1 (coarse dust: C > 1.15, as
    // optical-cli.test.ts finds with series --truncation) and corrected ones are 1 within about 1 %
    expect(median(finite(a.values.sca_ratio))).toBeGreaterThan(1.1)
    expect(Math.abs(median(finite(b.values.sca_ratio)) - 1)).toBeLessThan(0.01)
    // the measured scattering drawn is larger by the row's C, which is above 1 on every row with a record
    const w = corrected.columns.length
    const iC = corrected.columns.indexOf('truncation_C_550nm')
    let rows = 0
    b.row.forEach((row, i) => {
      const m = b.values.sca_meas[i]
      if (row < 0 || m === null) return
      const C = corrected.cells[row * w + iC]
      expect(C).toBeGreaterThan(1)
      expect(m / a.values.sca_meas[i]!).toBeCloseTo(C, 10)
      rows++
    })
    expect(rows).toBeGreaterThan(40)
    // the computed figures do not change
    expect(b.values.sca).toEqual(a.values.sca)
  })
})
