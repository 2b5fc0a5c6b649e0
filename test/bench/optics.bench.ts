// Bench case for a whole sample: the demo's three-mode sample at all of its wavelengths.
import { computeSampleOptics, demoStudy, OpticsWorkspace } from '../../src-core/index.ts'
import { msPerRun, report } from './timing.ts'

export function benchSampleDemo(): void {
  const study = demoStudy()
  const sample = study.samples.find((s) => s.size.kind === 'modes' && s.size.modes.length >= 3) ?? study.samples[0]
  let evaluations = 0
  // a fresh workspace each run: a cold computation, with no nodes kept from the run before
  const ms = msPerRun(() => {
    const r = computeSampleOptics(sample, study, { workspace: new OpticsWorkspace() })
    evaluations = r.wavelengths.reduce((a, w) => a + w.mie_evaluations, 0)
  }, 5)
  report('sample-demo', {
    sample: sample.name,
    modes: sample.size.kind === 'modes' ? sample.size.modes.length : 0,
    wavelengths: study.wavelengths_nm.length,
    mie_evaluations: evaluations,
    ms: Math.round(ms)
  })
}
