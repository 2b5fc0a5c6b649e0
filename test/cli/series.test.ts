// motebench series: the real CLI (node bin/motebench.mjs, worker threads) on the example time series and on a file
// with bad rows, and the same machinery called in this process (its workers must start under vitest too).
import { spawn } from 'node:child_process'
import { existsSync } from 'node:fs'
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoStudy } from '../../src-core/index.ts'
import { runSeries, runSeriesPipeline } from '../../src-main/cli/series.ts'
import { repo, runHere, type Ran } from './helpers.ts'

const example = join(repo, 'resources/sizer-series-semicolon.csv')
const demo = join(repo, 'resources/demo.mote')
const SAMPLE = 'Winter wood smoke'

// Bins at 20, 40, 80, 160 nm (midpoints; log-spaced, so each bin is log10(2) wide). t2 is t1 doubled; t3 and t4
// have bad cells (line 6 column 3, line 7 column 4); t5 is empty air.
const BAD_FILE = [
  'units: nm',
  'quantity: dN/dlogDp',
  'time;20,0;40,0;80,0;160,0',
  't1;1000,0;3000,0;2000,0;400,0',
  't2;2000,0;6000,0;4000,0;800,0',
  't3;1300,0;;2200,0;410,0',
  't4;1400,0;3600,0;n/a;420,0',
  't5;0;0;0;0',
  't6;1500,0;3700,0;2300,0;430,0'
].join('\n')

let dir: string
let bad: string
let good: Ran & { sawIncomplete: boolean }
let skip: Ran
let stop: Ran
let inProcess: { text: string; written: number }

/** Runs the CLI, and checks every 25 ms while it runs that the output file is absent or complete. */
function runWatchingOutput(args: string[], out: string, expectedLines: number): Promise<Ran & { sawIncomplete: boolean }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [join(repo, 'bin/motebench.mjs'), ...args], { cwd: repo })
    let stdout = ''
    let stderr = ''
    let sawIncomplete = false
    child.stdout.on('data', (d) => (stdout += d))
    child.stderr.on('data', (d) => (stderr += d))
    const timer = setInterval(async () => {
      if (!existsSync(out)) return
      const text = await readFile(out, 'utf8').catch(() => '')
      if (text.trimEnd().split('\n').length !== expectedLines) sawIncomplete = true
    }, 25)
    child.on('close', (code) => {
      clearInterval(timer)
      resolve({ code: code ?? 1, stdout, stderr, sawIncomplete })
    })
  })
}

/** The series machinery called directly (its worker threads must start under vitest too), one worker. */
async function pipelineHere(): Promise<{ text: string; written: number }> {
  const study = demoStudy()
  const sample = study.samples.find((s) => s.name === SAMPLE)!
  const lines = async function* () {
    for (const l of (await readFile(example, 'utf8')).split(/\r?\n/)) yield l
  }
  let text = ''
  const summary = await runSeriesPipeline({
    sample,
    userMaterials: [],
    wavelengthsNm: [450, 550, 700],
    tolerance: 1e-4,
    lines: lines(),
    fileName: 'sizer-series-semicolon.csv',
    onBadRow: 'stop',
    workers: 1,
    output: { write: async (t) => void (text += t) }
  })
  return { text, written: summary.rowsWritten }
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-series-'))
  bad = join(dir, 'bad rows.csv')
  await writeFile(bad, BAD_FILE + '\n')
  const common = ['--study', demo, '--sample', SAMPLE, '--wavelengths', '450,550,700nm']
  // The example through the real CLI (2 workers), while the rest runs in this process.
  const cli = runWatchingOutput(['series', example, ...common, '--out', join(dir, 'record.csv'), '--workers', '2'], join(dir, 'record.csv'), 13)
  const direct = pipelineHere()
  // runHere captures this process's standard output, so these two run one after the other
  skip = await runHere(runSeries, [bad, ...common, '--workers', '1'])
  stop = await runHere(runSeries, [bad, ...common, '--workers', '1', '--on-bad-row', 'stop', '--out', join(dir, 'stopped.csv')])
  ;[good, inProcess] = await Promise.all([cli, direct])
}, 180_000)
afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

const parse = (text: string) => {
  const [head, ...rows] = text.trimEnd().split('\n')
  const header = head.split(',')
  return { header, rows: rows.map((r) => Object.fromEntries(r.split(',').map((c, i) => [header[i], c]))) }
}

describe('motebench series', () => {
  it('writes one row per time step, in input order, with units in the column names; exit 0; summary on stderr, no progress bar off a terminal', async () => {
    expect(good.code, good.stderr).toBe(0)
    expect(good.stdout).toBe('')
    const { header, rows } = parse(await readFile(join(dir, 'record.csv'), 'utf8'))
    expect(header[0]).toBe('time')
    for (const w of [450, 550, 700]) for (const q of ['ext', 'sca', 'abs']) expect(header).toContain(`${q}_${w}nm_Mm-1`)
    expect(header).toEqual(expect.arrayContaining(['ssa_550nm', 'g_550nm', 'dry_number_cm-3', 'dry_volume_um3_cm-3', 'dry_mass_ug_m-3']))
    const fileTimes = (await readFile(example, 'utf8')).split('\n').filter((l) => /^\d{4}-/.test(l)).map((l) => l.split(';')[0])
    // carried as ISO 8601 ("2024-01-24 06:00" → "2024-01-24T06:00:00")
    expect(rows.map((r) => r.time)).toEqual(fileTimes.map((t) => `${t.replace(' ', 'T')}:00`))
    for (const r of rows) {
      for (const w of [450, 550, 700]) {
        const ext = Number(r[`ext_${w}nm_Mm-1`])
        const sca = Number(r[`sca_${w}nm_Mm-1`])
        expect(ext).toBeCloseTo(sca + Number(r[`abs_${w}nm_Mm-1`]), 3) // extinction = scattering + absorption
        expect(Number(r[`ssa_${w}nm`])).toBeCloseTo(sca / ext, 5)
      }
    }
    expect(good.stderr).toMatch(/12 rows read, 12 written/)
    expect(good.stderr).toMatch(/0 skipped/)
    expect(good.stderr).toMatch(/tolerance 0\.0001/)
    expect(good.stderr).not.toContain('\r')
  })

  it('the output file appears only when complete, and no temporary file is left', async () => {
    expect(good.sawIncomplete).toBe(false)
    expect((await readdir(dir)).filter((f) => f.includes('.tmp'))).toEqual([])
  })

  it('skips bad rows: exit 1, the good rows written, each skipped row named by line and column', () => {
    expect(skip.code, skip.stderr).toBe(1)
    const { rows } = parse(skip.stdout)
    expect(rows.map((r) => r.time)).toEqual(['t1', 't2', 't5', 't6'])
    expect(skip.stderr).toMatch(/6 rows read, 4 written.*2 skipped/)
    expect(skip.stderr).toMatch(/line 6 column 3/)
    expect(skip.stderr).toMatch(/line 7 column 4/)
    expect(skip.stderr).not.toMatch(/\.ts:\d+/)
  })

  it('the figures follow the distribution: number = Σ dN/dlogDp·Δlog10 D; coefficients scale with concentration; empty air has none', () => {
    const { rows } = parse(skip.stdout)
    const [t1, t2, t5] = rows
    // midpoints 20, 40, 80, 160 nm: edges at geometric means, each bin log10(2) wide
    expect(Number(t1['dry_number_cm-3'])).toBeCloseTo((1000 + 3000 + 2000 + 400) * Math.log10(2), 2)
    // bulk coefficients are integrals over dN: doubling every bin doubles them (ratios unchanged)
    for (const c of ['ext_550nm_Mm-1', 'sca_550nm_Mm-1', 'abs_550nm_Mm-1', 'dry_number_cm-3', 'dry_mass_ug_m-3']) expect(Number(t2[c]) / Number(t1[c])).toBeCloseTo(2, 5)
    expect(Number(t2.ssa_550nm)).toBeCloseTo(Number(t1.ssa_550nm), 6)
    expect(Number(t2.g_550nm)).toBeCloseTo(Number(t1.g_550nm), 6)
    expect(Number(t5['ext_550nm_Mm-1'])).toBe(0)
    expect(t5.ssa_550nm).toBe('') // undefined for no particles
  })

  it('--on-bad-row stop: the first bad row with its line and column, exit 2, no output file left behind', async () => {
    expect(stop.code).toBe(2)
    expect(stop.stderr.trimEnd().split('\n')).toHaveLength(1)
    expect(stop.stderr).toMatch(/bad rows\.csv line 6 column 3/)
    expect(stop.stderr).not.toMatch(/\.ts:\d+/)
    const left = await readdir(dir)
    expect(left.filter((f) => f.startsWith('stopped'))).toEqual([])
  })

  it('a file that cannot be read at all: exit 2, one line on standard error, nothing on standard output', async () => {
    const unreadable = join(dir, 'not a table.csv')
    await writeFile(unreadable, 'field notes\nthe sizer was off all day\n')
    const r = await runHere(runSeries, [unreadable, '--study', demo, '--sample', SAMPLE])
    expect(r.code).toBe(2)
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1)
    expect(r.stdout).toBe('')
  })

  it('bad arguments exit 2 with one line', async () => {
    const results = [
      await runHere(runSeries, [example, '--study', demo, '--sample', 'Volcano']),
      await runHere(runSeries, [example, '--study', demo, '--sample', SAMPLE, '--on-bad-row', 'ignore']),
      await runHere(runSeries, [example, '--sample', SAMPLE]),
      await runHere(runSeries, [example, '--study', demo, '--sample', SAMPLE, '--workers', '0']),
      await runHere(runSeries, [join(dir, 'missing.csv'), '--study', demo, '--sample', SAMPLE])
    ]
    for (const r of results) {
      expect(r.code).toBe(2)
      expect(r.stderr.trimEnd().split('\n')).toHaveLength(1)
    }
    expect(results[0].stderr).toContain('Coastal haze day')
  })

  it('the machinery called in this process with 1 worker writes the same record as the CLI with 2', async () => {
    expect(inProcess.written).toBe(12)
    expect(inProcess.text).toBe(await readFile(join(dir, 'record.csv'), 'utf8'))
  })
})

describe('motebench series --on-bad-row stop on standard output', () => {
  // 300 rows (a block of 256 and part of the next) before a bad cell, then more rows: the rows before the bad one are
  // written whatever the two workers had finished when the reader met it, exactly as the file cut before it gives them
  const rowsBefore = 300
  const row = (i: number) => `${new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString()},${1000 + i},${3000 - i},${2000 + (i % 17)},400`
  const head = ['units: nm', 'quantity: dN/dlogDp', 'time,20,40,80,160']
  const good = Array.from({ length: rowsBefore }, (_, i) => row(i))
  const run = async (lines: string[], onBadRow: 'skip' | 'stop'): Promise<{ text: string; error: unknown }> => {
    const study = demoStudy()
    let text = ''
    const source = async function* () {
      for (const l of lines) yield l
    }
    try {
      await runSeriesPipeline({
        sample: study.samples.find((s) => s.name === SAMPLE)!,
        userMaterials: [],
        wavelengthsNm: [550],
        tolerance: 1e-4,
        lines: source(),
        fileName: 'stop.csv',
        onBadRow,
        workers: 2,
        output: { write: async (t) => void (text += t) }
      })
      return { text, error: undefined }
    } catch (error) {
      return { text, error }
    }
  }

  it('writes the header and every row before the bad one, then stops with its line and column', async () => {
    const bad = `${new Date(Date.UTC(2026, 0, 1) + rowsBefore * 60_000).toISOString()},1000,n/a,2000,400`
    const after = Array.from({ length: 300 }, (_, i) => row(rowsBefore + 1 + i))
    const cut = await run([...head, ...good], 'skip')
    expect(cut.error).toBeUndefined()
    expect(cut.text.trimEnd().split('\n')).toHaveLength(rowsBefore + 1)
    const stopped = await run([...head, ...good, bad, ...after], 'stop')
    expect(String(stopped.error)).toMatch(new RegExp(`stop\\.csv line ${head.length + rowsBefore + 1} column 3`))
    expect(stopped.text).toBe(cut.text)
  }, 120_000)
})
