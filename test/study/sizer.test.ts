// Reading sizer exports: layouts, separators, decimal commas, header lines, and every kind of bad cell.
// All tables here are invented.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import {
  binsFromMeasurement,
  binNumberConcentration,
  createSizerReader,
  demoStudy,
  InputError,
  MAX_KEPT_REJECTIONS,
  parseSizerText,
  parseStudy,
  serializeStudy,
  sizerRecordToBins,
  type SizerOptions,
  type SizerTable
} from '../../src-core/index.ts'

const read = (p: string): string => readFileSync(new URL(`../../${p}`, import.meta.url), 'utf8')

interface Case {
  name: string
  text: string
  options?: SizerOptions
  expect: Partial<Pick<SizerTable, 'layout' | 'diameterUnit' | 'quantity' | 'diameters' | 'edges' | 'delimiter' | 'decimal' | 'headerLine'>> & {
    records?: { time: string; values: number[]; line?: number }[]
    /** [line, column, fragment of the reason] */
    rejected?: [number, number | undefined, string][]
  }
}

const cases: Case[] = [
  {
    name: 'one distribution, comma, decimal point, µm from the header row',
    text: 'Dp (µm),dN/dlogDp (cm-3)\n0.1,100\n0.2,250.5\n0.4,80\n',
    expect: { layout: 'single', diameterUnit: 'um', quantity: 'dN/dlogDp', diameters: [0.1, 0.2, 0.4], delimiter: ',', decimal: '.', headerLine: 1, records: [{ time: '', values: [100, 250.5, 80], line: 2 }], rejected: [] }
  },
  {
    name: 'one distribution, semicolon with decimal comma, free-text and metadata lines first',
    text: 'Export from the (fictional) Tollbridge lab, invented numbers\nOperator note, nothing to read here\nunits: nm\nquantity: dV/dlogDp\n\nDiameter;Value\n15,5;1,25\n31;2,5\n62;0,75\n',
    expect: { layout: 'single', diameterUnit: 'nm', quantity: 'dV/dlogDp', diameters: [15.5, 31, 62], delimiter: ';', decimal: ',', headerLine: 6, records: [{ time: '', values: [1.25, 2.5, 0.75], line: 7 }] }
  },
  {
    name: 'byte-order mark and tab separator, no header row, units given by the caller',
    text: '\uFEFF0.3\t12\n0.5\t8\n1.0\t2\n',
    options: { diameterUnit: 'um', quantity: 'dN' },
    expect: { layout: 'single', diameterUnit: 'um', quantity: 'dN', delimiter: '\t', diameters: [0.3, 0.5, 1], records: [{ time: '', values: [12, 8, 2], line: 1 }] }
  },
  {
    name: 'caller options override what the file says',
    text: 'units: um\nquantity: dN\nDp,value\n10,1\n20,2\n',
    options: { diameterUnit: 'nm', quantity: 'dS/dlogDp' },
    expect: { diameterUnit: 'nm', quantity: 'dS/dlogDp', diameters: [10, 20] }
  },
  {
    name: 'time series, one row per time, Windows line ends, trailing separators',
    text: 'units: nm\r\nquantity: dN/dlogDp\r\ntime,20,40,80\r\n08:00,1,2,3,\r\n09:00,4,5,6,\r\n',
    expect: {
      layout: 'time-rows',
      diameters: [20, 40, 80],
      headerLine: 3,
      records: [
        { time: '08:00', values: [1, 2, 3], line: 4 },
        { time: '09:00', values: [4, 5, 6], line: 5 }
      ],
      rejected: []
    }
  },
  {
    name: 'time series with units on the bin headers, semicolons and decimal commas',
    text: 'quantity: dN/dlogDp\nDate/time;15,1 nm;30,2 nm;60,4 nm\n2024-01-24 06:00;1,5;2;2,5\n',
    expect: { layout: 'time-rows', diameterUnit: 'nm', decimal: ',', diameters: [15.1, 30.2, 60.4], records: [{ time: '2024-01-24T06:00:00', values: [1.5, 2, 2.5] }] }
  },
  {
    name: 'one column per time',
    text: 'quantity: dM/dlogDp\nDp (um),06:00,07:00,08:00\n0.5,10,11,12\n1,20,21,22\n2,5,6,7\n',
    expect: {
      layout: 'time-columns',
      diameterUnit: 'um',
      quantity: 'dM/dlogDp',
      diameters: [0.5, 1, 2],
      headerLine: 2,
      records: [
        { time: '06:00', values: [10, 20, 5], line: 2 },
        { time: '07:00', values: [11, 21, 6], line: 2 },
        { time: '08:00', values: [12, 22, 7], line: 2 }
      ]
    }
  },
  {
    name: 'one column per time with numeric times (seconds), told apart by the diameter label',
    text: 'quantity: dN\nDp (nm),0,300,600\n10,1,2,3\n20,4,5,6\n',
    expect: { layout: 'time-columns', diameters: [10, 20], records: [{ time: '0', values: [1, 4] }, { time: '300', values: [2, 5] }, { time: '600', values: [3, 6] }] }
  },
  {
    name: 'one row per time with numeric times (seconds)',
    text: 'units: nm\nquantity: dN\ntime_s,10,20\n0,1,2\n300,3,4\n',
    expect: { layout: 'time-rows', diameters: [10, 20], records: [{ time: '0', values: [1, 2] }, { time: '300', values: [3, 4] }] }
  },
  {
    name: 'bin edges: one more diameter than values',
    text: 'units: nm\nquantity: dN/dlogDp\ndiameters: edges\ntime;10;20;40;80\nt1;1;2;3\n',
    expect: { layout: 'time-rows', edges: true, diameters: [10, 20, 40, 80], records: [{ time: 't1', values: [1, 2, 3] }] }
  },
  {
    name: 'missing cells: empty and a short row',
    text: 'units: nm\nquantity: dN\ntime,20,40,80\n08:00,1,,3\n09:00,4,5\n10:00,7,8,9\n',
    expect: {
      records: [{ time: '10:00', values: [7, 8, 9], line: 6 }],
      rejected: [
        [4, 3, 'no value for the bin at 40 nm'],
        [5, 4, 'no value for the bin at 80 nm']
      ]
    }
  },
  {
    name: 'text in number cells, every bad cell of a row reported',
    text: 'units: nm\nquantity: dN\ntime,20,40,80\n08:00,1,n/a,3\n09:00,abc,5,1.2.3\n10:00,7,8,9\n',
    expect: {
      records: [{ time: '10:00', values: [7, 8, 9] }],
      rejected: [
        [4, 3, '"n/a"'],
        [5, 2, '"abc"'],
        [5, 4, '"1.2.3"']
      ]
    }
  },
  {
    name: 'a decimal point in a decimal-comma file is text, not a silent misreading',
    text: 'units: nm\nquantity: dN\nDp;value\n10;1,5\n20;2.5\n40;3,5\n',
    expect: { decimal: ',', diameters: [10, 40], records: [{ time: '', values: [1.5, 3.5] }], rejected: [[5, 2, '"2.5"']] }
  },
  {
    name: 'negative values',
    text: 'units: nm\nquantity: dN/dlogDp\ntime,20,40\n08:00,1,-2\n09:00,3,4\n',
    expect: { records: [{ time: '09:00', values: [3, 4] }], rejected: [[4, 3, 'negative']] }
  },
  {
    name: 'unsorted and repeated diameters in a single distribution',
    text: 'Dp (nm),dN\n10,1\n40,2\n20,3\n40,4\n80,5\n',
    expect: {
      diameters: [10, 40, 80],
      records: [{ time: '', values: [1, 2, 5] }],
      rejected: [
        [4, 1, 'diameters must ascend'],
        [5, 1, 'repeats']
      ]
    }
  },
  {
    name: 'one column per time: a bad value drops that time, a bad diameter drops that bin',
    text: 'units: nm\nquantity: dN\nDp,t1,t2\n10,1,2\nx,3,4\n20,5,oops\n',
    expect: {
      diameters: [10, 20],
      records: [{ time: 't1', values: [1, 5] }],
      rejected: [
        [5, 1, 'not a number'],
        [6, 3, '"oops"']
      ]
    }
  },
  {
    name: 'quoted cells keep their separators',
    text: 'units: nm\nquantity: dN\ntime;"15,5";"31,0"\n"08:00";"1,5";"2"\n',
    expect: { decimal: ',', diameters: [15.5, 31], records: [{ time: '08:00', values: [1.5, 2] }] }
  }
]

describe('sizer files: awkward inputs', () => {
  for (const c of cases) {
    it(c.name, () => {
      const t = parseSizerText(c.text, c.options)
      const { records, rejected, ...fields } = c.expect
      for (const [k, v] of Object.entries(fields)) expect(t[k as keyof SizerTable], k).toEqual(v)
      if (records) expect(t.records.map(({ timeMs: _t, ...r }) => r)).toEqual(records.map((r, i) => ({ ...r, line: r.line ?? t.records[i]?.line })))
      if (rejected) {
        expect(t.rejected.map((r) => [r.line, r.column])).toEqual(rejected.map(([l, col]) => [l, col]))
        rejected.forEach(([, , fragment], i) => {
          expect(t.rejected[i].reason).toContain(fragment)
          expect(t.rejected[i].fix.length).toBeGreaterThan(5)
        })
      }
    })
  }
})

describe('sizer files: problems that stop reading', () => {
  const fatal: [string, string, string, RegExp][] = [
    ['bin diameters in the header out of order', 'units: nm\nquantity: dN\ntime,10,40,20\n08:00,1,2,3\n', 'line 3 column 4', /must ascend/],
    ['no diameter unit anywhere', 'quantity: dN\nDp,value\n10,1\n20,2\n', 'line 2', /units: nm/],
    ['no quantity anywhere', 'units: nm\nDp,value\n10,1\n20,2\n', 'line 2', /quantity: dN\/dlogDp/],
    ['unit in the header contradicts the metadata', 'units: nm\nquantity: dN\nDp (um),value\n0.1,1\n0.2,2\n', 'line 3', /µm.*nm/],
    ['no table at all', 'just some words\nand more words\n', 'sizer file', /no table/],
    ['empty file', '', 'sizer file', /empty/],
    ['a header cell that is not a diameter', 'units: nm\nquantity: dN\ntime,10,big,40\n08:00,1,2,3\n', 'line 3 column 3', /not a bin diameter/]
  ]
  for (const [name, text, where, reason] of fatal) {
    it(name, () => {
      let err: unknown
      try {
        parseSizerText(text, { onBadRow: 'skip' })
      } catch (e) {
        err = e
      }
      expect(err).toBeInstanceOf(InputError)
      expect((err as InputError).where).toContain(where)
      expect((err as InputError).message).toMatch(reason)
    })
  }
})

describe('skip or stop at bad rows', () => {
  const broken = read('test/study/fixtures/broken-sizer.csv')

  it("'skip' reads the good rows and reports each bad cell with line and column", () => {
    const t = parseSizerText(broken, { fileName: 'broken-sizer.csv', onBadRow: 'skip' })
    expect(t.layout).toBe('time-rows')
    expect(t.decimal).toBe(',')
    expect(t.records.map((r) => r.time)).toEqual(['2024-01-24T06:00:00', '2024-01-24T11:00:00'])
    expect(t.records[0].values).toEqual([1200.5, 3400, 2100, 400.2])
    expect(t.rejected.map((r) => [r.line, r.column])).toEqual([
      [6, 3],
      [7, 4],
      [8, 3],
      [9, 5]
    ])
  })

  it("'stop' throws at the first bad cell, naming file, line and column", () => {
    expect(() => parseSizerText(broken, { fileName: 'broken-sizer.csv', onBadRow: 'stop' })).toThrow(/broken-sizer\.csv line 6 column 3: no value/)
  })

  it('skip is the default', () => {
    expect(parseSizerText(broken).rejected).toHaveLength(4)
  })
})

describe('the example files in resources/', () => {
  it('sizer-single-comma.csv: one distribution in µm with header lines', () => {
    const t = parseSizerText(read('resources/sizer-single-comma.csv'), { fileName: 'sizer-single-comma.csv', onBadRow: 'stop' })
    expect(t).toMatchObject({ layout: 'single', diameterUnit: 'um', quantity: 'dN/dlogDp', delimiter: ',', decimal: '.', edges: false })
    expect(t.records).toHaveLength(1)
    expect(t.records[0].values).toHaveLength(t.diameters.length)
    expect(t.metadata.sample).toMatch(/fictional/)
    // usable as measured bins: converts and holds a plausible number of particles (1e2 to 1e6 cm⁻³)
    const bins = sizerRecordToBins(t, t.records[0])
    const sb = binsFromMeasurement({ diameters: bins.diameters, diameterKind: 'midpoints', diameterUnit: bins.diameter_unit, quantity: bins.quantity, values: bins.values })
    const n = binNumberConcentration(sb)
    expect(n).toBeGreaterThan(1e2)
    expect(n).toBeLessThan(1e6)
  })

  it('sizer-series-semicolon.csv: ~12 times × ~30 bins from ~15 to ~700 nm, decimal commas', () => {
    const t = parseSizerText(read('resources/sizer-series-semicolon.csv'), { fileName: 'sizer-series-semicolon.csv', onBadRow: 'stop' })
    expect(t).toMatchObject({ layout: 'time-rows', diameterUnit: 'nm', quantity: 'dN/dlogDp', delimiter: ';', decimal: ',' })
    expect(t.records).toHaveLength(12)
    expect(t.diameters).toHaveLength(30)
    expect(t.diameters[0]).toBeCloseTo(15, 6)
    expect(t.diameters[29]).toBeCloseTo(700, 6)
    for (const r of t.records) expect(r.values).toHaveLength(30)
    expect(t.rejected).toEqual([])
  })

  it('a record becomes the bins of a study sample that validates', () => {
    const t = parseSizerText(read('resources/sizer-series-semicolon.csv'))
    const s = demoStudy()
    s.samples[4] = { ...s.samples[4], size: { kind: 'bins', bins: sizerRecordToBins(t, t.records[2], 'sizer-series-semicolon.csv') } }
    const r = parseStudy(serializeStudy(s))
    expect(r.ok ? [] : r.problems).toEqual([])
    if (r.ok && r.study.samples[4].size.kind === 'bins') expect(r.study.samples[4].size.bins.source).toBe('sizer-series-semicolon.csv, 2024-01-24T08:00:00')
  })
})

describe('line-by-line reader for long time series', () => {
  function* longSeries(rows: number): Generator<string> {
    yield 'Harrowmere Valley station - long invented series'
    yield 'units: nm'
    yield 'quantity: dN/dlogDp'
    yield 'time;' + Array.from({ length: 30 }, (_, j) => String(15 + 20 * j)).join(';')
    for (let i = 0; i < rows; i++) yield `t${i};` + Array.from({ length: 30 }, (_, j) => ((i + j) % 97) + ',5').join(';')
  }

  it('hands each row on as it arrives and keeps none of them', () => {
    let seen = 0
    let seenBeforeEnd = 0
    const reader = createSizerReader({ onRecord: (r) => {
      seen++
      expect(r.values).toHaveLength(30)
    } })
    let pushed = 0
    for (const line of longSeries(20000)) {
      reader.push(line)
      if (++pushed === 1000) seenBeforeEnd = seen
    }
    const summary = reader.end()
    expect(seenBeforeEnd).toBeGreaterThan(900) // records flow out long before the end
    expect(seen).toBe(20000)
    expect(summary.recordCount).toBe(20000)
    expect(summary.layout).toBe('time-rows')
    expect('records' in summary).toBe(false)
  })

  it('keeps at most MAX_KEPT_REJECTIONS rejections but counts them all', () => {
    const reader = createSizerReader({ diameterUnit: 'nm', quantity: 'dN' })
    reader.push('time,10,20')
    for (let i = 0; i < MAX_KEPT_REJECTIONS + 500; i++) reader.push(`t${i},1,-1`)
    const s = reader.end()
    expect(s.rejected).toHaveLength(MAX_KEPT_REJECTIONS)
    expect(s.rejectedCount).toBe(MAX_KEPT_REJECTIONS + 500)
    expect(s.rejected[0]).toMatchObject({ line: 2, column: 3 })
  })

  it('a short file is read when it ends', () => {
    const got: string[] = []
    const reader = createSizerReader({ onRecord: (r) => got.push(r.time) })
    for (const line of ['units: nm', 'quantity: dN', 'time,10,20', 'a,1,2', 'b,3,4']) reader.push(line)
    expect(got).toEqual([])
    expect(reader.header).toBeUndefined()
    reader.end()
    expect(got).toEqual(['a', 'b'])
  })
})
