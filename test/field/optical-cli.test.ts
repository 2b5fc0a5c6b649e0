// motebench series --scattering/--absorption end to end on the invented valley demo files (resources/field): three
// instrument files to a campaign record (merge, then series); bad rows of a measured file left out and listed,
// a bad header refused with no output.
import { existsSync } from 'node:fs'
import { mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runMerge } from '../../src-main/cli/merge.ts'
import { runSeries } from '../../src-main/cli/series.ts'
import { expectOneLine, repo, runHere } from '../cli/helpers.ts'

let dir: string
const path = (name: string) => join(dir, name)
const demo = (name: string) => join(repo, 'resources/field', name)
const study = join(repo, 'resources/demo.mote')

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-optical-'))
  const r = await runHere(runMerge, ['--mobility', demo('valley-mobility.csv'), '--aerodynamic', demo('valley-aerodynamic.csv'), '--density', '1.8', '--shape-factor', '1', '--out', path('merged.csv')])
  expect(r.code, r.stderr).toBe(0)
}, 120_000)

afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

function table(text: string) {
  const lines = text.trimEnd().split('\n')
  const comments = lines.filter((l) => l.startsWith('#'))
  const rows = lines.filter((l) => !l.startsWith('#')).map((l) => l.split(','))
  const header = rows[0]
  const col = (name: string) => {
    const i = header.indexOf(name)
    if (i < 0) throw new Error(`no column ${name}`)
    return rows.slice(1).map((r) => ({ time: r[0], cell: r[i] }))
  }
  return { comments, header, col }
}

const median = (v: number[]) => {
  const s = [...v].sort((a, b) => a - b)
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2
}

describe('series with the valley nephelometer and absorption photometer', () => {
  it('compares each merged row with the measured coefficients, corrected for truncation', async () => {
    const out = path('record.csv')
    const r = await runHere(runSeries, [
      path('merged.csv'), '--study', study, '--sample', 'Quarry dust event', '--wavelengths', '450,550,700nm',
      '--scattering', demo('valley-nephelometer.csv'), '--absorption', demo('valley-absorption.csv'), '--truncation', '--workers', '1', '--out', out
    ])
    // exit 1: the merged rows without the aerodynamic sizer are left out (listed), as series always does
    expect(r.code, r.stderr).toBe(1)
    const t = table(await readFile(out, 'utf8'))
    expect(t.comments.join('\n')).toMatch(/truncation: measured scattering multiplied by C/)
    expect(t.comments.join('\n')).toMatch(/its own Angstrom exponent/)
    // the computed set holds the instruments' wavelengths (370, 520, 880 nm from the absorption photometer)
    for (const c of ['sca_370nm_Mm-1', 'abs_880nm_Mm-1', 'sca_meas_550nm_Mm-1', 'truncation_C_550nm', 'bsca_ratio_700nm', 'abs_ratio_520nm', 'ssa_meas_450nm']) expect(t.header).toContain(c)
    // the demo nephelometer reads σ/C (C from src-core's nephelometer tool on the known modes,
    // test/field/make-optical-demo-files.ts); the merged distribution gives the known volume within 1 %
    // (merge tests), so the corrected ratios are 1 within about 1 %
    for (const w of [450, 550, 700]) {
      const ratios = t.col(`sca_ratio_${w}nm`).filter((x) => x.cell !== '').map((x) => Number(x.cell))
      expect(ratios.length).toBe(60)
      expect(Math.abs(median(ratios) - 1)).toBeLessThan(0.01)
      // coarse dust: the nephelometer misses a fifth of the scattering, so the correction is large
      expect(median(t.col(`truncation_C_${w}nm`).map((x) => Number(x.cell)))).toBeGreaterThan(1.15)
    }
    // the nephelometer was off 12:00–12:20: those rows keep empty measured cells, absorption still there
    const gap = t.col('sca_meas_550nm_Mm-1').filter((x) => x.cell === '').map((x) => x.time)
    expect(gap).toEqual(['2026-06-01T12:00:00Z', '2026-06-01T12:05:00Z', '2026-06-01T12:10:00Z', '2026-06-01T12:15:00Z'])
    expect(t.col('abs_meas_520nm_Mm-1').every((x) => x.cell !== '')).toBe(true)
    // the summary gives each ratio's median and 5–95 % range
    expect(r.stderr).toMatch(/sca_ratio_550nm\s+1\.0\d\d \[\d\.\d{3}, \d\.\d{3}\] over 60 rows/)
    expect(r.stderr).toMatch(/valley-nephelometer\.csv \(300 records in sizer rows/)
  }, 300_000)
})

describe('bad measured files', () => {
  // the valley nephelometer's 550 nm scattering beside the mobility sizer alone (whose rows all read)
  const neph550 = async () => {
    const lines = (await readFile(demo('valley-nephelometer.csv'), 'utf8')).trimEnd().split('\n').filter((l) => !l.startsWith('#'))
    return lines.slice(1).map((l) => l.split(',').filter((_c, i) => i === 0 || i === 2).join(','))
  }
  const seriesWith = (neph: string, out: string) =>
    runHere(runSeries, [demo('valley-mobility.csv'), '--study', study, '--sample', 'Quarry dust event', '--wavelengths', '550nm', '--scattering', neph, '--workers', '1', '--out', out])
  const dataRows = async (file: string) => (await readFile(file, 'utf8')).split('\n').filter((l) => l !== '' && !l.startsWith('#'))

  it('rows with a bad cell or a bad time are left out, listed with line and column, counted, exit 1; the other rows\' figures unchanged', async () => {
    const rows = await neph550()
    await mkdir(path('clean'), { recursive: true })
    await mkdir(path('messy'), { recursive: true })
    await writeFile(path('clean/neph.csv'), ['# units: Mm-1', 'time,scattering 550 nm', ...rows].join('\n') + '\n')
    // a bad cell (between two good times) at line 4 and a time with an hour 25 at line 6
    await writeFile(path('messy/neph.csv'), ['# units: Mm-1', 'time,scattering 550 nm', rows[0], '2026-06-01T08:00:45Z,2l.6', rows[1], '2026-06-01T25:01:00Z,21.6', ...rows.slice(2)].join('\n') + '\n')
    const clean = await seriesWith(path('clean/neph.csv'), path('clean/out.csv'))
    expect(clean.code, clean.stderr).toBe(0)
    const messy = await seriesWith(path('messy/neph.csv'), path('messy/out.csv'))
    expect(messy.code, messy.stderr).toBe(1)
    expect(messy.stderr).toMatch(/neph\.csv: 2 rows left out \(bad time or cells\)/)
    expect(messy.stderr).toMatch(/neph\.csv line 4 column 2: "2l\.6" \(scattering 550 nm\) is not a number; the row is left out\n {4}fix: Give the coefficient in Mm⁻¹/)
    expect(messy.stderr).toMatch(/neph\.csv line 6 column 1: "2026-06-01T25:01:00Z" is not a time stamp; the row is left out\n {4}fix: .*ISO 8601/)
    // the rows left out held no data: every row written, computed and measured, is the clean run's
    const a = await dataRows(path('clean/out.csv'))
    expect(a.length).toBeGreaterThan(10)
    expect(await dataRows(path('messy/out.csv'))).toEqual(a)
  }, 120_000)

  it('a header problem still stops the run with its file, line and column, and no output file', async () => {
    const bad = path('bad-neph.csv')
    await writeFile(bad, '# units: Mm-1\ntime,scattering 550 nm,extinction 550 nm\n2026-06-01T08:00:30Z,21.5,25\n')
    const out = path('never.csv')
    const r = await runHere(runSeries, [path('merged.csv'), '--study', study, '--sample', 'Quarry dust event', '--scattering', bad, '--workers', '1', '--out', out])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/bad-neph\.csv line 2 column 3: the header cell "extinction 550 nm" is not a quantity and a wavelength\. Write each column as QUANTITY WAVELENGTH nm/)
    expect(existsSync(out)).toBe(false)
  }, 120_000)

  it('a file on another kind of clock (no zone against the sizer\'s UTC) is refused with the fix', async () => {
    const naive = path('naive-abs.csv')
    await writeFile(naive, '# units: Mm-1\ntime,absorption 660 nm\n2026-06-01 08:01,3.2\n')
    const r = await runHere(runSeries, [path('merged.csv'), '--study', study, '--sample', 'Quarry dust event', '--absorption', naive, '--workers', '1'])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/naive-abs\.csv line 3 column 1: .*has no zone but the sizer's times have one.*same form/)
  }, 120_000)

  it('--truncation without a scattering file', async () => {
    const r = await runHere(runSeries, [path('merged.csv'), '--study', study, '--sample', 'Quarry dust event', '--absorption', demo('valley-absorption.csv'), '--truncation'])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/--truncation corrects measured scattering: give --scattering FILE/)
  })
})
