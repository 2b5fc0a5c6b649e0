// Optical instruments beside a sizer (src-core/field/optical*.ts): invented measured files made from a known
// distribution with the library's own bulk optics, their alignment to the sizer's rows on other clocks, gaps,
// the truncation correction, the ratio summary and bad input.
import { describe, expect, it } from 'vitest'
import {
  absorptionAt,
  comparisonColumns,
  computeSampleOptics,
  instrumentKernels,
  instrumentKernelsInputs,
  instrumentKernelsLength,
  packInstrumentKernels,
  InputError,
  MeasuredAlignment,
  nephelometerTruncation,
  OpticsWorkspace,
  parseOpticalText,
  percentileSorted,
  RatioCollector,
  RowComparer,
  type BinLayout,
  type ComparisonPlan,
  type MeasuredChannel,
  type Sample
} from '../../src-core/index.ts'
import { clock, logMidpoints, numberBetween, type Mode } from './synthetic.ts'

// The known distribution: an invented accumulation mode and a small coarse mode, on sizer bins of 16 a decade
// from 10 nm to 2 µm, of one constant index (dry, so the sizer sees the particles the optics use).
const MODES: Mode[] = [
  { n: 2500, cmdUm: 0.1, gsd: 1.7 },
  { n: 4, cmdUm: 0.9, gsd: 1.6 }
]
const MIDS_UM = logMidpoints(0.01, 2, 16)
const LAYOUT: BinLayout = { diameters: MIDS_UM.map((d) => d * 1000), diameter_unit: 'nm', edges: false, quantity: 'dN/dlogDp' }
function valuesOf(modes: Mode[]): number[] {
  const e = MIDS_UM.map((d, i) => (i === 0 ? d / Math.sqrt(MIDS_UM[1] / d) : Math.sqrt(MIDS_UM[i - 1] * d)))
  e.push(MIDS_UM[MIDS_UM.length - 1] * Math.sqrt(MIDS_UM[MIDS_UM.length - 1] / MIDS_UM[MIDS_UM.length - 2]))
  return MIDS_UM.map((_, i) => numberBetween(modes, e[i], e[i + 1]) / Math.log10(e[i + 1] / e[i]))
}
const VALUES = valuesOf(MODES)
const STUDY = { user_materials: [{ id: 'test-particles', name: 'invented particles', index: { kind: 'constant' as const, n: 1.53, k: 0.02 }, density_g_cm3: 1.8, kappa: 0 }] }
const SAMPLE: Sample = {
  name: 'known',
  size: { kind: 'bins', bins: { ...LAYOUT, diameters: LAYOUT.diameters.slice(), values: VALUES } },
  composition: { components: [{ material: 'test-particles', volume_fraction: 1 }], mixing: 'volume-average' },
  rh_percent: 0,
  rh_history: 'rising',
  layer: { kind: 'depth', depth_m: 1 }
}

/** The reference: the library's bulk optics of the whole distribution (one integration over all bins, not per-bin kernels). */
const ws = new OpticsWorkspace()
function reference(wavelengths: number[]) {
  return computeSampleOptics(SAMPLE, { ...STUDY, wavelengths_nm: wavelengths }, { tolerance: 1e-5, workspace: ws }).wavelengths
}

const SCA_WL = [450, 550, 700]
const ABS_WL = [370, 550, 880]

function channelsOf(text: string, allowed: ('scattering' | 'backscattering' | 'absorption')[], name: string): MeasuredChannel[] {
  return parseOpticalText(text, { fileName: name, allowed }).header.channels.map(({ quantity, wavelengthNm }) => ({ quantity, wavelengthNm, file: name }))
}

describe('measured files made from the computed figures of a known distribution', () => {
  const sca = reference(SCA_WL)
  const abs = reference(ABS_WL)
  // nephelometer: total and hemispheric backscattering (σsca·b, b from the library's Gauss-cosine sums); absorption
  // photometer at other wavelengths; both on their own clocks
  const nephText = [
    '# invented test file: an ideal nephelometer (no truncation) seeing the known distribution',
    '# units: Mm-1',
    ['time', ...SCA_WL.map((w) => `scattering ${w} nm`), ...SCA_WL.map((w) => `backscattering ${w} nm`)].join(','),
    ...clock('2026-06-01T10:00:50Z', 60, 10).map((t) => [t, ...sca.map((r) => r.sca), ...sca.map((r) => r.sca * r.backscatter_fraction)].join(','))
  ].join('\n')
  const absText = ['time;' + ABS_WL.map((w) => `absorption ${w} nm [Mm-1]`).join(';'), ...clock('2026-06-01T10:01:10Z', 120, 5).map((t) => [t, ...abs.map((r) => r.abs)].join(';'))].join('\n')

  const channels = [...channelsOf(nephText, ['scattering', 'backscattering'], 'neph.csv'), ...channelsOf(absText, ['absorption'], 'abs.csv')]
  const sizerTimes = clock('2026-06-01T10:00:20Z', 300, 2).map((t) => Date.parse(t))

  function aligned() {
    const a = new MeasuredAlignment(sizerTimes, channels)
    for (const r of parseOpticalText(nephText, { fileName: 'neph.csv', allowed: ['scattering', 'backscattering'] }).records) a.add(r.ms, 0, r.values, 'neph.csv')
    for (const r of parseOpticalText(absText, { fileName: 'abs.csv', allowed: ['absorption'] }).records) a.add(r.ms, 6, r.values, 'abs.csv')
    return a
  }

  it('gives ratios of 1 within the integration tolerance, without truncation', () => {
    const plan: ComparisonPlan = { channels, truncation: null, closure: null }
    const k = instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { tolerance: 1e-5, workspace: ws })
    const cmp = new RowComparer(k, plan)
    const a = aligned()
    const measured = a.measuredAt(0, new Float64Array(channels.length))
    const out = cmp.compare(VALUES, measured, new Float64Array(cmp.columns.length))
    const cell = (name: string) => out[cmp.columns.indexOf(name)]
    // per-bin kernels against one integration over the whole distribution, both to 1e-5: measured within 2e-5
    for (const w of SCA_WL) expect(Math.abs(cell(`sca_ratio_${w}nm`) - 1)).toBeLessThan(1e-4)
    for (const w of ABS_WL) expect(Math.abs(cell(`abs_ratio_${w}nm`) - 1)).toBeLessThan(1e-4)
    // backscattering: the nephelometer quadrature in θ (src-core/instruments) against the library's 32 Gauss cosines
    // per hemisphere, two different angular rules on the same phase function: within 1e-3
    for (const w of SCA_WL) expect(Math.abs(cell(`bsca_ratio_${w}nm`) - 1)).toBeLessThan(1e-3)
    // ω measured where absorption is measured at the scattering wavelength (550 nm) is the computed ω
    expect(Math.abs(cell('ssa_meas_550nm') - sca[1].ssa)).toBeLessThan(1e-4)
    // between 370 and 550 nm, σabs of constant k is close to, not exactly, a power law: ω within 1e-3
    expect(Math.abs(cell('ssa_meas_450nm') - sca[0].ssa)).toBeLessThan(1e-3)
  })

  it('applies the truncation correction the nephelometer tool gives for the same distribution', () => {
    const geometry = { lowDeg: 7, highDeg: 170 }
    const plan: ComparisonPlan = { channels, truncation: geometry, closure: null }
    const k = instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { tolerance: 1e-5, workspace: ws })
    const cmp = new RowComparer(k, plan)
    // what a truncating nephelometer would read: σ/C with C from src-core's nephelometer tool (the row's whole phase function)
    const tool = SCA_WL.map((w) => nephelometerTruncation(SAMPLE, STUDY, geometry, { wavelengthNm: w, tolerance: 1e-5 }))
    const measured = new Float64Array(channels.length).fill(NaN)
    SCA_WL.forEach((w, i) => {
      measured[i] = tool[i].sca_measured_mm
      measured[3 + i] = (sca[i].sca * sca[i].backscatter_fraction) / tool[i].backscatter
    })
    const out = cmp.compare(VALUES, measured, new Float64Array(cmp.columns.length))
    const cell = (name: string) => out[cmp.columns.indexOf(name)]
    SCA_WL.forEach((w, i) => {
      expect(tool[i].total).toBeGreaterThan(1.005) // a real correction: the known factor is not 1
      // per-bin kernels (ratio of dot products) against the tool's population phase function: within 1e-3
      expect(Math.abs(cell(`truncation_C_${w}nm`) / tool[i].total - 1)).toBeLessThan(1e-3)
      expect(Math.abs(cell(`truncation_Cback_${w}nm`) / tool[i].backscatter - 1)).toBeLessThan(1e-3)
      expect(Math.abs(cell(`sca_ratio_${w}nm`) - 1)).toBeLessThan(1e-3)
      expect(Math.abs(cell(`bsca_ratio_${w}nm`) - 1)).toBeLessThan(2e-3)
    })
  })
})

describe('instrument kernels kept between runs (packInstrumentKernels, instrumentKernelsInputs)', () => {
  const chans = (q: 'scattering' | 'backscattering' | 'absorption', wls: number[]): MeasuredChannel[] => wls.map((wavelengthNm) => ({ quantity: q, wavelengthNm, file: `${q}.csv` }))
  const full: ComparisonPlan = { channels: [...chans('scattering', SCA_WL), ...chans('backscattering', SCA_WL), ...chans('absorption', ABS_WL)], truncation: { lowDeg: 7, highDeg: 170 }, closure: null }
  const bitsOf = (a: Float64Array) => Array.from(new BigUint64Array(a.buffer, a.byteOffset, a.length))

  it('kernels made from their packed figures are the integrated ones, bit for bit; a packed array of another size is refused', () => {
    for (const plan of [full, { ...full, truncation: null }, { ...full, channels: chans('absorption', ABS_WL), truncation: null }]) {
      const made = instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { tolerance: 1e-4 })
      const packed = packInstrumentKernels(made)
      expect(packed.length).toBe(instrumentKernelsLength(LAYOUT, plan))
      const back = instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { tolerance: 1e-4, integrated: packed })
      expect(bitsOf(packInstrumentKernels(back))).toEqual(bitsOf(packed))
      expect([...back.angular.keys()]).toEqual([...made.angular.keys()])
      expect(back.quadrature?.anglesDeg).toEqual(made.quadrature?.anglesDeg)
      // the same comparison of a row either way
      const a = new Float64Array(comparisonColumns(plan).length)
      const b = new Float64Array(a.length)
      const measured = Float64Array.from(plan.channels, (_, i) => 10 + i)
      new RowComparer(made, plan).compare(VALUES, measured, a)
      new RowComparer(back, plan).compare(VALUES, measured, b)
      expect(bitsOf(b)).toEqual(bitsOf(a))
      expect(() => instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { integrated: packed.subarray(1) })).toThrow(/values given where/)
    }
  })

  it('the inputs text changes with the angles, the angular wavelengths, the sample and the tolerance, and only with them', () => {
    const key = (plan: ComparisonPlan, sample: Sample = SAMPLE, tolerance = 1e-4) => instrumentKernelsInputs(sample, STUDY, LAYOUT, plan, tolerance)
    const base = key(full)
    expect(key({ ...full, closure: { scatteringSd: 0.1, absorptionSd: 0.25 } })).toBe(base) // the closure is per row
    expect(key({ ...full, channels: [...full.channels].reverse() })).toBe(base)
    expect(key({ ...full, truncation: { lowDeg: 10, highDeg: 170 } })).not.toBe(base)
    expect(key({ ...full, channels: full.channels.filter((c) => c.wavelengthNm !== 700 || c.quantity === 'absorption') })).not.toBe(base)
    expect(key(full, { ...SAMPLE, rh_percent: 50 })).not.toBe(base)
    expect(key(full, SAMPLE, 1e-3)).not.toBe(base)
    // no truncation but backscattering: the default angles' kernels, the same as with those angles given
    expect(key({ ...full, truncation: null })).toBe(key({ ...full, truncation: { lowDeg: 7, highDeg: 170 } }))
  })
})

describe('closure per row', () => {
  it('finds the known index of the invented particles from coefficients computed with it', () => {
    // measured = the library's bulk optics of the known distribution with m = 1.53 + 0.02i (a closure consistency
    // check: the retrieval must return the index the coefficients were made with, within its own uncertainty)
    const [r450, r700] = reference([450, 700])
    const channels: MeasuredChannel[] = [
      { quantity: 'scattering', wavelengthNm: 450 },
      { quantity: 'scattering', wavelengthNm: 700 },
      { quantity: 'absorption', wavelengthNm: 450 },
      { quantity: 'absorption', wavelengthNm: 700 }
    ]
    const plan: ComparisonPlan = { channels, truncation: null, closure: { scatteringSd: 0.05, absorptionSd: 0.1 } }
    const cmp = new RowComparer(instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { tolerance: 1e-4, workspace: ws }), plan)
    const out = cmp.compare(VALUES, [r450.sca, r700.sca, r450.abs, r700.abs], new Float64Array(cmp.columns.length))
    const cell = (name: string) => out[cmp.columns.indexOf(name)]
    expect(Math.abs(cell('closure_n') - 1.53)).toBeLessThan(2 * cell('closure_n_sd'))
    expect(Math.abs(cell('closure_k') - 0.02)).toBeLessThan(2 * cell('closure_k_sd'))
    expect(cell('closure_chi2')).toBeLessThan(1)
    expect(cell('closure_unique')).toBe(1)
    // no measured data: no closure (empty, never a guess)
    const none = cmp.compare(VALUES, [NaN, NaN, NaN, NaN], new Float64Array(cmp.columns.length))
    expect(none[cmp.columns.indexOf('closure_n')]).toBeNaN()
  }, 180_000)
})

describe('alignment of instruments on other clocks to the sizer rows', () => {
  // sizer rows every 5 min at :20 s; nephelometer every minute at :50 s; absorption every 2 min at :10 s
  const sizer = clock('2026-06-01T10:00:20Z', 300, 4).map((t) => Date.parse(t))
  const channels: MeasuredChannel[] = [
    { quantity: 'scattering', wavelengthNm: 550 },
    { quantity: 'absorption', wavelengthNm: 660 }
  ]
  it('averages the records stamped inside each row, leaves rows without records empty and does not count empty cells', () => {
    const a = new MeasuredAlignment(sizer, channels)
    // value = minutes after 10:00 of the stamp, so each row's mean is known by hand
    const neph = clock('2026-06-01T09:59:50Z', 60, 21, (t) => t >= new Date('2026-06-01T10:10:20Z') && t < new Date('2026-06-01T10:15:20Z'))
    let outside = 0
    for (const t of neph) {
      const ms = Date.parse(t)
      const minutes = (ms - Date.parse('2026-06-01T10:00:00Z')) / 60000
      // the record at 10:03:50 has no scattering value (an empty cell)
      if (a.add(ms, 0, [t.endsWith('10:03:50Z') ? NaN : minutes]) < 0) outside++
    }
    for (const t of clock('2026-06-01T10:00:10Z', 120, 10)) a.add(Date.parse(t), 1, [1 + (Date.parse(t) - Date.parse('2026-06-01T10:00:00Z')) / 60000])
    const m = new Float64Array(2)
    // row 1 [10:00:20, 10:05:20): records at 0:50, 1:50, 2:50, 4:50 (3:50 empty) → mean of 0.8333…, 1.8333…, 2.8333…, 4.8333…
    a.measuredAt(0, m)
    expect(m[0]).toBeCloseTo((0.8333333 + 1.8333333 + 2.8333333 + 4.8333333) / 4, 6)
    // absorption at 10:02:10 and 10:04:10 → 1 + 2.1667 and 1 + 4.1667
    expect(m[1]).toBeCloseTo(1 + (2.1666667 + 4.1666667) / 2, 6)
    // row 3 [10:10:20, 10:15:20): the nephelometer was off → empty, never filled; absorption still there
    a.measuredAt(2, m)
    expect(m[0]).toBeNaN()
    expect(m[1]).toBeGreaterThan(0)
    // only the record at 09:59:50 lies outside every row (before the first); the last row runs to 10:20:20
    expect(outside).toBe(1)
  })

  it('leaves the comparison cells of a row without measured data empty', () => {
    const plan: ComparisonPlan = { channels, truncation: null, closure: null }
    const k = instrumentKernels(SAMPLE, STUDY, LAYOUT, plan, { tolerance: 1e-3 })
    const cmp = new RowComparer(k, plan)
    const out = cmp.compare(VALUES, [NaN, NaN], new Float64Array(cmp.columns.length))
    expect(cmp.columns).toEqual(['sca_meas_550nm_Mm-1', 'sca_ratio_550nm', 'abs_meas_660nm_Mm-1', 'abs_ratio_660nm', 'ssa_meas_550nm'])
    for (const v of out) expect(v).toBeNaN()
  })
})

describe('the absorption Ångström interpolation', () => {
  it('is exact for a power law inside and beyond the measured wavelengths, and assumes an exponent of 1 with one wavelength', () => {
    // b(λ) = 10 (λ/500)^−1.3: log-log interpolation between two points of a power law returns the power law
    const b = (w: number) => 10 * Math.pow(w / 500, -1.3)
    const wl = [370, 520, 880]
    const v = wl.map(b)
    for (const w of [450, 550, 700, 950, 300]) expect(absorptionAt(w, wl, v) / b(w)).toBeCloseTo(1, 12)
    expect(absorptionAt(440, [660], [5])).toBeCloseTo(5 * (660 / 440), 12)
    expect(absorptionAt(550, wl, [NaN, NaN, NaN])).toBeNaN()
  })
})

describe('the ratio summary', () => {
  it('gives the median and 5–95 % range of 1..100 by Hyndman & Fan type 7', () => {
    // type 7: h = (n − 1)p; for 1..100: median 50.5, p5 = 5 + 0.95·1 = 5.95, p95 = 95 + 0.05·1 = 95.05
    // (Hyndman & Fan 1996, definition 7; NumPy's default percentile gives the same, from memory)
    const c = new RatioCollector(['time_not_a_ratio', 'sca_ratio_550nm'])
    const order = Array.from({ length: 100 }, (_, i) => ((i * 37) % 100) + 1) // 1..100 shuffled
    for (const x of order) c.add([0, x])
    c.add([0, NaN]) // an empty ratio is not counted
    const [s] = c.summary()
    expect(s).toEqual({ column: 'sca_ratio_550nm', count: 100, median: 50.5, p5: expect.closeTo(5.95, 12), p95: expect.closeTo(95.05, 12) })
    expect(percentileSorted([], 0.5)).toBeNaN()
    expect(percentileSorted([3], 0.05)).toBe(3)
  })
})

describe('bad measured files', () => {
  const read = (text: string, allowed: ('scattering' | 'backscattering' | 'absorption')[] = ['scattering', 'backscattering']) => () => parseOpticalText(text, { fileName: 'neph.csv', allowed, allowedWhere: '--scattering' })
  const fails = (f: () => unknown, where: string, fix: RegExp) => {
    try {
      f()
    } catch (e) {
      expect(e).toBeInstanceOf(InputError)
      expect((e as InputError).where).toBe(where)
      expect((e as InputError).fix).toMatch(fix)
      return
    }
    throw new Error('no error')
  }
  const head = '# units: Mm-1\ntime,scattering 450 nm,scattering 550 nm'
  it('locates each problem by file, line and column with a fix', () => {
    // a file none of whose rows can be read stops at the first one
    fails(read(`${head}\n2026-06-01T10:00:00Z,12.5,abc`), 'neph.csv line 3 column 3', /decimal point/)
    fails(read(`${head}\n01/06/2026 10:00,12.5,9.1`), 'neph.csv line 3 column 1', /ISO 8601/)
    fails(read(`${head}\n2026-06-01T10:01:00Z,1,2\n2026-06-01T10:00:00Z,1,2`), 'neph.csv line 4 column 1', /Sort the rows/)
    fails(read(`${head}\n2026-06-01T10:00:00Z,1,2\n2026-06-01T10:01:00,1,2`), 'neph.csv line 4 column 1', /same form/)
    fails(read('# units: Mm-1\ntime,scattering 450 nm,sigma 550'), 'neph.csv line 2 column 3', /QUANTITY WAVELENGTH nm/)
    fails(read('# units: Mm-1\ntime,scattering 450 nm,absorption 660 nm'), 'neph.csv line 2 column 3', /its own file/)
    fails(read('time,scattering 450 nm\n2026-06-01T10:00:00Z,1'), 'neph.csv line 1', /# units: Mm-1/)
    fails(read('# units: m-1\ntime,scattering 450 nm\n2026-06-01T10:00:00Z,1'), 'neph.csv: units', /Convert/)
    fails(read('time,scattering 450 nm [1/m]\n2026-06-01T10:00:00Z,1'), 'neph.csv line 1 column 2', /Convert/)
    fails(read(`${head}`), 'neph.csv line 2', /one row per time/)
  })
  it('leaves out rows with a bad time, a bad cell or too many cells, lists them located with a fix, and reads the others as the clean file', () => {
    const good = ['2026-06-01T10:00:00Z,12.5,9.1', '2026-06-01T10:02:00Z,13.0,9.4', '2026-06-01T10:04:00Z,,9.8']
    const clean = read(`${head}\n${good.join('\n')}`)()
    const messy = read(`${head}\n${good[0]}\n2026-06-01T10:01:00Z,12.5,9..1\n${good[1]}\n2026-06-01T25:03:00Z,13.1,9.5\n\n${good[2]}\n2026-06-01T10:05:00Z,1,2,3`)()
    expect(messy.records.map((r) => r.line)).toEqual([3, 5, 8])
    expect(messy.records.map((r) => [r.time, ...r.values])).toEqual(clean.records.map((r) => [r.time, ...r.values]))
    expect(messy.rejectedCount).toBe(3)
    expect(messy.rejected.map((r) => [r.line, r.column])).toEqual([
      [4, 3],
      [6, 1],
      [9, 4]
    ])
    expect(messy.rejected[0].reason).toBe('"9..1" (scattering 550 nm) is not a number; the row is left out')
    expect(messy.rejected[1].reason).toMatch(/^"2026-06-01T25:03:00Z" is not a time stamp; the row is left out$/)
    expect(messy.rejected[1].fix).toMatch(/ISO 8601/)
    expect(messy.rejected[2].fix).toMatch(/one value per header column/)
    expect(clean.rejectedCount).toBe(0)
  })
  it('reads day/month/year and month/day/year times as their ISO 8601 twin, with the order stated or detected, and refuses an order the dates do not settle', () => {
    const iso = read(`${head}\n2026-06-03T10:00:00Z,1,2\n2026-06-13T10:05:30Z,3,4\n2026-07-01T00:00:00Z,5,6`)()
    const same = (r: ReturnType<ReturnType<typeof read>>) => expect(r.records.map((x) => [x.time, x.ms, x.zoned, ...x.values])).toEqual(iso.records.map((x) => [x.time, x.ms, x.zoned, ...x.values]))
    // detected: the second row's day 13 settles day/month/year; the first row waits for it
    same(read(`${head}\n03/06/2026 10:00Z,1,2\n13/06/2026 10:05:30Z,3,4\n01/07/2026 00:00Z,5,6`)())
    same(read(`${head}\n06/03/2026 10:00 UTC,1,2\n06/13/2026 10:05:30 UTC,3,4\n07/01/2026 00:00 UTC,5,6`)())
    // stated: no date has a part above 12, the "# date format" line says which is the day
    same(read(`# date format: dd/mm/yyyy\n${head}\n03.06.2026 10:00Z,1,2\n2026-06-13T10:05:30Z,3,4\n01.07.2026 00:00Z,5,6`)())
    // never guessed: refused at the first row with the fix
    fails(read(`${head}\n03/06/2026 10:00Z,1,2\n04/06/2026 10:00Z,3,4`), 'neph.csv line 3 column 1', /# date format: dd\/mm\/yyyy/)
    // a date that is no date in either order settles nothing: its row is left out, the next one decides
    const odd = read(`${head}\n03/06/2026 10:00Z,1,2\n13/13/2026 10:00Z,9,9\n13/06/2026 10:05:30Z,3,4\n01/07/2026 00:00Z,5,6`)()
    expect(odd.records.map((x) => x.line)).toEqual([3, 5, 6])
    expect(odd.rejected.map((x) => [x.line, x.column])).toEqual([[4, 1]])
    // a date impossible in the detected order is a bad time: its row is left out, located
    const r = read(`${head}\n13/06/2026 10:00Z,1,2\n06/14/2026 10:05Z,3,4\n15/06/2026 10:00Z,5,6`)()
    expect(r.records.map((x) => x.line)).toEqual([3, 5])
    expect(r.rejected.map((x) => [x.line, x.column, x.reason])).toEqual([[4, 1, '"06/14/2026 10:05Z" is not a date and time in day/month/year order (detected from line 3: 13/06/2026 10:00Z); the row is left out']])
  })
  it('reads empty cells and NaN as no data, keeps small negative values, and takes the unit from the header cells', () => {
    const { header, records } = read('# station: invented\ntime\tscattering 450 nm [Mm-1]\tbackscattering 450 nm (Mm^-1)\n\n2026-06-01 10:00\t-0.4\t\n# a comment\n2026-06-01 10:01\tNaN\t0.2')()
    expect(header.delimiter).toBe('\t')
    expect(header.metadata.station).toBe('invented')
    expect(header.channels.map((c) => `${c.quantity} ${c.wavelengthNm} ${c.column}`)).toEqual(['scattering 450 2', 'backscattering 450 3'])
    expect(records.map((r) => Array.from(r.values))).toEqual([
      [-0.4, NaN],
      [NaN, 0.2]
    ])
    expect(records.map((r) => r.line)).toEqual([4, 6]) // metadata, header, blank, row, comment, row
    expect(records[0].zoned).toBe(false)
  })
})
