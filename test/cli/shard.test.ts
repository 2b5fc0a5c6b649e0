// --shard K/N of series, merge and uncertainty, put together by `motebench join`: for N = 1, 2, 3 the joined file
// is the single run's file byte for byte (the summaries on standard error may differ); join refuses a missing or
// repeated shard and shards of different runs. The real CLI in child processes, on the small example files.
import { createReadStream } from 'node:fs'
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { fileLines } from '../../src-main/cli/file-lines.ts'
import { lineIndex, shardRange } from '../../src-main/cli/shard.ts'
import { expectOneLine, repo, run } from './helpers.ts'
import { MERGE, SERIES, shardedRun, uncertainStudy, uncertaintyArgs, wholeRun } from './shard-runs.ts'

let dir: string
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-shard-'))
})
afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

describe('shardRange', () => {
  it('splits 0..total into N contiguous parts in order, covering each item once, sizes differing by at most one', () => {
    for (const total of [0, 1, 2, 7, 12, 100, 1001]) {
      for (const n of [1, 2, 3, 5, 8]) {
        let next = 0
        const sizes: number[] = []
        for (let k = 1; k <= n; k++) {
          const [a, b] = shardRange(total, { k, n })
          expect(a).toBe(next)
          sizes.push(b - a)
          next = b
        }
        expect(next).toBe(total)
        expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1)
      }
    }
  })
})

describe('lineIndex', () => {
  it('counts the lines series reads (fileLines: \\n, \\r\\n or a lone \\r; a last line without a break)', async () => {
    const cases = ['a\nb\n', 'a\nb', 'a\r\nb\r\n', 'a\rb\rc', 'a\r', '', '\n\n', 'x\r\n\r\ny', 'a\n\rb']
    for (const [i, text] of cases.entries()) {
      const path = join(dir, `lines-${i}.txt`)
      await writeFile(path, text)
      let n = 0
      for await (const batch of fileLines(createReadStream(path, { encoding: 'utf8', highWaterMark: 2 }))) n += batch.length
      expect((await lineIndex(path)).total, JSON.stringify(text)).toBe(n)
    }
  })

  it('finds where each line starts (\\n, \\r\\n, a lone \\r), also far beyond the lines it keeps', async () => {
    const breaks = ['\n', '\r\n', '\r', '\n', '\n\r']
    const parts: string[] = []
    for (let i = 0; i < 10_000; i++) parts.push(`row ${i}`, i % 997 === 0 ? breaks[(i / 997) % breaks.length] : i > 6000 && i % 3 === 0 ? '\r\n' : '\n')
    const text = parts.join('') + 'last'
    const path = join(dir, 'index.txt')
    await writeFile(path, text)
    // the reference: where node:readline's lines start, found a character at a time
    const starts = [0]
    for (let i = 0; i < text.length; i++) {
      if (text[i] === '\n') starts.push(i + 1)
      else if (text[i] === '\r') starts.push(text[i + 1] === '\n' ? ++i + 1 : i + 1)
    }
    const index = await lineIndex(path)
    expect(index.total).toBe(starts.length)
    const lines = [1, 2, 3, 997, 998, 4095, 4096, 4097, 4098, 6001, 8192, 8193, 8194, 9000, starts.length - 1, starts.length]
    for (const line of lines) expect(await index.offsetOf(line), `line ${line}`).toBe(starts[line - 1])
  })
})

describe('shards joined equal the single run, byte for byte', () => {
  it('series, on the example sizer series', { timeout: 120_000 }, async () => {
    const whole = await wholeRun(SERIES(), join(dir, 'series-whole.csv'))
    expect(whole.code).toBe(0)
    expect(whole.text.trimEnd().split('\n').length).toBe(13) // the column line and the file's 12 rows
    for (const n of [1, 2, 3]) expect((await shardedRun(SERIES(), dir, `series-${n}`, n)).text).toBe(whole.text)
  })

  it('series, on a file with bad rows (left out in the shard that holds them, exit status 1 there)', { timeout: 120_000 }, async () => {
    const file = join(dir, 'bad-rows.csv')
    const lines = ['units: nm', 'quantity: dN/dlogDp', 'time;20,0;40,0;80,0;160,0']
    for (let i = 1; i <= 9; i++) lines.push(i === 5 ? `t${i};1300,0;;2200,0;410,0` : `t${i};${1000 * i},0;3000,0;2000,0;400,0`)
    await writeFile(file, lines.join('\n') + '\n')
    const whole = await wholeRun(SERIES(file), join(dir, 'bad-whole.csv'))
    expect(whole.code).toBe(1)
    const three = await shardedRun(SERIES(file), dir, 'bad-3', 3)
    expect(three.text).toBe(whole.text)
    expect(three.codes.filter((c) => c === 1).length).toBe(1) // only the shard holding line 8
  })

  it('series with measured instruments (scattering corrected for truncation, absorption), on the invented campaign', { timeout: 120_000 }, async () => {
    const field = (f: string) => join(repo, 'resources/field', f)
    const args = (...more: string[]) => ['series', field('campaign-mobility.csv'), '--study', join(repo, 'resources/demo.mote'), '--sample', 'Winter wood smoke', '--wavelengths', '550nm', '--workers', '1', '--scattering', field('campaign-nephelometer.csv'), '--absorption', field('campaign-absorption.csv'), ...more]
    const whole = await wholeRun(args('--truncation'), join(dir, 'optical-whole.csv'))
    expect(whole.code).toBe(1) // rows left out: bad cells in the sizer file, a bad row in each instrument file
    const lines = whole.text.trimEnd().split('\n')
    expect(lines.filter((l) => l.startsWith('# ')).length).toBeGreaterThanOrEqual(3) // the notes of the comparison
    expect(lines[lines.findIndex((l) => l.startsWith('time,'))]).toMatch(/sca_ratio_550nm.*abs_ratio_520nm/)
    for (const n of [2, 3]) expect((await shardedRun(args('--truncation'), dir, `optical-${n}`, n)).text).toBe(whole.text)
    // without the truncation correction it is another run (other cells, other notes): its shards do not join these
    const other = await shardedRun(args(), dir, 'optical-other', 3)
    const mixed = await run(['join', join(dir, 'optical-3-1.csv'), other.parts[1], join(dir, 'optical-3-3.csv'), '--out', join(dir, 'optical-mixed.csv')])
    expect(mixed.code).toBe(2)
    expect(mixed.stderr).toMatch(/is not of the same run/)
    // nor does a part made with a nephelometer file changed in one cell (the same head, another fingerprint)
    const neph = (await readFile(field('campaign-nephelometer.csv'), 'utf8')).split('\n')
    const row = neph.findIndex((l) => /^2026-07-15T12:01/.test(l))
    neph[row] = neph[row].replace(/,([0-9.]+)/, (_, v: string) => `,${(Number(v) * 1.01).toFixed(2)}`)
    const changed = join(dir, 'campaign-nephelometer.csv')
    await writeFile(changed, neph.join('\n'))
    const part = join(dir, 'optical-changed-2.csv')
    const r = await run([...args('--truncation').map((a) => (a === field('campaign-nephelometer.csv') ? changed : a)), '--shard', '2/3', '--out', part])
    expect(r.code).toBeLessThanOrEqual(1)
    const refused = await run(['join', join(dir, 'optical-3-1.csv'), part, join(dir, 'optical-3-3.csv'), '--out', join(dir, 'optical-mixed.csv')])
    expect(refused.code).toBe(2)
    expect(refused.stderr).toMatch(/is not of the same run/)
  })

  it('series on a file longer than a read, whose later parts skip the lines before theirs (\\n and \\r\\n, bad rows)', { timeout: 120_000 }, async () => {
    const bins = Array.from({ length: 60 }, (_, i) => (10 * Math.pow(100, i / 59)).toPrecision(4))
    const lines = ['units: nm', 'quantity: dN/dlogDp', ['time', ...bins].join(',')]
    for (let i = 0; i < 3000; i++) {
      const t = new Date(Date.UTC(2026, 6, 1) + i * 300_000).toISOString().replace('.000Z', 'Z')
      const row = bins.map((d) => (3000 * Math.exp(-0.5 * (Math.log(Number(d) / (80 + (i % 40))) / 0.5) ** 2)).toPrecision(5))
      if (i === 700 || i === 2300) row[7] = 'n/a'
      lines.push([t, ...row].join(','))
    }
    for (const [name, brk] of [['long-lf', '\n'], ['long-crlf', '\r\n']]) {
      const file = join(dir, `${name}.csv`)
      await writeFile(file, lines.join(brk) + brk)
      const whole = await wholeRun(SERIES(file), join(dir, `${name}-whole.csv`))
      expect(whole.code).toBe(1)
      const three = await shardedRun(SERIES(file), dir, `${name}-3`, 3)
      expect(three.text).toBe(whole.text)
      expect(three.codes).toEqual([1, 0, 1]) // each bad row (lines 704 and 2304) in the part that holds it
      const third = await run([...SERIES(file), '--shard', '3/3', '--out', join(dir, `${name}-third.csv`)])
      expect(third.stderr).toMatch(/shard 3\/3: lines 2003–3003 of 3003; lines \d+–2002 skipped unread/)
      expect(third.stderr).toMatch(/line 2304 column 9: "n\/a"/) // the lines after the skip keep their numbers
    }
  })

  it('merge, on the demo field files', { timeout: 120_000 }, async () => {
    const whole = await wholeRun(MERGE, join(dir, 'merge-whole.csv'))
    expect(whole.code).toBe(0)
    for (const n of [1, 2, 3]) expect((await shardedRun(MERGE, dir, `merge-${n}`, n)).text).toBe(whole.text)
  })

  it('uncertainty: the shards draw the same seeded draws, and the report from the joined draws is the single run\'s', { timeout: 120_000 }, async () => {
    const study = await uncertainStudy(dir)
    const args = uncertaintyArgs(study)
    const whole = await wholeRun([...args, '--json'], join(dir, 'draws-whole.csv'), '--save-draws')
    expect(whole.code).toBe(0)
    expect(whole.text.trimEnd().split('\n').length).toBe(2 + 12) // title, columns, 12 draws
    let joined = ''
    for (const n of [1, 2, 3]) {
      joined = (await shardedRun(args, dir, `draws-${n}`, n)).text
      expect(joined).toBe(whole.text)
    }
    const single = await run([...args, '--json'])
    const fromDraws = await run([...args, '--json', '--from-draws', join(dir, 'draws-3.csv')])
    expect(fromDraws.code).toBe(0)
    expect(fromDraws.stdout).toBe(single.stdout)
    const otherSeed = await run([...args.map((a) => (a === '3' ? '4' : a)), '--from-draws', join(dir, 'draws-3.csv')])
    expect(otherSeed.code).toBe(2)
    expect(otherSeed.stderr).toMatch(/the draws are not of this run/)
  })
})

describe('join refuses what is not one whole run', () => {
  it('a missing shard, a repeated one, shards of different runs, a file that is no shard; and --shard with the early stop', { timeout: 120_000 }, async () => {
    const a = await shardedRun(MERGE, dir, 'refuse-a', 3)
    const b = await shardedRun([...MERGE, '--every', '30min'], dir, 'refuse-b', 3)
    const out = join(dir, 'refused.csv')

    const missing = await run(['join', a.parts[0], a.parts[2], '--out', out])
    expect(missing.code).toBe(2)
    expectOneLine(missing.stderr)
    expect(missing.stderr).toMatch(/shard 2\/3 .* is missing/)

    const twice = await run(['join', ...a.parts, a.parts[1], '--out', out])
    expect(twice.code).toBe(2)
    expect(twice.stderr).toMatch(/shard 2\/3 is given twice/)

    const mixed = await run(['join', a.parts[0], b.parts[1], a.parts[2], '--out', out])
    expect(mixed.code).toBe(2)
    expectOneLine(mixed.stderr)
    expect(mixed.stderr).toMatch(/is not of the same run/)

    const plain = await run(['join', join(dir, 'merge-whole.csv'), '--out', out])
    expect(plain.code).toBe(2)
    expect(plain.stderr).toMatch(/is not the output of a shard/)

    await expect(readFile(out, 'utf8')).rejects.toThrow() // nothing written by a refused join

    const study = await uncertainStudy(dir)
    const early = await run(['uncertainty', study, '--sample', 'Winter wood smoke', '--draws', '12', '--shard', '1/2'])
    expect(early.code).toBe(2)
    expect(early.stderr).toMatch(/--shard needs --precision 0/)
  })
})
