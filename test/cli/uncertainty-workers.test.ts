// `motebench uncertainty` over worker threads (the built CLI in child processes): a seeded run's report is the same
// byte for byte whatever --workers (draw i's random numbers come from the seed and i alone, so how the draws are
// split into blocks and shared among the threads cannot change them), with and without the early stop; the workers
// main.ts starts before the command loads (workers/early.ts) do not keep a failed or a small run from ending.
import { describe, expect, it } from 'vitest'
import { drawBlocks } from '../../src-main/cli/uncertainty.ts'
import { expectOneLine, run } from './helpers.ts'
import { uncertainStudyFolder } from './shard-runs.ts'

const folder = uncertainStudyFolder('motebench-uncertainty-workers-')

const args = (...more: string[]) => ['uncertainty', folder.study, '--sample', 'Winter wood smoke', ...more]

describe('drawBlocks', () => {
  it('covers the draws once, in order, in blocks of 25 that shrink towards the end (at least 4)', () => {
    for (const [from, to, threads] of [[0, 1000, 2], [0, 1, 2], [0, 7, 3], [300, 1000, 8], [0, 250, 1]]) {
      const blocks = drawBlocks(from, to, threads)
      let next = from
      for (const [a, b] of blocks) {
        expect(a).toBe(next)
        expect(b - a).toBeGreaterThan(0)
        expect(b - a).toBeLessThanOrEqual(25)
        if (b < to) expect(b - a).toBeGreaterThanOrEqual(4)
        next = b
      }
      expect(next).toBe(to)
      for (let i = 1; i < blocks.length; i++) expect(blocks[i][1] - blocks[i][0]).toBeLessThanOrEqual(blocks[i - 1][1] - blocks[i - 1][0])
    }
  })
})

describe('uncertainty over worker threads', () => {
  it('gives the same report byte for byte with 0, 1 and 2 workers (seeded, no early stop, and with it)', { timeout: 120_000 }, async () => {
    for (const more of [['--draws', '120', '--seed', '5', '--precision', '0', '--json'], ['--draws', '400', '--seed', '2', '--precision', '0.05', '--min-draws', '60']]) {
      const outs = []
      for (const workers of ['0', '1', '2']) {
        const r = await run(args(...more, '--workers', workers))
        expect(r.code, r.stderr).toBe(0)
        outs.push(r.stdout)
      }
      expect(outs[0].length).toBeGreaterThan(100)
      expect(outs[1]).toBe(outs[0])
      expect(outs[2]).toBe(outs[0])
    }
  })

  it('ends at once with its message when the run fails after the workers were started early, or needs no worker', { timeout: 60_000 }, async () => {
    const bad = await run(args('--draws', '100', '--seed', '-1', '--workers', '2'))
    expect(bad.code).toBe(2)
    expectOneLine(bad.stderr)
    expect(bad.stderr).toMatch(/--seed/)
    const noSample = await run(['uncertainty', folder.study, '--sample', 'No such sample', '--workers', '2'])
    expect(noSample.code).toBe(2)
    expect(noSample.stderr).toMatch(/no sample "No such sample"/)
    const one = await run(args('--draws', '1', '--workers', '2', '--json'))
    expect(one.code, one.stderr).toBe(0)
    expect(JSON.parse(one.stdout).draws).toBe(1)
  })
})
