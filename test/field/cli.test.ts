// The sizer options on the command line: check on the invented demo exports in resources/, --negatives,
// --date-order and a file that cannot be read (exit 2, nothing on standard output).
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { runCheck } from '../../src-main/cli/check.ts'
import { runHere } from '../cli/helpers.ts'

const dir = mkdtempSync(join(tmpdir(), 'motebench-field-'))
const file = (name: string, text: string): string => {
  const p = join(dir, name)
  writeFileSync(p, text)
  return p
}

describe('motebench check on field exports', () => {
  it('the tab-separated valley sizer: bins, date and time columns, ignored columns, the negative rows listed', async () => {
    const r = await runHere(runCheck, ['resources/field-valley-sizer.txt', '--json'])
    const j = JSON.parse(r.stdout)
    expect(r.code).toBe(2) // rows left out
    expect(j.bins).toBe(32)
    expect(j.diameter_unit).toBe('nm')
    expect(j.date_order).toBe('dmy')
    expect(j.time_columns.map((c: { name: string }) => c.name)).toEqual(['Date', 'Start Time'])
    expect(j.ignored_columns.map((c: { name: string }) => c.name)).toEqual(['Sample #', 'Total Conc. (#/cm3)', 'Median (nm)', 'Mean (nm)', 'Geo. Std. Dev.'])
    expect(j.rows_left_out).toBe(4)
    expect(j.records + j.rows_left_out).toBe(24)
    expect(j.first_time).toBe('2024-03-14T23:00:00')
  })

  it('--negatives zero keeps every row and counts the cells and rows changed', async () => {
    const r = await runHere(runCheck, ['resources/field-valley-sizer.txt', '--negatives', 'zero'])
    expect(r.code).toBe(0)
    expect(r.stdout).toMatch(/24 distributions read/)
    expect(r.stdout).toMatch(/negatives set to 0: 5 cells in 4 rows/)
    expect(r.stdout).toMatch(/ignored: column 1 "Sample #"/)
  })

  it('the semicolon counter with a units row', async () => {
    const r = await runHere(runCheck, ['resources/field-ridge-counter.csv'])
    expect(r.code).toBe(0)
    expect(r.stdout).toMatch(/16 bins from 0.3 to 10 µm/)
    expect(r.stdout).toMatch(/units row: line 4/)
    expect(r.stdout).toMatch(/2024-03-14T23:00:00\+01:00 to 2024-03-14T23:55:00\+01:00/)
  })

  it('ambiguous dates: refused with the option to give, and read once it is given', async () => {
    const p = file('ambiguous.csv', 'units: nm\nquantity: dN\ndate,time,10,20\n03/04/2024,06:00,1,2\n04/04/2024,06:00,1,2\n')
    const refused = await runHere(runCheck, [p])
    expect(refused.code).toBe(2)
    expect(refused.stdout).toBe('')
    expect(refused.stderr).toMatch(/ambiguous\.csv line 4 column 1: .*--date-order/)
    const read = await runHere(runCheck, [p, '--date-order', 'mdy', '--json'])
    expect(read.code).toBe(0)
    expect(JSON.parse(read.stdout).first_time).toBe('2024-03-04T06:00:00')
  })

  it('bad option values are usage errors', async () => {
    expect((await runHere(runCheck, ['resources/field-ridge-counter.csv', '--negatives', 'clip'])).stderr).toMatch(/--negatives "clip" is not zero or drop/)
    expect((await runHere(runCheck, ['resources/field-ridge-counter.csv', '--date-order', 'dym'])).stderr).toMatch(/dmy, mdy or ymd/)
  })
})
