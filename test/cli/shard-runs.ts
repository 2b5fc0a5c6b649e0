// Shared by the shard tests: the three commands' arguments on small inputs, a study with uncertain inputs, and
// running a command whole and in N shards put together by `motebench join`.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll } from 'vitest'
import { demoStudy } from '../../src-core/index.ts'
import { UNCERTAINTY_DEMO_INPUTS } from '../bench/uncertainty.bench.ts'
import { repo, run } from './helpers.ts'

export const SERIES = (file = join(repo, 'resources/sizer-series-semicolon.csv')) => [
  'series', file, '--study', join(repo, 'resources/demo.mote'), '--sample', 'Coastal haze day', '--wavelengths', '450,550,700nm', '--workers', '1'
]
export const MERGE = [
  'merge', '--mobility', join(repo, 'resources/field/valley-mobility.csv'), '--aerodynamic', join(repo, 'resources/field/valley-aerodynamic.csv'), '--density', '1.8', '--shape-factor', '1'
]
export const uncertaintyArgs = (study: string) => ['uncertainty', study, '--sample', 'Winter wood smoke', '--draws', '12', '--seed', '3', '--precision', '0', '--workers', '0']

/** The demo study with the bench's uncertain inputs on its first sample ("Winter wood smoke"), written to DIR. */
export async function uncertainStudy(dir: string): Promise<string> {
  const study = demoStudy() as ReturnType<typeof demoStudy> & { uncertainty?: unknown }
  study.uncertainty = { samples: { [study.samples[0].name]: { inputs: UNCERTAINTY_DEMO_INPUTS } } }
  const path = join(dir, 'uncertain.mote')
  await writeFile(path, JSON.stringify(study))
  return path
}

/**
 * For a test file: a temporary folder holding uncertainStudy's study, made before its tests and removed after them.
 * The returned object's `dir` and `study` are set once the tests run.
 */
export function uncertainStudyFolder(prefix: string): { dir: string; study: string } {
  const here = { dir: '', study: '' }
  beforeAll(async () => {
    here.dir = await mkdtemp(join(tmpdir(), prefix))
    here.study = await uncertainStudy(here.dir)
  })
  afterAll(() => rm(here.dir, { recursive: true, force: true }))
  return here
}

/** The output file of the whole run (`--out` or `--save-draws`), and its exit code. */
export async function wholeRun(args: string[], out: string, outFlag = '--out'): Promise<{ text: string; code: number; stderr: string }> {
  const r = await run([...args, outFlag, out])
  return { text: await readFile(out, 'utf8').catch(() => ''), code: r.code, stderr: r.stderr }
}

/** Runs shards 1..N (each to DIR/PREFIX-K.csv), joins them (DIR/PREFIX.csv); the joined text and the exit codes. */
export async function shardedRun(args: string[], dir: string, prefix: string, n: number): Promise<{ text: string; codes: number[]; join: string; parts: string[] }> {
  const parts = Array.from({ length: n }, (_, i) => join(dir, `${prefix}-${i + 1}.csv`))
  // the shards at once, as an array job would run them
  const ran = await Promise.all(parts.map((part, i) => run([...args, '--shard', `${i + 1}/${n}`, '--out', part])))
  ran.forEach((r, i) => {
    if (r.code > 1) throw new Error(`shard ${i + 1}/${n} failed: ${r.stderr}`)
  })
  const codes = ran.map((r) => r.code)
  const joined = join(dir, `${prefix}.csv`)
  const j = await run(['join', ...parts.slice().reverse(), '--out', joined])
  if (j.code !== 0) throw new Error(`join failed: ${j.stderr}`)
  return { text: await readFile(joined, 'utf8'), codes, join: j.stderr, parts }
}
