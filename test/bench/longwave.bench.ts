// Bench case for the infrared part: each demo sample's whole computation (optics at the study's wavelengths with a
// fresh workspace, then its forcing) with and without the thermal-infrared bands; the goal is at most 20 %
// added to a sample's computation.
import { computeSampleOptics, demoStudy, OpticsWorkspace, sampleForcing } from '../../src-core/index.ts'
import { median, report } from './timing.ts'

export function benchLongwaveDemo(): void {
  const study = demoStudy()
  const cases = study.samples.map((sample) => {
    const evaluations = { with: 0, without: 0 }
    const run = (longwave: boolean) => () => {
      const ws = new OpticsWorkspace()
      const optics = computeSampleOptics(sample, study, { workspace: ws, longwave })
      sampleForcing(optics, study.site, study.verdict_margin_w_m2)
      evaluations[longwave ? 'with' : 'without'] = ws.evaluations
    }
    return { sample, evaluations, a: run(false), b: run(true), pairMs: 0 }
  })
  // every sample with and without, twice, before any is timed: the first sample's figures are not the JIT's warm-up
  for (let k = 0; k < 2; k++) {
    for (const c of cases) {
      const t0 = performance.now()
      c.a()
      c.b()
      c.pairMs = performance.now() - t0
    }
  }
  for (const c of cases) {
    // the two runs alternate, so that a change of the machine's load falls on both alike; at least 7 pairs, and
    // about 4 s of them for the fast samples (whose milliseconds scatter most)
    const pairs = Math.min(101, Math.max(7, Math.round(4000 / c.pairMs)))
    const ta: number[] = []
    const tb: number[] = []
    for (let r = 0; r < pairs; r++) {
      let t = performance.now()
      c.a()
      ta.push(performance.now() - t)
      t = performance.now()
      c.b()
      tb.push(performance.now() - t)
    }
    const without = median(ta)
    const withIr = median(tb)
    report('longwave-demo', {
      sample: c.sample.name,
      ms_without_infrared: Math.round(without * 10) / 10,
      ms_with_infrared: Math.round(withIr * 10) / 10,
      added_percent: Math.round((withIr / without - 1) * 1000) / 10,
      mie_evaluations_without: c.evaluations.without,
      mie_evaluations_infrared: c.evaluations.with - c.evaluations.without,
      pairs,
      goal_added_percent: 20
    })
  }
}
