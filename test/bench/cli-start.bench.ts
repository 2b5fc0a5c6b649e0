// Bench case `cli-start`: how soon the command line answers. The whole-process time of
// `node bin/motebench.mjs sphere --x 10 --m 1.5+0.01i --json` (the built CLI in out/cli, built first here) against a
// bare `node -e 0` in the same run, interleaved, median of several runs each; and a worker thread's start (from
// `new Worker` to its first message, the built series worker) in a plain node process. Goals (issue 19): the CLI
// within 3 × node's own start, a worker within 0.2 s. The timed processes run without NODE_EXTRA_CA_CERTS (timing.ts).
import { execFileSync, spawnSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { envLeftOut, median, report, timedEnv } from './timing.ts'

const root = fileURLToPath(new URL('../../', import.meta.url))
const RUNS = 9

function wallSeconds(args: string[]): number {
  const t0 = performance.now()
  const r = spawnSync(process.execPath, args, { cwd: root, stdio: ['ignore', 'ignore', 'pipe'], env: timedEnv() })
  const s = (performance.now() - t0) / 1000
  if (r.status !== 0) throw new Error(`${args.join(' ')} failed: ${r.stderr}`)
  return s
}

/** Runs in a plain node process: starts the built series worker `n` times, one after another. */
const WORKER_STARTS = `
import { Worker } from 'node:worker_threads'
const url = new URL(process.argv[2])
const n = Number(process.argv[3])
const times = []
for (let i = 0; i < n; i++) {
  const t0 = performance.now()
  const w = new Worker(url, { workerData: { sample: {}, userMaterials: [], wavelengthsNm: [550], tolerance: 1e-4 } })
  await new Promise((resolve, reject) => { w.once('message', resolve); w.once('error', reject) })
  times.push((performance.now() - t0) / 1000)
  await w.terminate()
}
process.stdout.write(JSON.stringify(times))
`

export async function benchCliStart(): Promise<void> {
  execFileSync(process.execPath, [fileURLToPath(new URL('../../scripts/build-cli.mjs', import.meta.url))], { stdio: 'ignore' })
  const node: number[] = []
  const cli: number[] = []
  wallSeconds(['bin/motebench.mjs', 'sphere', '--x', '10', '--m', '1.5+0.01i', '--json']) // warm the file cache
  for (let i = 0; i < RUNS; i++) {
    node.push(wallSeconds(['-e', '0']))
    cli.push(wallSeconds(['bin/motebench.mjs', 'sphere', '--x', '10', '--m', '1.5+0.01i', '--json']))
  }
  const workerUrl = new URL('../../out/cli/series-worker.mjs', import.meta.url).href
  const dir = mkdtempSync(join(tmpdir(), 'motebench-bench-'))
  let starts: number[]
  try {
    writeFileSync(join(dir, 'worker-starts.mjs'), WORKER_STARTS)
    starts = JSON.parse(execFileSync(process.execPath, [join(dir, 'worker-starts.mjs'), workerUrl, String(RUNS)], { encoding: 'utf8', env: timedEnv() }))
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
  const nodeS = median(node)
  const cliS = median(cli)
  report('cli-start', {
    runs: RUNS,
    node_start_s: Number(nodeS.toFixed(3)),
    cli_sphere_s: Number(cliS.toFixed(3)),
    cli_over_node: Number((cliS / nodeS).toFixed(2)),
    goal_cli_over_node: '<= 3',
    worker_start_s: Number(median(starts).toFixed(3)),
    goal_worker_start_s: '<= 0.2',
    load_average_1min: Number((await import('node:os')).loadavg()[0].toFixed(2)),
    ...envLeftOut()
  })
}
