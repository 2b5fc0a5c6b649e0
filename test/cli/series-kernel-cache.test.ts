// motebench series with its bins' kernels kept on disk between runs (src-main/cli/kernel-cache.ts): the built CLI in
// a child process, with its own cache folder. The second run reads what the first kept and writes the same CSV byte
// for byte; a damaged file, another input or the cache turned off integrate the kernels again, and the summary
// says which happened.
import { execFile } from 'node:child_process'
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { repo, type Ran } from './helpers.ts'

const input = join(repo, 'test/cli/fixtures/series-regression.csv')
const demo = join(repo, 'resources/demo.mote')

let dir: string
let cache: string
/** The CSV series-regression.test.ts recorded for this file and these options. */
let recorded: string

function series(extra: string[], env: Record<string, string>): Promise<Ran> {
  const args = [join(repo, 'bin/motebench.mjs'), 'series', input, '--study', demo, '--sample', 'Winter wood smoke', '--wavelengths', '450,550,700', ...extra]
  return new Promise((resolve) => {
    execFile(process.execPath, args, { env: { ...process.env, ...env }, timeout: 120_000, maxBuffer: 64 << 20 }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr })
    })
  })
}

const kept = async () => (await readdir(cache)).filter((f) => f.endsWith('.bin'))

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-kernel-cache-'))
  cache = join(dir, 'cache')
  recorded = await readFile(join(repo, 'test/cli/fixtures/series-regression.expected.csv'), 'utf8')
})

afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

describe('series: bin kernels kept between runs', () => {
  it('the first run integrates and keeps them, the second reads them, and both write the same CSV', async () => {
    const first = await series([], { MOTEBENCH_CACHE_DIR: cache })
    expect(first.stderr).toMatch(/bin kernels: integrated, and kept in .*\.bin for later runs with the same inputs/)
    expect(await kept()).toHaveLength(1)
    const second = await series([], { MOTEBENCH_CACHE_DIR: cache })
    expect(second.stderr).toMatch(/bin kernels: read from .*\.bin \(kept by an earlier run/)
    expect(second.stdout).toBe(first.stdout)
    expect(second.code).toBe(first.code)
    // the recorded output (series-regression.test.ts) is what the cached run writes too
    expect(second.stdout).toBe(recorded)
    // with two workers each reads the same file
    const two = await series(['--workers', '2'], { MOTEBENCH_CACHE_DIR: cache })
    expect(two.stderr).toMatch(/bin kernels: read from/)
    expect(two.stdout).toBe(first.stdout)
  })

  it('a damaged file is integrated again, said so and replaced; the output is unchanged', async () => {
    const [name] = await kept()
    const file = join(cache, name)
    const bytes = await readFile(file)
    // one payload byte changed (the last): the checksum no longer fits
    bytes[bytes.length - 1] ^= 0x40
    await writeFile(file, bytes)
    const r = await series([], { MOTEBENCH_CACHE_DIR: cache })
    expect(r.stderr).toMatch(/bin kernels: integrated, and kept in/)
    expect(r.stderr).toMatch(/was damaged and is made again/)
    expect(r.stdout).toBe(recorded)
    // a truncated file too
    await writeFile(file, (await readFile(file)).subarray(0, 100))
    const t = await series([], { MOTEBENCH_CACHE_DIR: cache })
    expect(t.stderr).toMatch(/was damaged and is made again/)
    expect(t.stdout).toBe(r.stdout)
    const again = await series([], { MOTEBENCH_CACHE_DIR: cache })
    expect(again.stderr).toMatch(/bin kernels: read from/)
  })

  it('other inputs (tolerance, wavelengths) keep files of their own; MOTEBENCH_CACHE_DIR=off keeps nothing', async () => {
    const before = (await kept()).length
    const looser = await series(['--tolerance', '1e-3'], { MOTEBENCH_CACHE_DIR: cache })
    expect(looser.stderr).toMatch(/bin kernels: integrated, and kept in/)
    const fewer = await series(['--wavelengths', '550'], { MOTEBENCH_CACHE_DIR: cache })
    expect(fewer.stderr).toMatch(/bin kernels: integrated, and kept in/)
    expect(await kept()).toHaveLength(before + 2)
    const off = await series([], { MOTEBENCH_CACHE_DIR: 'off' })
    expect(off.stderr).toMatch(/bin kernels: integrated \(not kept: MOTEBENCH_CACHE_DIR is off\)/)
    expect(off.stdout).toBe(recorded)
    expect(await kept()).toHaveLength(before + 2)
  })

  it('with measured instruments, their kernels (truncation and backscattering included) are kept and read too: the same CSV', { timeout: 60_000 }, async () => {
    const field = (f: string) => join(repo, 'resources/field', f)
    const args = (cacheDir: string, ...more: string[]) =>
      new Promise<Ran>((resolve) => {
        const argv = [join(repo, 'bin/motebench.mjs'), 'series', field('campaign-mobility.csv'), '--study', demo, '--sample', 'Winter wood smoke', '--wavelengths', '550', '--scattering', field('campaign-nephelometer.csv'), '--absorption', field('campaign-absorption.csv'), ...more]
        execFile(process.execPath, argv, { env: { ...process.env, MOTEBENCH_CACHE_DIR: cacheDir }, timeout: 120_000, maxBuffer: 64 << 20 }, (err, stdout, stderr) => resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr }))
      })
    const off = await args('off', '--truncation')
    expect(off.stderr).toMatch(/instrument kernels: integrated \(not kept/)
    const first = await args(cache, '--truncation')
    expect(first.stderr).toMatch(/instrument kernels: integrated, and kept in .*\.bin/)
    const second = await args(cache, '--truncation')
    expect(second.stderr).toMatch(/instrument kernels: read from .*\.bin/)
    expect(second.stdout).toMatch(/truncation_C_550nm/)
    expect(first.stdout).toBe(off.stdout)
    expect(second.stdout).toBe(off.stdout)
    // other angles of the nephelometer are other kernels: a file of their own
    const angles = await args(cache, '--truncation', '--neph-angles', '10:165')
    expect(angles.stderr).toMatch(/instrument kernels: integrated, and kept in/)
    expect(angles.stdout).not.toBe(off.stdout)
  })

  it('a folder it cannot write says so and the run goes on', async () => {
    // a file where the folder should be
    const blocked = join(dir, 'not-a-folder')
    await writeFile(blocked, 'x')
    const r = await series([], { MOTEBENCH_CACHE_DIR: join(blocked, 'cache') })
    expect(r.stderr).toMatch(/the kernels could not be kept in .*not-a-folder.*set MOTEBENCH_CACHE_DIR to a writable folder, or to off/)
    expect(r.stdout).toBe(recorded)
  })
})
