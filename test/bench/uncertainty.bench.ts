// Bench case `uncertainty-demo`: 1,000 draws of the demo's wood-smoke sample (spreads on black carbon's k, the
// accumulation mode's median diameter, RH and the surface albedo) with its forcing, split over this thread and
// one worker thread (the CLI's machinery). Wall-clock seconds include starting the worker.
import { availableParallelism, loadavg } from 'node:os'
import { demoStudy, type UncertainInput } from '../../src-core/index.ts'
import { runUncertaintyInWorkers } from '../../src-main/cli/uncertainty.ts'
import { report } from './timing.ts'

export const UNCERTAINTY_DEMO_INPUTS: UncertainInput[] = [
  { quantity: 'k', material: 'black-carbon', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.3 } },
  { quantity: 'median', mode: 'accumulation', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0.1 }, bounds: { lo: 0.6, hi: 1.4, method: 'resample' } },
  { quantity: 'rh', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 5 }, bounds: { lo: -20, hi: 20, method: 'clamp' } },
  { quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo: 0.05, hi: 0.35 } }
]

export async function benchUncertaintyDemo(): Promise<void> {
  const study = demoStudy()
  const workers = Math.max(0, Math.min(7, availableParallelism() - 1))
  const start = performance.now()
  const r = await runUncertaintyInWorkers(study, study.samples[0].name, { draws: 1000, seed: 1, precision: 0, inputs: UNCERTAINTY_DEMO_INPUTS }, { workers })
  const seconds = (performance.now() - start) / 1000
  report('uncertainty-demo', {
    draws: r.draws,
    seconds: Number(seconds.toFixed(2)),
    threads: workers + 1,
    load_average_1min: Number(loadavg()[0].toFixed(1)),
    p_warm: Number(r.warming.probability.toFixed(3))
  })
}
