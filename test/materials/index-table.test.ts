// A user component's index table from CSV text, through to the component it defines.
import { describe, expect, it } from 'vitest'
import { defineUserMaterial, InputError, parseIndexTableCsv, refractiveIndexAt } from '../../src-core/index.ts'

describe('index tables from CSV', () => {
  it('reads a header with the unit, comments and semicolons, and defines a component that returns the tabulated values', () => {
    const text = '\uFEFF# my smoke sample\nwavelength_nm;n;k\n400;1.55;0.060\n550;1.54;0.030\n700;1.53;0.015\n'
    const rows = parseIndexTableCsv(text, { source: 'smoke.csv' })
    expect(rows).toEqual([[0.4, 1.55, 0.06], [0.55, 1.54, 0.03], [0.7, 1.53, 0.015]])
    const m = defineUserMaterial({ id: 'my-smoke', densityGcm3: 1.3, index: { kind: 'table', rows } }, [0.4, 0.55, 0.7])
    // a tabulated point comes back exactly (the table's own value)
    expect(refractiveIndexAt(m, 0.55)).toEqual({ n: 1.54, k: 0.03 })
  })

  it('takes µm when neither header nor caller says otherwise, and tabs', () => {
    expect(parseIndexTableCsv('0.4\t1.5\t0\n0.8\t1.49\t0')).toEqual([[0.4, 1.5, 0], [0.8, 1.49, 0]])
  })

  it('names the line and column of a bad cell', () => {
    const bad = 'wl_um,n,k\n0.4,1.5,0\n0.55,1.5x,0\n'
    expect(() => parseIndexTableCsv(bad, { source: 'bad.csv' })).toThrow(InputError)
    expect(() => parseIndexTableCsv(bad, { source: 'bad.csv' })).toThrow(/bad\.csv line 3 column 2 \(n\)/)
  })

  it('refuses a table with fewer than two rows or three columns', () => {
    expect(() => parseIndexTableCsv('0.55,1.5,0')).toThrow(/at least two rows/)
    expect(() => parseIndexTableCsv('0.4,1.5\n0.55,1.5')).toThrow(/three columns/)
  })
})
