// The infrared's size integration over all its wavelengths at once on shared nodes (src-core/optics/spectralIntegrate.ts)
// against the one-wavelength adaptive integration (integrate.ts) held to a tight tolerance, wavelength by wavelength.
// Reference: bulkOpticsAt at tolerance 1e-7 with the default (finer) first grid, an independent refinement of the same
// integral; the claim checked is the figures' accuracy of the README and DEVELOPERS.md: σext and σsca within 1e-4
// relative, σabs within 1e-4 of σext, g within 1e-4, at the infrared's own tolerance (1e-3).
import { describe, expect, it } from 'vitest'
import {
  bulkOpticsAt,
  demoStudy,
  finish,
  LONGWAVE_NODES_NM,
  LONGWAVE_TOLERANCE,
  OpticsWorkspace,
  samplePopulations,
  spectralBulkSteps,
  studyMaterials,
  type Sample
} from '../../src-core/index.ts'

const study = demoStudy()
const nodesUm = LONGWAVE_NODES_NM.map((w) => w / 1000)
const atNodes = { user_materials: study.user_materials, wavelengths_nm: [...LONGWAVE_NODES_NM] }
const own = studyMaterials(atNodes)

function mode(name: string, material: string, median: number, gsd: number, rh: number): Sample {
  return {
    name,
    size: { kind: 'modes', modes: [{ by: 'number', number_cm3: 100, median_um: median, gsd }] },
    composition: { components: [{ material, volume_fraction: 1 }], mixing: 'volume-average' },
    rh_percent: rh,
    rh_history: 'rising',
    layer: { kind: 'depth', depth_m: 1000 }
  }
}

const cases: Sample[] = [
  ...study.samples,
  // hard cases: a narrow fine mode; dry sea salt (NaCl: nearly lossless over 4–12 µm, so its coarse particles ring);
  // measured bins of dust (flat bins, Richardson on the levels)
  mode('narrow fine sulfate', 'ammonium-sulfate', 0.1, 1.1, 60),
  mode('narrow dry sea salt', 'sea-salt', 2, 1.15, 0),
  mode('wide dry sea salt', 'sea-salt', 5, 1.5, 0),
  {
    ...mode('dust bins', 'mineral-dust', 1, 2, 30),
    size: { kind: 'bins', bins: { diameters: [0.1, 0.2, 0.5, 1, 2, 5, 10], edges: true, diameter_unit: 'um', quantity: 'dN/dlogDp', values: [100, 50, 10, 2, 0.5, 0.05] } }
  }
]

describe('infrared size integration on shared nodes', () => {
  for (const sample of cases) {
    it(`${sample.name}: every infrared wavelength within 1e-4 of the one-wavelength integration at 1e-7`, () => {
      const pops = samplePopulations(sample, own, Math.max(...nodesUm), LONGWAVE_TOLERANCE)
      const cond = { rhPercent: sample.rh_percent, history: sample.rh_history, temperatureK: sample.temperature_k ?? 298.15 }
      const s = finish(spectralBulkSteps(pops, nodesUm, cond, { tolerance: LONGWAVE_TOLERANCE, coarsestStep: 2 }, new OpticsWorkspace()))
      expect(s.converged).toBe(true)
      nodesUm.forEach((wl, j) => {
        const r = bulkOpticsAt(pops, wl, cond, { tolerance: 1e-7, upscatter: false }, new OpticsWorkspace())
        expect(Math.abs(s.ext[j] / r.ext - 1), `σext at ${wl} µm`).toBeLessThan(1e-4)
        expect(Math.abs(s.sca[j] / r.sca - 1), `σsca at ${wl} µm`).toBeLessThan(1e-4)
        expect(Math.abs(s.abs[j] - r.abs) / r.ext, `σabs at ${wl} µm`).toBeLessThan(1e-4)
        expect(Math.abs(s.g[j] - r.g), `g at ${wl} µm`).toBeLessThan(1e-4)
      })
    })
  }

  it('keeps its nodes: after an edit of a mode, a warm workspace gives the cold figures (to 1e-11), with fewer Mie evaluations', () => {
    const smoke = study.samples.find((x) => x.name === 'Winter wood smoke')!
    const cond = { rhPercent: smoke.rh_percent, history: smoke.rh_history, temperatureK: smoke.temperature_k ?? 298.15 }
    const run = (sample: Sample, ws: OpticsWorkspace) =>
      finish(spectralBulkSteps(samplePopulations(sample, own, Math.max(...nodesUm), LONGWAVE_TOLERANCE), nodesUm, cond, { tolerance: LONGWAVE_TOLERANCE, coarsestStep: 2 }, ws))
    if (smoke.size.kind !== 'modes') throw new Error('modes expected')
    const edited: Sample = { ...smoke, size: { ...smoke.size, modes: smoke.size.modes.map((m) => ({ ...m, median_um: m.median_um * 1.07 })) } }
    const ws = new OpticsWorkspace()
    run(smoke, ws)
    const warm = run(edited, ws)
    const cold = run(edited, new OpticsWorkspace())
    // to rounding (as test/optics/node-cache.test.ts: a node taken from the cache starts the next one's Newton search elsewhere)
    for (const key of ['ext', 'sca', 'abs', 'g'] as const) {
      cold[key].forEach((v, j) => expect(Math.abs(warm[key][j] - v), `${key} at ${nodesUm[j]} µm`).toBeLessThanOrEqual(1e-11 * Math.abs(v)))
    }
    expect(warm.evaluations).toBeLessThan(cold.evaluations / 2)
  })
})
