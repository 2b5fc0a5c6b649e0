// motebench merge end to end: invented sizer files made from a known aerosol (test/field/synthetic.ts) on two clocks,
// merged, then read back with the existing sizer reader and `motebench check`; gaps, bad input and the density fit.
import { existsSync } from 'node:fs'
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { binsFromMeasurement, parseSizerText } from '../../src-core/index.ts'
import { runCheck } from '../../src-main/cli/check.ts'
import { runMerge } from '../../src-main/cli/merge.ts'
import { expectOneLine, run, runHere } from '../cli/helpers.ts'
import { binFigures, modeFigures, relativeErrors } from './stats.ts'
import { AERODYNAMIC_MIDPOINTS_UM, clock, instrumentValues, KNOWN_DENSITY, KNOWN_MODES, KNOWN_SHAPE_FACTOR, logMidpoints, MOBILITY_MIDPOINTS_UM, numberBetween, sizerFile } from './synthetic.ts'

const truth = { shapeFactor: KNOWN_SHAPE_FACTOR, density: KNOWN_DENSITY }
let dir: string
const path = (name: string) => join(dir, name)

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-merge-'))
  const vm = instrumentValues('mobility', MOBILITY_MIDPOINTS_UM, KNOWN_MODES, truth)
  const va = instrumentValues('aerodynamic', AERODYNAMIC_MIDPOINTS_UM, KNOWN_MODES, truth)
  // mobility scans every 5 min at :20 s past, the aerodynamic sizer every minute at :45 s past; 30 minutes
  await writeFile(path('mobility.csv'), sizerFile({ title: ['invented test data'], unit: 'nm', midpointsUm: MOBILITY_MIDPOINTS_UM, times: clock('2026-06-01T10:00:20Z', 300, 6), values: () => vm }))
  await writeFile(path('aerodynamic.csv'), sizerFile({ title: ['invented test data'], unit: 'um', midpointsUm: AERODYNAMIC_MIDPOINTS_UM, times: clock('2026-06-01T10:00:45Z', 60, 30), values: () => va }))
  // the aerodynamic sizer off from 10:10 to 10:20
  const off = (t: Date) => t >= new Date('2026-06-01T10:10:00Z') && t < new Date('2026-06-01T10:20:00Z')
  await writeFile(path('aerodynamic-gap.csv'), sizerFile({ title: ['invented test data'], unit: 'um', midpointsUm: AERODYNAMIC_MIDPOINTS_UM, times: clock('2026-06-01T10:00:45Z', 60, 30, off), values: () => va }))
})

afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

/** The merged file's rows as bins, through the existing reader. */
async function readBack(file: string) {
  const table = parseSizerText(await readFile(file, 'utf8'), { fileName: 'merged.csv', onBadRow: 'skip' })
  return { table, bins: table.records.map((r) => binsFromMeasurement({ diameters: table.diameters, diameterKind: table.edges ? 'edges' : 'midpoints', diameterUnit: table.diameterUnit, quantity: table.quantity, values: r.values })) }
}

describe('motebench merge on two clocks', () => {
  it('writes a sizer file the existing reader and check take as it is, with the known aerosol in every 5-minute row', async () => {
    const out = path('merged.csv')
    const r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--shape-factor', String(KNOWN_SHAPE_FACTOR), '--out', out])
    expect(r.code, r.stderr).toBe(0)
    expect(r.stderr).toMatch(/6 steps of 5 min \(the coarsest interval\)/)
    const { table, bins } = await readBack(out)
    expect(table.rejected).toEqual([])
    expect(table.metadata['diameter kind']).toMatch(/volume-equivalent/)
    expect(table.metadata['made by']).toMatch(/merge/)
    expect(table.records.map((x) => x.time)).toEqual(clock('2026-06-01T10:00:00Z', 300, 6))
    const want = modeFigures(KNOWN_MODES)
    for (const b of bins) {
      const err = relativeErrors(binFigures(b.edges, b.dNdlogD), want)
      // as in merge.test.ts, plus 6 significant digits in the file: measured number 4e-6, volume 5.5e-3
      expect(err.number).toBeLessThan(1e-3)
      expect(err.volume).toBeLessThan(1e-2)
      expect(err.volumeMedianUm).toBeLessThan(1e-2)
      expect(err.numberGsd).toBeLessThan(1e-2)
    }
    const check = await runHere(runCheck, [out])
    expect(check.code, check.stdout).toBe(0)
    expect(check.stdout).toMatch(/6 distributions read/)
  })

  it('fits the density in the overlap (Khlystov et al. 2004) and says so in the file and the summary', async () => {
    const out = path('fitted.csv')
    const r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic.csv'), '--fit-density', '--shape-factor', String(KNOWN_SHAPE_FACTOR), '--out', out])
    expect(r.code, r.stderr).toBe(0)
    const fitted = Number(/density fitted .*: ([\d.]+) g cm⁻³, misfit/.exec(r.stderr)?.[1])
    expect(Math.abs(fitted / KNOWN_DENSITY - 1)).toBeLessThan(0.02) // the stated tolerance; measured 0.07 %
    const text = await readFile(out, 'utf8')
    expect(text).toMatch(/fitted in the overlap after Khlystov et al\. 2004/)
    expect(text).toMatch(/density fit misfit: RMS ln ratio/)
  })

  it('states a gap, never fills it: the rows without the aerodynamic sizer keep its bins empty and the column says who contributed', async () => {
    const out = path('gap.csv')
    const r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic-gap.csv'), '--density', '1.8', '--shape-factor', String(KNOWN_SHAPE_FACTOR), '--instruments-column', '--every', '5min', '--out', out])
    expect(r.code, r.stderr).toBe(0)
    expect(r.stderr).toMatch(/2 steps with a sizer missing/)
    expect(r.stderr).toMatch(/gap 2026-06-01T10:10:00Z: only mobility had data/)
    const lines = (await readFile(out, 'utf8')).trimEnd().split('\n')
    expect(lines.find((l) => l.startsWith('gaps:'))).toMatch(/2 of 6 steps/)
    const header = lines.find((l) => l.startsWith('time,'))!.split(',')
    expect(header.at(-1)).toBe('instruments')
    const rows = lines.filter((l) => /^2026-/.test(l)).map((l) => l.split(','))
    expect(rows.map((c) => c.at(-1))).toEqual(['mobility+aerodynamic', 'mobility+aerodynamic', 'mobility', 'mobility', 'mobility+aerodynamic', 'mobility+aerodynamic'])
    const last = header.length - 2 // the largest bin: the aerodynamic sizer's alone
    expect(rows[2][last]).toBe('')
    expect(rows[1][last]).not.toBe('')
    expect(rows[2][1]).toBe(rows[1][1]) // the smallest bin: the mobility sizer's, the same in both
  })

  it('--gap-rows omit leaves the gap steps out of the table (listed), so the file reads whole, as the app needs', async () => {
    const out = path('gap-omit.csv')
    const r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic-gap.csv'), '--density', '1.8', '--shape-factor', String(KNOWN_SHAPE_FACTOR), '--gap-rows', 'omit', '--out', out])
    expect(r.code, r.stderr).toBe(0)
    expect(r.stderr).toMatch(/6 steps of 5 min \(the coarsest interval\), 4 written .* 2 steps with a sizer missing \(left out of the table\)/)
    expect(r.stderr).toMatch(/gap 2026-06-01T10:15:00Z: only mobility had data/)
    const { table } = await readBack(out)
    expect(table.rejected).toEqual([])
    expect(table.metadata.gaps).toMatch(/2 of 6 steps .* left out of the table/)
    expect(table.records.map((x) => x.time)).toEqual(['2026-06-01T10:00:00Z', '2026-06-01T10:05:00Z', '2026-06-01T10:20:00Z', '2026-06-01T10:25:00Z'])
  })

  it('an optical counter sampling PSL itself (index 1.59+0i) merges as its calibration bins, which hold the known aerosol', async () => {
    const mid = logMidpoints(0.5, 10, 16)
    const s = { shapeFactor: 1, density: 1 }
    // PSL-calibrated diameters are the true ones for PSL: exact counts on the calibration bins
    const e = mid.map((_, j) => (j === 0 ? mid[0] ** 2 / Math.sqrt(mid[0] * mid[1]) : Math.sqrt(mid[j - 1] * mid[j])))
    e.push(mid[mid.length - 1] ** 2 / e[e.length - 1])
    const vo = mid.map((_, j) => numberBetween(KNOWN_MODES, e[j], e[j + 1]) / Math.log10(e[j + 1] / e[j]))
    const mobMid = logMidpoints(0.01, 0.8, 32)
    const vm = instrumentValues('mobility', mobMid, KNOWN_MODES, s)
    await writeFile(path('counter.csv'), sizerFile({ title: ['invented optical counter'], unit: 'um', midpointsUm: mid, times: clock('2026-06-01T10:00:00Z', 60, 10), values: () => vo }))
    await writeFile(path('mobility-spheres.csv'), sizerFile({ title: ['invented'], unit: 'nm', midpointsUm: mobMid, times: clock('2026-06-01T10:00:00Z', 300, 2), values: () => vm }))
    const out = path('optical.csv')
    const r = await runHere(runMerge, ['--mobility', path('mobility-spheres.csv'), '--optical', path('counter.csv'), '--m', '1.59+0i', '--wavelength', '780nm', '--angles', '35:120', '--out', out])
    expect(r.code, r.stderr).toBe(0)
    const { bins } = await readBack(out)
    const err = relativeErrors(binFigures(bins[0].edges, bins[0].dNdlogD), modeFigures(KNOWN_MODES))
    // the counter's 16 bins a decade (number flat in log D inside each) and its top edge near 11 µm (about 0.4 % of
    // the coarse volume lies above) limit the volume; measured: number 1.6e-6, volume 1.8e-2, volume median 1.5e-2
    expect(err.number).toBeLessThan(1e-3)
    expect(err.volume).toBeLessThan(3e-2)
    expect(err.volumeMedianUm).toBeLessThan(3e-2)
  }, 60_000)
})

describe('the real command line', () => {
  it('motebench merge is listed, has its help, and runs as a child process', async () => {
    const help = await run(['help', 'merge'])
    expect(help.stdout).toMatch(/--fit-density/)
    const out = path('child.csv')
    const r = await run(['merge', '--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--shape-factor', String(KNOWN_SHAPE_FACTOR), '--out', out])
    expect(r.code, r.stderr).toBe(0)
    expect(parseSizerText(await readFile(out, 'utf8')).records).toHaveLength(6)
  }, 120_000)
})

describe('bad input: located, with the fix; an unreadable file stops with exit 2 and no output', () => {
  const noOutput = async (name: string) => {
    expect(existsSync(path(name))).toBe(false)
    expect((await readdir(dir)).filter((f) => f.includes('.tmp-'))).toEqual([])
  }

  it('a missing file', async () => {
    const r = await runHere(runMerge, ['--mobility', path('nope.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--out', path('none1.csv')])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/nope\.csv: no such file/)
    await noOutput('none1.csv')
  })

  it('a file whose unit is not stated: its name, line and the fix', async () => {
    await writeFile(path('nounit.csv'), 'time,10,20,40\n2026-06-01T10:00:00Z,1,2,3\n2026-06-01T10:05:00Z,1,2,3\n')
    const r = await runHere(runMerge, ['--mobility', path('nounit.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--out', path('none2.csv')])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/nounit\.csv line 1: the diameter unit .* Add a line "units: nm"/)
    await noOutput('none2.csv')
  })

  it('time stamps with and without a zone in two files cannot share a clock', async () => {
    const text = (await readFile(path('mobility.csv'), 'utf8')).replace(/Z,/g, ',')
    await writeFile(path('naive.csv'), text)
    const r = await runHere(runMerge, ['--mobility', path('naive.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--out', path('none3.csv')])
    expect(r.code).toBe(2)
    expect(r.stderr).toMatch(/aerodynamic\.csv: its time stamps carry a zone .* same form/)
    await noOutput('none3.csv')
  })

  it('a row with a bad time stamp or cell is left out and listed with file, line and column (exit 1)', async () => {
    const lines = (await readFile(path('mobility.csv'), 'utf8')).split('\n')
    const header = lines.findIndex((l) => l.startsWith('time,'))
    lines[header + 2] = lines[header + 2].replace(/^[^,]+/, '01/06/2026 10:05')
    lines[header + 3] = lines[header + 3].replace(/,[^,]+/, ',n/a')
    await writeFile(path('badrows.csv'), lines.join('\n'))
    const r = await runHere(runMerge, ['--mobility', path('badrows.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--out', path('some.csv')])
    expect(r.code, r.stderr).toBe(1)
    expect(r.stderr).toMatch(new RegExp(`badrows\\.csv line ${header + 3} column 1: "01/06/2026 10:05" is not a date \\(year-month-day\\)[^\\n]*\\n    fix: Correct the date`))
    expect(r.stderr).toMatch(new RegExp(`badrows\\.csv line ${header + 4} column 2: "n/a"`))
    expect(r.stderr).toMatch(/badrows\.csv \(mobility\): 4 records used, 2 left out/)
    expect(existsSync(path('some.csv'))).toBe(true)
  })

  it('trusted ranges that leave a hole between the sizers: refused with the options that fix it, no output', async () => {
    const r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic.csv'), '--density', '1.8', '--mobility-range', '10:200', '--out', path('none4.csv')])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/no sizer covers .* between mobility\.csv and aerodynamic\.csv.*Widen the trusted ranges \(--mobility-range, --aerodynamic-range\)/)
    await noOutput('none4.csv')
  })

  it('arguments: an aerodynamic sizer without density, and one file only', async () => {
    let r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--aerodynamic', path('aerodynamic.csv'), '--out', path('x.csv')])
    expect(r.code).toBe(2)
    expect(r.stderr).toMatch(/--density is required .* --fit-density/)
    r = await runHere(runMerge, ['--mobility', path('mobility.csv'), '--out', path('x.csv')])
    expect(r.code).toBe(2)
    expect(r.stderr).toMatch(/at least two sizer files/)
  })
})
