// motebench uncertainty: seeded runs compared with what the command wrote before its draws were made faster (the
// worker started early, the last blocks smaller, and the per-draw work of src-core/optics and src-core/climate
// reorganised without changing its arithmetic), and before the size integration changed (2026-12: a coarse mode's
// tail cut at a tenth of the tolerance, panels settling a level sooner). A regression check, not a physics check
// (the physics is tested in test/uncertainty/ and test/optics/): the drawn variates, and so every count, ranking
// and P(warm), are the recorded ones to the bit; each draw's figures, integrated to the draws' tolerance
// (UNCERTAINTY_TOLERANCE, relative), stay within that tolerance of the recorded ones (relative for the optics; for
// the forcings, which pass through zero, of the largest |value| of that figure over the draws).
//
// Both fixtures were made by the code before those changes (main at 3dedc60) on the study test/cli/shard-runs.ts
// writes (the demo with the bench's four uncertain inputs on "Winter wood smoke"):
//   fixtures/uncertainty-regression.expected.json: uncertainty STUDY --sample 'Winter wood smoke' --draws 300
//     --seed 11 --precision 0 --workers 1 --json
//   fixtures/uncertainty-regression.draws.csv: the draws file of --draws 150 --seed 4 --precision 0 --workers 0
//     --save-draws FILE without its first line (the title names the run's fingerprint): every draw's variates
//     and figures in shortest round-trip precision.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { UNCERTAINTY_TOLERANCE } from '../../src-core/index.ts'
import { repo, run } from './helpers.ts'
import { uncertainStudyFolder } from './shard-runs.ts'

const folder = uncertainStudyFolder('motebench-uncertainty-regression-')

const fixture = (name: string) => readFile(join(repo, 'test/cli/fixtures', name), 'utf8')

/** Every place where `got` differs from `want` by more than tol·scale (strings, booleans and integers: at all). */
function differences(got: unknown, want: unknown, scale: number, at = ''): string[] {
  if (typeof want === 'number') {
    const ok = typeof got === 'number' && (Number.isInteger(want) ? got === want : Math.abs(got - want) <= UNCERTAINTY_TOLERANCE * scale)
    return ok ? [] : [`${at}: ${String(got)} against ${want}`]
  }
  if (want !== null && typeof want === 'object') {
    if (got === null || typeof got !== 'object') return [`${at}: ${JSON.stringify(got)} against an object`]
    const keys = new Set([...Object.keys(want), ...Object.keys(got)])
    return [...keys].flatMap((k) => differences((got as Record<string, unknown>)[k], (want as Record<string, unknown>)[k], scale, `${at}.${k}`))
  }
  return got === want ? [] : [`${at}: ${JSON.stringify(got)} against ${JSON.stringify(want)}`]
}

describe('motebench uncertainty: the same draws as before the draws were made faster and the integration changed', () => {
  it('the JSON report of 300 draws (two threads): the same variates, counts and ranking; figures within the draws\' tolerance', { timeout: 120_000 }, async () => {
    const r = await run(['uncertainty', folder.study, '--sample', 'Winter wood smoke', '--draws', '300', '--seed', '11', '--precision', '0', '--workers', '1', '--json'])
    expect(r.code, r.stderr).toBe(0)
    const got = JSON.parse(r.stdout)
    const want = JSON.parse(await fixture('uncertainty-regression.expected.json'))
    const { figures: gotFigures, sensitivity: gotSensitivity, ...gotRest } = got
    const { figures: wantFigures, sensitivity: wantSensitivity, ...wantRest } = want
    // the variates, P(warm) (from the count of warming draws), the notes: to the bit
    expect(gotRest).toEqual(wantRest)
    expect(gotFigures).toHaveLength(wantFigures.length)
    for (let i = 0; i < wantFigures.length; i++) {
      const f = wantFigures[i]
      expect(differences(gotFigures[i], f, Math.max(Math.abs(f.min), Math.abs(f.max)), f.key)).toEqual([])
    }
    // Spearman's ρ of the same ranks (a correlation: scale 1)
    expect(differences(gotSensitivity, wantSensitivity, 1, 'sensitivity')).toEqual([])
  })

  it("every draw's variates (to the bit) and figures (within the draws' tolerance): 150 draws, full precision", { timeout: 120_000 }, async () => {
    const out = join(folder.dir, 'draws.csv')
    const r = await run(['uncertainty', folder.study, '--sample', 'Winter wood smoke', '--draws', '150', '--seed', '4', '--precision', '0', '--workers', '0', '--save-draws', out])
    expect(r.code, r.stderr).toBe(0)
    const table = (text: string) => text.split('\n').filter((l) => l !== '').map((l) => l.split(','))
    const [head, ...got] = table((await readFile(out, 'utf8')).split('\n').slice(1).join('\n'))
    const [wantHead, ...want] = table(await fixture('uncertainty-regression.draws.csv'))
    expect(head).toEqual(wantHead)
    expect(got).toHaveLength(want.length)
    const firstFigure = head.indexOf('ext')
    const forcings = new Set(['forcing', 'forcing_daily_mean', 'forcing_two_stream_toa', 'longwave_toa', 'net_toa'])
    expect(firstFigure).toBeGreaterThan(1)
    for (let c = 0; c < head.length; c++) {
      const largest = Math.max(...want.map((row) => Math.abs(Number(row[c]))))
      for (let r = 0; r < want.length; r++) {
        const g = Number(got[r][c])
        const w = Number(want[r][c])
        const bound = c < firstFigure ? 0 : UNCERTAINTY_TOLERANCE * (forcings.has(head[c]) ? largest : Math.abs(w))
        if (!(Math.abs(g - w) <= bound)) expect.fail(`draw ${r + 1}, ${head[c]}: ${got[r][c]} against ${want[r][c]}`)
      }
    }
  })
})
