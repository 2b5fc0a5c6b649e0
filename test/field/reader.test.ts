// Instrument exports as they come: the layouts field sizers commonly write, each built here from invented
// numbers (no real instrument's or maker's format), and what the reader makes of them.
import { describe, expect, it } from 'vitest'
import { averageRecords, createSizerReader, InputError, parseCellNumber, parseSizerText, SizerChoiceNeeded, type SizerOptions } from '../../src-core/index.ts'

/** Geometric bin midpoints from lo to hi (n bins), written with 4 significant digits. */
function bins(n: number, lo: number, hi: number): string[] {
  return Array.from({ length: n }, (_, j) => Number((lo * (hi / lo) ** (j / (n - 1))).toPrecision(4)).toString())
}

function refusal(text: string, options: SizerOptions = {}): InputError {
  try {
    parseSizerText(text, options)
  } catch (e) {
    if (e instanceof InputError) return e
    throw e
  }
  throw new Error('the file was read')
}

describe('a tab-separated export: sample number, date and time columns, bins, trailing totals', () => {
  const d = bins(5, 12.5, 410)
  const text = [
    'Valley mobility sizer (fictional), invented numbers',
    'units: nm',
    'quantity: dN/dlogDp',
    '',
    ['Sample #', 'Date', 'Time', ...d.map((x) => `${x} nm`), 'Total Conc.', 'Median (nm)', 'Mean (nm)'].join('\t'),
    ['1', '12/04/2024', '23:55:00', '10', '20', '30', '20', '10', '90', '60.1', '70.2'].join('\t'),
    ['2', '13/04/2024', '00:00:00', '11', '21', '31', '21', '11', '95', '60.3', '70.0'].join('\t'),
    ['3', '13/04/2024', '00:05:00', '12', '22', '32', '22', '12', '100', '60.0', '70.1'].join('\t')
  ].join('\n')
  const t = parseSizerText(text, { fileName: 'vms.txt' })

  it('finds the bins as the run of diameter header cells', () => {
    expect(t.layout).toBe('time-rows')
    expect(t.delimiter).toBe('\t')
    expect(t.diameters).toEqual(d.map(Number))
    expect(t.firstBinColumn).toBe(4)
  })

  it('lists the other columns once as ignored, and reads the time from date and time columns', () => {
    expect(t.ignoredColumns).toEqual([
      { column: 1, name: 'Sample #' },
      { column: 9, name: 'Total Conc.' },
      { column: 10, name: 'Median (nm)' },
      { column: 11, name: 'Mean (nm)' }
    ])
    expect(t.timeColumns.map((c) => [c.column, c.role])).toEqual([
      [2, 'date'],
      [3, 'time of day']
    ])
  })

  it('detects day/month/year from the whole column (13/04 has no month 13) and carries ISO 8601', () => {
    expect(t.dateOrder).toBe('dmy')
    expect(t.records.map((r) => r.time)).toEqual(['2024-04-12T23:55:00', '2024-04-13T00:00:00', '2024-04-13T00:05:00'])
    // five minutes apart, across midnight
    expect(t.records[1].timeMs - t.records[0].timeMs).toBe(300_000)
    expect(t.records[2].values).toEqual([12, 22, 32, 22, 12])
    expect(t.rejected).toEqual([])
    expect(t.timeFormat).toMatch(/day\/month\/year.*line 7: 13\/04\/2024/)
  })
})

describe('a semicolon export with a units row under the header', () => {
  const d = ['0,3', '0,5', '0,8', '1,2', '2']
  const text = [
    'Counter: bench optical particle counter (fictional)',
    'quantity: dN/dlogDp',
    ['Time', ...d, 'Flow'].join('; '),
    ['ISO8601', ...d.map(() => 'um'), 'l/min'].join('; '),
    ['2024-06-01T10:00:00Z', '5,5', '4', '3', '2', '1', '2,8'].join('; '),
    ['2024-06-01T10:01:00Z', '6', '4,5', '3', '2', '0,5', '2,8'].join('; ')
  ].join('\n')
  const t = parseSizerText(text)

  it('reads the units row as units, not as bad cells', () => {
    expect(t.unitsLine).toBe(4)
    expect(t.diameterUnit).toBe('um')
    expect(t.unitSource).toMatch(/units row/)
    expect(t.diameters).toEqual([0.3, 0.5, 0.8, 1.2, 2])
    expect(t.rejected).toEqual([])
    expect(t.records).toHaveLength(2)
    expect(t.records[0].values).toEqual([5.5, 4, 3, 2, 1])
  })

  it('keeps the zone of ISO 8601 times', () => {
    expect(t.records.map((r) => r.time)).toEqual(['2024-06-01T10:00:00Z', '2024-06-01T10:01:00Z'])
    expect(t.records[0].timeMs).toBe(Date.UTC(2024, 5, 1, 10))
    expect(t.ignoredColumns).toEqual([{ column: 7, name: 'Flow' }])
  })

  it('a stray day/month date among ISO 8601 times is a bad row, not a question of date order', () => {
    const u = parseSizerText('units: nm\nquantity: dN\ntime,10,20\n2024-06-01T12:00:00Z,1,2\n01/06/2024 12:05,1,2\n2024-06-01T12:10:00Z,1,2\n')
    expect(u.records.map((r) => r.time)).toEqual(['2024-06-01T12:00:00Z', '2024-06-01T12:10:00Z'])
    expect(u.rejected.map((r) => [r.line, r.column])).toEqual([[5, 1]])
  })

  it('takes an offset into the number, and keeps it in the text', () => {
    const u = parseSizerText('units: nm\nquantity: dN\ntime,10,20\n2024-06-01T12:00:00+02:00,1,2\n2024-06-01 12:00:30.5-05:00,1,2\n')
    expect(u.records.map((r) => r.time)).toEqual(['2024-06-01T12:00:00+02:00', '2024-06-01T12:00:30.500-05:00'])
    expect(u.records[0].timeMs).toBe(Date.UTC(2024, 5, 1, 10))
    expect(u.records[1].timeMs).toBe(Date.UTC(2024, 5, 1, 17, 0, 30, 500))
  })
})

describe('the diameter unit stated only in header text', () => {
  it('"Dp [nm]" above the bins, header cells "Dp=10.2nm" style', () => {
    const t = parseSizerText('Dp [nm]\nquantity: dN\ntime;Dp=10.2nm;Dp=20.4nm;Dp=40.8nm\n08:00;1;2;3\n')
    expect(t.diameterUnit).toBe('nm')
    expect(t.diameters).toEqual([10.2, 20.4, 40.8])
  })

  it('"Diameter (µm)" heading a single distribution', () => {
    const t = parseSizerText('Diameter (µm),dN/dlogDp\n0.0102,5\n0.0204,7\n')
    expect(t.diameterUnit).toBe('um')
    expect(t.quantity).toBe('dN/dlogDp')
    expect(t.records[0].values).toEqual([5, 7])
  })

  it('"0.0102 µm" in the cells themselves', () => {
    const t = parseSizerText('quantity: dN\ntime,0.0102 µm,0.0204 µm\nt1,1,2\n')
    expect(t.diameterUnit).toBe('um')
    expect(t.unitSource).toMatch(/header cell/)
  })

  it('two places that disagree are refused, naming both', () => {
    const e = refusal('units: um\nquantity: dN\ntime,10 nm,20 nm\nt1,1,2\n')
    expect(e).toBeInstanceOf(SizerChoiceNeeded)
    expect(e.message).toMatch(/units: um.*nm/)
  })
})

describe('the diameter unit inferred only when the numbers leave no doubt', () => {
  it('30 bins from 10 to 500: nm, and the summary says so', () => {
    const d = bins(30, 10, 500)
    const t = parseSizerText(`quantity: dN/dlogDp\ntime,${d.join(',')}\nt1,${d.map(() => 1).join(',')}\n`)
    expect(t.diameterUnit).toBe('nm')
    expect(t.notes.join(' ')).toMatch(/nm inferred/)
  })

  it('8 bins from 0.3 to 10: µm', () => {
    const d = bins(8, 0.3, 10)
    const t = parseSizerText(`quantity: dN\ntime,${d.join(',')}\nt1,${d.map(() => 1).join(',')}\n`)
    expect(t.diameterUnit).toBe('um')
    expect(t.notes.join(' ')).toMatch(/µm inferred/)
  })

  it('a single distribution from 0.3 to 10 µm: inferred at the end of the table', () => {
    const t = parseSizerText('quantity: dN\nD,value\n0.3,1\n1,2\n10,3\n')
    expect(t.diameterUnit).toBe('um')
  })

  it('10 bins from 10 to 500 (too few for a mobility sizer, too large for µm): refused with the fix', () => {
    const d = bins(10, 10, 500)
    const e = refusal(`quantity: dN\ntime,${d.join(',')}\nt1,${d.map(() => 1).join(',')}\n`)
    expect(e).toBeInstanceOf(SizerChoiceNeeded)
    expect((e as SizerChoiceNeeded).choice).toBe('diameterUnit')
    expect(e.fix).toMatch(/--diameter-unit/)
    // and the option settles it
    expect(parseSizerText(`quantity: dN\ntime,${d.join(',')}\nt1,${d.map(() => 1).join(',')}\n`, { diameterUnit: 'nm' }).records).toHaveLength(1)
  })
})

describe('negative values from inversion', () => {
  const text = 'units: nm\nquantity: dN/dlogDp\ntime,10,20,40\nt1,1,-0.5,2\nt2,-1,-2,3\nt3,1,2,3\n'

  it('by default the row is left out with the reason', () => {
    const t = parseSizerText(text)
    expect(t.records.map((r) => r.time)).toEqual(['t3'])
    expect(t.rejected.map((r) => [r.line, r.column])).toEqual([
      [4, 3],
      [5, 2],
      [5, 3]
    ])
    expect(t.rowsLeftOut).toBe(2)
    expect(t.rejected[0].fix).toMatch(/--negatives zero/)
  })

  it("'zero' sets them to 0 and counts the cells and rows changed", () => {
    const t = parseSizerText(text, { negatives: 'zero' })
    expect(t.records.map((r) => r.values)).toEqual([
      [1, 0, 2],
      [0, 0, 3],
      [1, 2, 3]
    ])
    expect(t.negativesZeroed).toEqual({ cells: 3, rows: 2 })
    expect(t.rejected).toEqual([])
  })
})

describe('ambiguous dates (03/04)', () => {
  const rows = (dates: string[]) => `units: nm\nquantity: dN\ndate,time,10,20\n${dates.map((d) => `${d},06:00,1,2`).join('\n')}\n`

  it('resolved from the whole column: a later 04/13 makes the file month/day/year', () => {
    const t = parseSizerText(rows(['03/04/2024', '04/12/2024', '04/13/2024']))
    expect(t.dateOrder).toBe('mdy')
    expect(t.records[0].time).toBe('2024-03-04T06:00:00')
    expect(t.timeFormat).toMatch(/month\/day\/year.*04\/13\/2024/)
  })

  it('refused with the fix when no date settles it, never guessed', () => {
    const e = refusal(rows(['03/04/2024', '04/04/2024', '05/04/2024']))
    expect(e).toBeInstanceOf(SizerChoiceNeeded)
    expect((e as SizerChoiceNeeded).choice).toBe('dateOrder')
    expect(e.where).toMatch(/line 4 column 1/)
    expect(e.fix).toMatch(/--date-order dmy or mdy/)
  })

  it('the stated order (option, or "date format" in the file) settles it', () => {
    expect(parseSizerText(rows(['03/04/2024']), { dateOrder: 'dmy' }).records[0].time).toBe('2024-04-03T06:00:00')
    expect(parseSizerText('date format: mm/dd/yyyy\n' + rows(['03/04/2024'])).records[0].time).toBe('2024-03-04T06:00:00')
  })

  it('a date that fits neither order is a bad row, with its line and column', () => {
    const t = parseSizerText(rows(['13/04/2024', '04/13/2024', '14/04/2024']))
    expect(t.dateOrder).toBe('dmy')
    expect(t.records).toHaveLength(2)
    expect(t.rejected.map((r) => [r.line, r.column])).toEqual([[5, 1]])
    expect(t.rejected[0].reason).toMatch(/day\/month\/year/)
  })

  it('a long file streams: rows are held only until a date settles the order', () => {
    const got: string[] = []
    const reader = createSizerReader({ onRecord: (r) => got.push(r.time) })
    for (const l of ['units: nm', 'quantity: dN', 'date;time;10;20']) reader.push(l)
    // 12 days of 5-minute rows in which every date fits both orders, then 13 January
    for (let day = 1; day <= 13; day++) for (let k = 0; k < 288; k++) reader.push(`${String(day).padStart(2, '0')}/01/2024;${String(Math.floor(k / 12)).padStart(2, '0')}:${String((k % 12) * 5).padStart(2, '0')};1;2`)
    const before = got.length
    expect(before).toBeGreaterThan(12 * 288) // all of them out before the end
    const s = reader.end()
    expect(s.recordCount).toBe(13 * 288)
    expect(s.dateOrder).toBe('dmy')
    expect(got[288]).toBe('2024-01-02T00:00:00')
  })
})

describe('decimal day of year and seconds since an epoch', () => {
  it('day of year with the year from the metadata', () => {
    const t = parseSizerText('year: 2024\nunits: nm\nquantity: dN\nDOY,10,20\n32.25,1,2\n60.5,1,2\n')
    expect(t.records.map((r) => r.time)).toEqual(['2024-02-01T06:00:00', '2024-02-29T12:00:00'])
    expect(t.timeFormat).toMatch(/day of year.*2024/)
  })

  it('day of year without a year: refused, and the option settles it', () => {
    const text = 'units: nm\nquantity: dN\nday of year,10,20\n32.25,1,2\n'
    const e = refusal(text)
    expect((e as SizerChoiceNeeded).choice).toBe('year')
    expect(parseSizerText(text, { year: 2023 }).records[0].time).toBe('2023-02-01T06:00:00')
  })

  it('seconds since an epoch named in the header', () => {
    const t = parseSizerText('units: nm\nquantity: dN\nseconds since 2024-03-01 00:00:00 UTC,10,20\n0,1,2\n3600.5,1,2\n')
    expect(t.records.map((r) => r.time)).toEqual(['2024-03-01T00:00:00Z', '2024-03-01T01:00:00.500Z'])
    expect(t.timeColumns[0].role).toBe('seconds since epoch')
  })

  it('seconds without an epoch stay labels, and the summary says so', () => {
    const t = parseSizerText('units: nm\nquantity: dN\ntime_s,10,20\n0,1,2\n300,3,4\n')
    expect(t.records.map((r) => r.time)).toEqual(['0', '300'])
    expect(t.records[0].timeMs).toBeNaN()
    expect(t.notes.join(' ')).toMatch(/kept as written/)
  })
})

describe('metadata blocks, comments and blank lines anywhere', () => {
  it('skips them and still locates bad cells by their line in the file', () => {
    const text = [
      '# Ridge-top campaign, valley mobility sizer (fictional)',
      'Site: Ridge-top hut (invented)',
      'units: nm',
      'quantity: dN/dlogDp',
      '',
      '# the table',
      'time,10,20,40',
      '2024-05-01 00:00,1,2,3',
      '',
      '# operator: flow check here',
      '2024-05-01 00:05,1,x,3',
      '2024-05-01 00:10,1,2,3',
      ''
    ].join('\n')
    const t = parseSizerText(text)
    expect(t.metadata.site).toMatch(/invented/)
    expect(t.records.map((r) => r.line)).toEqual([8, 12])
    expect(t.rejected.map((r) => [r.line, r.column])).toEqual([[11, 3]])
    expect(t.rowsLeftOut).toBe(1)
  })

  it('a bad time is a bad row, located', () => {
    const t = parseSizerText('units: nm\nquantity: dN\ntime,10,20\n2024-05-01 00:00,1,2\n2024-05-01 25:00,1,2\n')
    expect(t.rejected.map((r) => [r.line, r.column])).toEqual([[5, 1]])
  })
})

describe('numbers are read exactly as Number() reads them', () => {
  it('random decimals, exponents, signs and decimal commas', () => {
    let seed = 12345
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31)
    for (let i = 0; i < 20000; i++) {
      const digits = Math.floor(rnd() * 20) + 1
      let s = ''
      for (let k = 0; k < digits; k++) s += Math.floor(rnd() * 10)
      const p = Math.floor(rnd() * (digits + 1))
      s = s.slice(0, p) + (p < digits ? '.' : '') + s.slice(p)
      if (rnd() < 0.3) s += 'e' + (rnd() < 0.5 ? '-' : '') + Math.floor(rnd() * 40)
      if (rnd() < 0.2) s = '-' + s
      expect(parseCellNumber(s, false)).toBe(Number(s))
      expect(parseCellNumber(s.replace('.', ','), true)).toBe(Number(s))
    }
    for (const bad of ['', '1.2.3', '1,5', '1e', 'e5', '--1', '1 000', 'nan', 'Infinity', '0x10', '.']) expect(parseCellNumber(bad, false)).toBeNaN()
  })
})

describe('times of the other layouts', () => {
  it('one column per time: year-first dates in the header become ISO 8601', () => {
    const t = parseSizerText('units: nm\nquantity: dN\nDp (nm),2024-05-01 00:00,2024-05-01 01:00\n10,1,2\n20,3,4\n')
    expect(t.records.map((r) => r.time)).toEqual(['2024-05-01T00:00:00', '2024-05-01T01:00:00'])
    expect(t.records[1].timeMs - t.records[0].timeMs).toBe(3_600_000)
  })

  it('a single distribution: the time of its metadata line', () => {
    const t = parseSizerText('time: 2024-05-01 12:30\nDp (nm),dN\n10,1\n20,2\n')
    expect(t.records[0].time).toBe('2024-05-01T12:30:00')
  })
})

describe('the mean over a time range', () => {
  const t = parseSizerText('units: nm\nquantity: dN\ntime,10,20\n2024-05-01T00:00Z,1,10\n2024-05-01T00:05Z,2,20\n2024-05-01T00:10Z,6,60\n2024-05-01T00:15Z,100,100\n')
  it('is the bin-by-bin mean of the rows inside the range (ends included), with their count', () => {
    const m = averageRecords(t.records, { fromMs: Date.UTC(2024, 4, 1, 0, 0), toMs: Date.UTC(2024, 4, 1, 0, 10) })
    expect(m.count).toBe(3)
    expect(m.values).toEqual([3, 30])
    expect([m.firstTime, m.lastTime]).toEqual(['2024-05-01T00:00:00Z', '2024-05-01T00:10:00Z'])
  })
  it('the whole file by default; a range with no row is refused', () => {
    expect(averageRecords(t.records).count).toBe(4)
    expect(() => averageRecords(t.records, { fromMs: Date.UTC(2025, 0, 1) })).toThrow(InputError)
  })
})
