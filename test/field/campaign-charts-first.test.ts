// A record made for its charts (buildCampaignRecord with figures: 'charts', as the app's worker asks for it) holds
// the figures at the wavelengths the charts draw, the same numbers to the last bit as the record computed whole, and
// its CSV export computes the other wavelengths (completeRecord) into the same record `motebench series` gives
// (campaign.test.ts checks the whole record's CSV against series on the same invented valley files).
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { buildCampaignRecord, chartWavelengthsNm, completeRecord, demoStudy, recordComplete, recordCsv, recordSeries, type CampaignInput, type CampaignSettings } from '../../src-core/index.ts'
import { repo } from '../cli/helpers.ts'

const input = (kind: CampaignInput['kind'], name: string): CampaignInput => ({ kind, name, text: readFileSync(join(repo, 'resources/field', name), 'utf8') })
const files = [input('mobility', 'valley-mobility.csv'), input('aerodynamic', 'valley-aerodynamic.csv'), input('scattering', 'valley-nephelometer.csv'), input('absorption', 'valley-absorption.csv')]
const settings = (wavelength_nm: number): CampaignSettings => ({ files: files.map((f) => ({ kind: f.kind, path: f.name })), sample: 'Quarry dust event', wavelength_nm, density_g_cm3: 1.8, shape_factor: 1, truncation: { angles_deg: [7, 170] } })

/** Every cell the same number to the last bit (NaN where the other has NaN). */
function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false
  return true
}

describe('a record computed first at the charts’ wavelengths', () => {
  for (const chosen of [550, demoStudy().wavelengths_nm[0]]) {
    it(`draws the same charts and exports the same CSV as the whole record (chosen ${chosen} nm)`, () => {
      const whole = buildCampaignRecord(files, settings(chosen), demoStudy()).record!
      const part = buildCampaignRecord(files, settings(chosen), demoStudy(), { figures: 'charts' }).record!
      expect(recordComplete(whole)).toBe(true)
      expect(part.wavelengthsNm).toEqual(whole.wavelengthsNm)
      // the chosen wavelength, its neighbours among the record's (the Ångström pair), the nephelometer's nearest
      const at = whole.wavelengthsNm.indexOf(chosen)
      // the demo nephelometer's scattering channels are at 450, 550 and 700 nm (valley-nephelometer.csv's header)
      const nearest = [450, 550, 700].reduce((x, y) => (Math.abs(y - chosen) < Math.abs(x - chosen) ? y : x))
      const expected = [...new Set([whole.wavelengthsNm[Math.max(0, at - 1)], chosen, whole.wavelengthsNm[at + 1], nearest])].sort((x, y) => x - y)
      expect(part.figuresNm).toEqual(expected)
      expect(chartWavelengthsNm(whole.wavelengthsNm, chosen, whole.channels)).toEqual(expected)
      expect(part.figuresNm.length).toBeLessThan(whole.wavelengthsNm.length / 3)
      expect(recordComplete(part)).toBe(false)

      // its cells hold the columns computed only (the charts' wavelengths' figures, the totals, the comparison), in
      // the whole record's order, each bit for bit the whole record's column of that name; the export adds the others
      const figureOf = (name: string) => /^(ext|sca|abs|ssa|g)_(\d+(?:\.\d+)?)nm_Mm-1$|^(ssa|g)_(\d+(?:\.\d+)?)nm$/.exec(name)
      const wlOf = (name: string) => {
        const m = figureOf(name)
        return m ? Number(m[2] ?? m[4]) : undefined
      }
      expect(part.columns).toEqual(whole.columns.filter((name) => wlOf(name) === undefined || part.figuresNm.includes(wlOf(name)!)))
      expect(part.cells.length).toBe(whole.times.length * part.columns.length)
      const w = part.columns.length
      const width = whole.columns.length
      let compared = 0
      part.columns.forEach((name, c) => {
        const at = whole.columns.indexOf(name)
        for (let k = 0; k < whole.times.length; k++) {
          const a = part.cells[k * w + c]
          if (!Object.is(a, whole.cells[k * width + at])) expect.fail(`${name} at row ${k}: ${a} ≠ ${whole.cells[k * width + at]}`)
          compared++
        }
      })
      expect(compared).toBeGreaterThan(0)
      expect(whole.columns.length - part.columns.length).toBeGreaterThan(part.figuresNm.length * 5)
      expect(recordSeries(part)).toEqual(recordSeries(whole))

      // the export completes the record: every cell the whole record's, and the same CSV
      expect(recordCsv(part)).toBe(recordCsv(whole))
      expect(recordComplete(part)).toBe(true)
      expect(part.columns).toEqual(whole.columns)
      expect(sameBits(part.cells, whole.cells)).toBe(true)
      completeRecord(part) // a complete record is left as it is
      expect(sameBits(part.cells, whole.cells)).toBe(true)
    })
  }
})
