// The colour map's numbers (CampaignRecord.dNdlogD): each row with a distribution is its values turned into dN/dlogD
// by the layout's conversion (binsFromMeasurement, the one place it lives), 0 in the gaps; a layout in dN/dlogD
// already (factors of exactly 1) shares the values' array rather than copying a year of rows, the same numbers to the
// last bit. On the invented valley files (resources/field).
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { binsFromMeasurement, buildCampaignRecord, demoStudy, type CampaignInput, type CampaignRecord, type CampaignSettings } from '../../src-core/index.ts'
import { repo } from '../cli/helpers.ts'

const text = (name: string) => readFileSync(join(repo, 'resources/field', name), 'utf8')
const settings = (files: CampaignInput[]): CampaignSettings => ({ files: files.map((f) => ({ kind: f.kind, path: f.name })), sample: 'Quarry dust event', wavelength_nm: 550, density_g_cm3: 1.8, shape_factor: 1 })

/** The rule per cell: value × the layout's factor where the row has a distribution, else 0. */
function expectMapByRule(r: CampaignRecord): void {
  const l = r.layout
  const bins = l.edges ? l.diameters.length - 1 : l.diameters.length
  const factor = binsFromMeasurement({ diameters: l.diameters, diameterKind: l.edges ? 'edges' : 'midpoints', diameterUnit: l.diameter_unit, quantity: l.quantity, values: new Array(bins).fill(1), density: 1.8 }).dNdlogD
  expect(r.dNdlogD.length).toBe(r.times.length * bins)
  for (let k = 0; k < r.times.length; k++)
    for (let j = 0; j < bins; j++) {
      const want = r.present[k] ? r.values[k * bins + j] * factor[j] : 0
      if (!Object.is(r.dNdlogD[k * bins + j], want)) expect.fail(`row ${k} bin ${j}: ${r.dNdlogD[k * bins + j]} ≠ ${want}`)
    }
}

describe('the colour map’s dN/dlogD', () => {
  it('shares the values of a layout in dN/dlogD (one sizer, and merged sizers with a gap)', () => {
    const one = [{ kind: 'mobility', name: 'valley-mobility.csv', text: text('valley-mobility.csv') }] satisfies CampaignInput[]
    const two = [...one, { kind: 'aerodynamic', name: 'valley-aerodynamic.csv', text: text('valley-aerodynamic.csv') }] satisfies CampaignInput[]
    for (const files of [one, two]) {
      const r = buildCampaignRecord(files, settings(files), demoStudy(), { figures: 'charts' }).record!
      expect(r.layout.quantity).toBe('dN/dlogDp')
      expect(r.dNdlogD).toBe(r.values)
      expectMapByRule(r)
    }
    const merged = buildCampaignRecord(two, settings(two), demoStudy()).record!
    expect(merged.present.includes(0)).toBe(true) // the merge leaves gap steps, drawn as 0
  })

  it('converts, in an array of its own, a layout in another quantity', () => {
    const files = [{ kind: 'mobility', name: 'valley-volume.csv', text: text('valley-mobility.csv').replace('quantity: dN/dlogDp', 'quantity: dV/dlogDp') }] satisfies CampaignInput[]
    const r = buildCampaignRecord(files, settings(files), demoStudy(), { figures: 'charts' }).record!
    expect(r.layout.quantity).toBe('dV/dlogDp')
    expect(r.dNdlogD).not.toBe(r.values)
    expectMapByRule(r)
  })
})
