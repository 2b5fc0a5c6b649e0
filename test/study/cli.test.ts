// motebench check and motebench demo, run as a user would (through bin/motebench.mjs).
import { execFile } from 'node:child_process'
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'

const repo = fileURLToPath(new URL('../../', import.meta.url))
const bin = join(repo, 'bin/motebench.mjs')

function run(args: string[], cwd = repo): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, [bin, ...args], { cwd, timeout: 60_000 }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr })
    })
  })
}

let dir: string
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-cli-'))
})
afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

describe('motebench demo and check', () => {
  it('demo --out DIR writes the demo study; check accepts it (exit 0)', async () => {
    const demo = await run(['demo', '--out', dir])
    expect(demo.code).toBe(0)
    expect(demo.stdout).toMatch(/samples \(5\)/)
    expect(await readFile(join(dir, 'demo.mote'), 'utf8')).toBe(await readFile(join(repo, 'resources/demo.mote'), 'utf8'))
    const check = await run(['check', join(dir, 'demo.mote')])
    expect(check.code).toBe(0)
    expect(check.stdout).toMatch(/valid study/)
  })

  it('check lists every problem of a broken study with its path and fix (exit 2, --json too)', async () => {
    const d = JSON.parse(await readFile(join(repo, 'resources/demo.mote'), 'utf8'))
    d.samples[1].size.modes[0].gsd = 0.9
    d.site.surface = 'lava'
    const file = join(dir, 'broken.mote')
    await writeFile(file, JSON.stringify(d, null, 2))
    const text = await run(['check', file])
    expect(text.code).toBe(2)
    expect(text.stdout).toContain('2 problems')
    expect(text.stdout).toContain('samples[1].size.modes[0].gsd')
    expect(text.stdout).toContain('site.surface')
    expect(text.stdout).toMatch(/fix: .*1\.05 or more/)
    const json = await run(['check', file, '--json'])
    expect(json.code).toBe(2)
    const out = JSON.parse(json.stdout)
    expect(out.ok).toBe(false)
    expect(out.problems.map((p: { path: string }) => p.path).sort()).toEqual(['samples[1].size.modes[0].gsd', 'site.surface'])
  })

  it('check reads sizer files: the example passes, the broken one lists lines and columns (exit 2)', async () => {
    const good = await run(['check', 'resources/sizer-series-semicolon.csv', '--json'])
    expect(good.code).toBe(0)
    expect(JSON.parse(good.stdout)).toMatchObject({ ok: true, layout: 'time-rows', records: 12, bins: 30, rejected_count: 0 })
    const bad = await run(['check', 'test/study/fixtures/broken-sizer.csv'])
    expect(bad.code).toBe(2)
    expect(bad.stdout).toContain('line 6 column 3')
    expect(bad.stdout).toContain('line 9 column 5')
    const stop = await run(['check', 'test/study/fixtures/broken-sizer.csv', '--stop'])
    expect(stop.code).toBe(2)
    expect(stop.stderr).toMatch(/broken-sizer\.csv line 6 column 3/)
    expect(stop.stderr).not.toMatch(/at .*\.ts:\d+/) // no stack trace
  })
})
