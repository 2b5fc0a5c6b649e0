// The node cache (src-core/optics/nodeCache.ts) must be invisible in the results: a computation that takes
// nodes from an earlier one gives the figures a cold computation gives, and only the Mie evaluations change.
import { describe, expect, it } from 'vitest'
import { computeSampleOptics, demoStudy, finish, OpticsWorkspace, sampleOpticsSteps, type Sample, type SampleOptics } from '../../src-core/index.ts'

// three of the demo's wavelengths keep the test quick
const study = { ...demoStudy(), wavelengths_nm: [450, 550, 700] }
/** The demo's coastal sample: an accumulation mode and a humid sea-salt coarse mode (its own composition). */
const coastal = study.samples.find((s) => s.size.kind === 'modes' && s.size.modes.some((m) => m.composition))!

function editLastMode(s: Sample, change: (m: { median_um: number; gsd: number }) => object): Sample {
  if (s.size.kind !== 'modes') throw new Error('modes expected')
  const modes = s.size.modes.slice()
  modes[modes.length - 1] = { ...modes[modes.length - 1], ...change(modes[modes.length - 1]) }
  return { ...s, size: { ...s.size, modes } }
}

const evaluations = (r: SampleOptics) => r.wavelengths.reduce((a, w) => a + w.mie_evaluations, 0)

function expectSameFigures(a: SampleOptics, b: SampleOptics) {
  a.wavelengths.forEach((w, i) => {
    const v = b.wavelengths[i]
    for (const key of ['ext', 'sca', 'abs', 'g', 'backscatter_fraction', 'upscatter_fraction'] as const) {
      expect(Math.abs(w[key] - v[key])).toBeLessThanOrEqual(1e-11 * Math.abs(v[key]))
    }
  })
  a.angular[0].phase.forEach((p, i) => expect(Math.abs(p - b.angular[0].phase[i])).toBeLessThanOrEqual(1e-11 * b.angular[0].phase[i]))
}

describe('node cache', () => {
  const edits: [string, (s: Sample) => Sample][] = [
    ['a larger median', (s) => editLastMode(s, (m) => ({ median_um: m.median_um * 1.05 }))],
    ['a wider mode', (s) => editLastMode(s, (m) => ({ gsd: m.gsd + 0.05 }))],
    ['a higher humidity', (s) => ({ ...s, rh_percent: s.rh_percent + 3 })]
  ]
  for (const [what, edit] of edits) {
    it(`after ${what}, a warm workspace gives the cold figures`, () => {
      const ws = new OpticsWorkspace()
      computeSampleOptics(coastal, study, { workspace: ws })
      const edited = edit(coastal)
      const warm = computeSampleOptics(edited, study, { workspace: ws })
      const cold = computeSampleOptics(edited, study, { workspace: new OpticsWorkspace() })
      expectSameFigures(warm, cold)
    })
  }

  it('a size edit reuses most Mie evaluations; a humidity edit changes every particle and reuses none', () => {
    const ws = new OpticsWorkspace()
    const first = computeSampleOptics(coastal, study, { workspace: ws })
    const median = computeSampleOptics(editLastMode(coastal, (m) => ({ median_um: m.median_um * 1.05 })), study, { workspace: ws })
    expect(evaluations(median)).toBeLessThan(0.3 * evaluations(first))
    const humid = computeSampleOptics({ ...coastal, rh_percent: coastal.rh_percent + 3 }, study, { workspace: ws })
    const humidCold = computeSampleOptics({ ...coastal, rh_percent: coastal.rh_percent + 3 }, study, { workspace: new OpticsWorkspace() })
    expect(evaluations(humid)).toBe(evaluations(humidCold))
  })

  it('a quick pass on a coarser lattice costs the full pass after it little extra, and is within its tolerance', () => {
    // the quick pass's nodes (coarsest step 2) are nodes of the full pass's lattice (step 1): those the full pass
    // visits are reused, not evaluated again (two thirds of them here, as before the refinement by panels, which
    // made the full pass 2.4 times cheaper on this sample)
    const ws = new OpticsWorkspace()
    const quick = computeSampleOptics(coastal, study, { workspace: ws, tolerance: 1e-2, coarsestStep: 2 })
    const full = computeSampleOptics(coastal, study, { workspace: ws })
    const cold = computeSampleOptics(coastal, study, { workspace: new OpticsWorkspace() })
    expectSameFigures(full, cold)
    expect(evaluations(cold) - evaluations(full)).toBeGreaterThan(0.6 * evaluations(quick))
    expect(evaluations(quick) + evaluations(full)).toBeLessThanOrEqual(1.03 * evaluations(cold))
    quick.wavelengths.forEach((w, i) => {
      expect(Math.abs(w.ext / cold.wavelengths[i].ext - 1)).toBeLessThan(1e-2)
      expect(Math.abs(w.g - cold.wavelengths[i].g)).toBeLessThan(1e-2)
    })
  })

  it('after a change of the phase-function angles, a warm workspace gives the cold phase function', () => {
    // the nodes keep their sums at the angles asked for before; new angles need new sums at every node
    const ws = new OpticsWorkspace()
    computeSampleOptics(coastal, study, { workspace: ws })
    const angles = [0, 30, 60, 90, 120, 150, 175]
    const warm = computeSampleOptics(coastal, study, { workspace: ws, anglesDeg: angles })
    const cold = computeSampleOptics(coastal, study, { workspace: new OpticsWorkspace(), anglesDeg: angles })
    expect(warm.angular[0].angles_deg).toEqual(angles)
    expectSameFigures(warm, cold)
    warm.angular[0].polarization.forEach((p, i) => expect(Math.abs(p - cold.angular[0].polarization[i])).toBeLessThanOrEqual(1e-11))
  })

  it('stays within its node limit, dropping the contexts used longest ago, without changing results', () => {
    const small = new OpticsWorkspace(2000)
    const r = computeSampleOptics(coastal, study, { workspace: small })
    expect(small.nodes.size).toBeLessThanOrEqual(2000)
    expectSameFigures(r, computeSampleOptics(coastal, study, { workspace: new OpticsWorkspace() }))
    // the dropped contexts' tables are handed on to new ones (emptied, rows zeroed): a second sample through the
    // same small workspace also gives the cold figures
    const other = study.samples.find((s) => s !== coastal)!
    expectSameFigures(computeSampleOptics(other, study, { workspace: small }), computeSampleOptics(other, study, { workspace: new OpticsWorkspace() }))
  })

  it('after recycle() (every context dropped, its tables handed on), the next computations give the cold figures', () => {
    // an uncertainty draw with its own humidity recycles its tables for the next draw (propagate.ts): the rows and
    // nodes the tables held must not show in the next results, nor the dropped contexts be found again
    const ws = new OpticsWorkspace()
    computeSampleOptics(coastal, study, { workspace: ws })
    ws.nodes.recycle()
    expect(ws.nodes.size).toBe(0)
    const humid = { ...coastal, rh_percent: coastal.rh_percent + 3 }
    const warm = computeSampleOptics(humid, study, { workspace: ws })
    const cold = computeSampleOptics(humid, study, { workspace: new OpticsWorkspace() })
    expect(warm.wavelengths).toEqual(cold.wavelengths)
    ws.nodes.recycle()
    const again = computeSampleOptics(coastal, study, { workspace: ws })
    expect(again.wavelengths).toEqual(computeSampleOptics(coastal, study, { workspace: new OpticsWorkspace() }).wavelengths)
    expect(evaluations(again)).toBe(evaluations(computeSampleOptics(coastal, study, { workspace: new OpticsWorkspace() })))
  })

  it('a paused integration keeps its nodes while another computation on the workspace drops its context', () => {
    const small = new OpticsWorkspace(500)
    const paused = sampleOpticsSteps(coastal, study, { workspace: small })
    for (let i = 0; i < 3; i++) paused.next() // into the first wavelength's integration
    const other = study.samples.find((s) => s !== coastal)!
    computeSampleOptics(other, study, { workspace: small }) // drops every older context, the paused one's too
    expectSameFigures(finish(paused), computeSampleOptics(coastal, study, { workspace: new OpticsWorkspace() }))
  })
})
