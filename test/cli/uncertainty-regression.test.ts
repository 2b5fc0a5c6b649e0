// motebench uncertainty: seeded runs compared with what the command wrote before its draws were made faster (the
// worker started early, the last blocks smaller, and the per-draw work of src-core/optics and src-core/climate
// reorganised without changing its arithmetic). A regression check that every draw's figures are the same to the
// bit, not a physics check (the physics is tested in test/uncertainty/ and test/optics/).
//
// Both fixtures were made by the code before the change (main at 3dedc60) on the study test/cli/shard-runs.ts writes
// (the demo with the bench's four uncertain inputs on "Winter wood smoke"):
//   fixtures/uncertainty-regression.expected.json: uncertainty STUDY --sample 'Winter wood smoke' --draws 300
//     --seed 11 --precision 0 --workers 1 --json
//   fixtures/uncertainty-regression.draws.csv: the draws file of --draws 150 --seed 4 --precision 0 --workers 0
//     --save-draws FILE without its first line (the title names the run's fingerprint): every draw's variates
//     and figures in shortest round-trip precision.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { repo, run } from './helpers.ts'
import { uncertainStudyFolder } from './shard-runs.ts'

const folder = uncertainStudyFolder('motebench-uncertainty-regression-')

const fixture = (name: string) => readFile(join(repo, 'test/cli/fixtures', name), 'utf8')

describe('motebench uncertainty: same draws as before the draws were made faster', () => {
  it('the JSON report of 300 draws (two threads) is the recorded one byte for byte', { timeout: 120_000 }, async () => {
    const r = await run(['uncertainty', folder.study, '--sample', 'Winter wood smoke', '--draws', '300', '--seed', '11', '--precision', '0', '--workers', '1', '--json'])
    expect(r.code, r.stderr).toBe(0)
    expect(r.stdout).toBe(await fixture('uncertainty-regression.expected.json'))
  })

  it("every draw's variates and figures (150 draws, full precision) are the recorded ones", { timeout: 120_000 }, async () => {
    const out = join(folder.dir, 'draws.csv')
    const r = await run(['uncertainty', folder.study, '--sample', 'Winter wood smoke', '--draws', '150', '--seed', '4', '--precision', '0', '--workers', '0', '--save-draws', out])
    expect(r.code, r.stderr).toBe(0)
    const lines = (await readFile(out, 'utf8')).split('\n')
    expect(lines.slice(1).join('\n')).toBe(await fixture('uncertainty-regression.draws.csv'))
  })
})
