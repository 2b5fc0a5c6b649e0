// The Slurm array job of resources/batch/series-array.sh on a real single-node Slurm cluster started by
// test/batch/slurm-cluster.sh (Debian's slurm-wlm and munge; a munge key made here, a minimal slurm.conf, no
// cgroups). The array's three parts, put together by `motebench join`, must equal the single run byte for byte; so
// must the draws of resources/batch/uncertainty-array.sh's three parts, and the report made from them, and the
// merged file of resources/batch/merge-array.sh's.
// Needs root and the packages (.ci/run installs them); like the e2e tests with Chromium, it fails when they are
// missing rather than skipping. The cluster's daemons and files go away in afterAll, even when the test fails.
import { execFile } from 'node:child_process'
import { existsSync } from 'node:fs'
import { mkdir, mkdtemp, readdir, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, expect, it } from 'vitest'
import { repo, run } from '../cli/helpers.ts'
import { uncertainStudy } from '../cli/shard-runs.ts'

const cluster = join(repo, 'test/batch/slurm-cluster.sh')
const TOOLS = ['/usr/sbin/slurmctld', '/usr/sbin/slurmd', '/usr/bin/sbatch', '/usr/sbin/munged']

function sh(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env, timeout = 60_000): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(cmd, args, { env, timeout }, (err, stdout, stderr) => resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr }))
  })
}

let dir = ''
let started = false
/** Why the cluster is not there: the test fails with it (a failed test, not a skipped one). */
let setupError: Error | undefined

beforeAll(async () => {
  try {
    await startCluster()
  } catch (e) {
    setupError = e as Error
  }
}, 60_000)

async function startCluster(): Promise<void> {
  const missing = TOOLS.filter((t) => !existsSync(t))
  if (missing.length > 0) throw new Error(`Slurm is not installed (missing ${missing.join(', ')}): apt-get install -y slurm-wlm munge (.ci/run does it)`)
  if (process.getuid?.() !== 0) throw new Error('the Slurm test runs as root (slurmd starts the jobs as their user)')
  dir = await mkdtemp(join(tmpdir(), 'motebench-slurm-'))
  started = true // stop even a half-started cluster
  const r = await sh('bash', [cluster, 'start', join(dir, 'cluster')], process.env, 40_000)
  if (r.code !== 0) throw new Error(`the Slurm cluster did not start:\n${r.stderr}`)
}

afterAll(async () => {
  if (started) await sh('bash', [cluster, 'stop', join(dir, 'cluster')])
  if (dir) await rm(dir, { recursive: true, force: true })
}, 30_000)

/**
 * Runs resources/batch/SCRIPT as a three-task array job (`sbatch --wait`) with `vars` in its environment, its parts
 * written to a folder of their own, and joins them; the joined file's path.
 */
async function arrayJob(script: string, vars: Record<string, string>, extra: string[] = []): Promise<string> {
  const name = script.replace(/\.sh$/, '')
  const parts = join(dir, name)
  await mkdir(parts)
  const env = { ...process.env, ...vars, SLURM_CONF: join(dir, 'cluster/slurm.conf'), OUTDIR: parts, MOTEBENCH: `${process.execPath} ${join(repo, 'bin/motebench.mjs')}` }
  const job = await sh('sbatch', ['--wait', '--array=1-3', ...extra, `--chdir=${dir}`, `--output=${join(dir, `${name}-%a.log`)}`, join(repo, 'resources/batch', script)], env, 80_000)
  const logs = (await readdir(dir)).filter((f) => f.startsWith(`${name}-`) && f.endsWith('.log'))
  const logText = (await Promise.all(logs.map((f) => readFile(join(dir, f), 'utf8')))).join('\n')
  expect(job.code, `sbatch: ${job.stdout}${job.stderr}\n${logText}`).toBe(0)
  expect(job.stdout).toMatch(/Submitted batch job \d+/)
  const files = (await readdir(parts)).sort()
  expect(files).toEqual(['part-00001-of-00003.csv', 'part-00002-of-00003.csv', 'part-00003-of-00003.csv'])
  const joined = join(dir, `${name}-joined.csv`)
  const j = await run(['join', ...files.map((f) => join(parts, f)), '--out', joined])
  expect(j.code, j.stderr).toBe(0)
  return joined
}

it('a Slurm array job of three series shards (with measured instruments), joined, equals the single run byte for byte', { timeout: 90_000 }, async () => {
  if (setupError) throw setupError
  const sizer = join(repo, 'resources/field/campaign-mobility.csv')
  const scattering = join(repo, 'resources/field/campaign-nephelometer.csv')
  const absorption = join(repo, 'resources/field/campaign-absorption.csv')
  const study = join(repo, 'resources/demo.mote')
  const sample = 'Winter wood smoke'
  // one processor a task, so two tasks run at once on the two-processor node
  const joined = await arrayJob('series-array.sh', { SIZER: sizer, STUDY: study, SAMPLE: sample, WAVELENGTHS: '450,550,700nm', SCATTERING: scattering, ABSORPTION: absorption, TRUNCATION: '1' }, ['--cpus-per-task=1'])
  const single = join(dir, 'single.csv')
  const s = await run(['series', sizer, '--study', study, '--sample', sample, '--wavelengths', '450,550,700nm', '--scattering', scattering, '--absorption', absorption, '--truncation', '--out', single])
  expect(s.code, s.stderr).toBe(1) // rows left out (bad cells in the sizer file, a bad row in each instrument file)
  const [a, b] = await Promise.all([readFile(joined, 'utf8'), readFile(single, 'utf8')])
  expect(a.split('\n').filter((l) => /^\d{4}-/.test(l)).length).toBe(838) // the rows the single run writes
  expect(a).toMatch(/^# truncation: measured scattering multiplied/m)
  expect(a).toBe(b)
})

it('a Slurm array job of three uncertainty shards: the joined draws are the single run\'s, and so is the report from them', { timeout: 90_000 }, async () => {
  if (setupError) throw setupError
  const study = await uncertainStudy(dir)
  const sample = 'Winter wood smoke'
  const joined = await arrayJob('uncertainty-array.sh', { STUDY: study, SAMPLE: sample, DRAWS: '12', SEED: '3' }, ['--cpus-per-task=1'])
  // the single run: its draws file, and its report
  const args = ['uncertainty', study, '--sample', sample, '--draws', '12', '--seed', '3', '--precision', '0', '--json']
  const single = join(dir, 'draws-single.csv')
  const whole = await run([...args, '--save-draws', single])
  expect(whole.code, whole.stderr).toBe(0)
  const [a, b] = await Promise.all([readFile(joined, 'utf8'), readFile(single, 'utf8')])
  expect(a.trimEnd().split('\n').length).toBe(2 + 12) // title, columns, 12 draws
  expect(a).toBe(b)
  const report = await run([...args, '--from-draws', joined])
  expect(report.code, report.stderr).toBe(0)
  expect(report.stdout).toBe(whole.stdout)
})

it('a Slurm array job of three merge shards, joined, equals the single run byte for byte', { timeout: 90_000 }, async () => {
  if (setupError) throw setupError
  const mobility = join(repo, 'resources/field/valley-mobility.csv')
  const aerodynamic = join(repo, 'resources/field/valley-aerodynamic.csv')
  const joined = await arrayJob('merge-array.sh', { MOBILITY: mobility, AERODYNAMIC: aerodynamic, DENSITY: '1.8', MERGE_OPTIONS: '--shape-factor 1.1 --every 30min' })
  const single = join(dir, 'merged-single.csv')
  const s = await run(['merge', '--mobility', mobility, '--aerodynamic', aerodynamic, '--density', '1.8', '--shape-factor', '1.1', '--every', '30min', '--out', single])
  expect(s.code, s.stderr).toBeLessThanOrEqual(1)
  const [a, b] = await Promise.all([readFile(joined, 'utf8'), readFile(single, 'utf8')])
  expect(a.split('\n').filter((l) => /^\d{4}-/.test(l)).length).toBeGreaterThan(10)
  expect(a).toBe(b)
})
