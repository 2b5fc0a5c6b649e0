// Bench case `uncertainty-demo`: 1,000 draws of the demo's wood-smoke sample (spreads on black carbon's k, the
// accumulation mode's median diameter, RH and the surface albedo) with its forcing, as a user runs it: the built
// command line (out/cli, built first here) in its own process, this thread and one worker thread per spare core.
// Whole-process seconds, median of three runs; the goal is 2 s. (Run from the TypeScript sources instead, each
// worker thread compiles them first and starts about 3 s late, which is not what a user meets.) The timed processes
// run without NODE_EXTRA_CA_CERTS (timing.ts).
import { execFileSync, spawnSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { availableParallelism, loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { demoStudy, serializeStudy, SITE_QUANTITIES, type UncertainInput } from '../../src-core/index.ts'
import { envLeftOut, median, report, timedEnv } from './timing.ts'

export const UNCERTAINTY_DEMO_INPUTS: UncertainInput[] = [
  { quantity: 'k', material: 'black-carbon', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.3 } },
  { quantity: 'median', mode: 'accumulation', apply: 'factor', distribution: { kind: 'normal', mean: 1, sd: 0.1 }, bounds: { lo: 0.6, hi: 1.4, method: 'resample' } },
  { quantity: 'rh', apply: 'add', distribution: { kind: 'normal', mean: 0, sd: 5 }, bounds: { lo: -20, hi: 20, method: 'clamp' } },
  { quantity: 'surface_albedo', apply: 'set', distribution: { kind: 'uniform', lo: 0.05, hi: 0.35 } }
]

const root = fileURLToPath(new URL('../../', import.meta.url))

export async function benchUncertaintyDemo(): Promise<void> {
  execFileSync(process.execPath, [join(root, 'scripts/build-cli.mjs')], { stdio: 'ignore' })
  const study = demoStudy()
  const name = study.samples[0].name
  const site = UNCERTAINTY_DEMO_INPUTS.filter((i) => SITE_QUANTITIES.includes(i.quantity))
  const own = UNCERTAINTY_DEMO_INPUTS.filter((i) => !SITE_QUANTITIES.includes(i.quantity))
  const dir = mkdtempSync(join(tmpdir(), 'motebench-bench-uncertainty-'))
  const workers = Math.max(0, Math.min(7, availableParallelism() - 1))
  try {
    const file = join(dir, 'study.mote')
    writeFileSync(file, serializeStudy({ ...study, uncertainty: { samples: { [name]: { inputs: own } }, site: { inputs: site } } }))
    const seconds: number[] = []
    let pWarm = NaN
    for (let r = 0; r < 3; r++) {
      const t0 = performance.now()
      const run = spawnSync(process.execPath, [join(root, 'bin/motebench.mjs'), 'uncertainty', file, '--sample', name, '--draws', '1000', '--seed', '1', '--precision', '0', '--workers', String(workers), '--json'], { encoding: 'utf8', env: timedEnv() })
      seconds.push((performance.now() - t0) / 1000)
      if (run.status !== 0) throw new Error(`motebench uncertainty failed: ${run.stderr}`)
      pWarm = JSON.parse(run.stdout).warming.probability
    }
    report('uncertainty-demo', {
      draws: 1000,
      whole_process_s: Number(median(seconds).toFixed(2)),
      goal_s: '<= 2',
      threads: workers + 1,
      load_average_1min: Number(loadavg()[0].toFixed(1)),
      p_warm: Number(pWarm.toFixed(3)),
      ...envLeftOut()
    })
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}
