// The campaign of a study (src-core/field/campaign*.ts): its settings in the document, the record made from the
// invented valley files (resources/field), a stretch of it made into a sample, and its CSV against `motebench
// series` on the file `motebench merge` writes from the same files.
import { readFileSync } from 'node:fs'
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  averageRecords,
  buildCampaignRecord,
  computeSampleOptics,
  demoStudy,
  InputError,
  parseSizerText,
  parseStudy,
  recordCsv,
  recordSeries,
  relativeFilePath,
  resolveFilePath,
  serializeStudy,
  stretchSample,
  type CampaignInput,
  type CampaignSettings,
  type Study
} from '../../src-core/index.ts'
import { runMerge } from '../../src-main/cli/merge.ts'
import { runSeries } from '../../src-main/cli/series.ts'
import { repo, runHere } from '../cli/helpers.ts'

const demoPath = (name: string) => join(repo, 'resources/field', name)
const input = (kind: CampaignInput['kind'], name: string): CampaignInput => ({ kind, name, text: readFileSync(demoPath(name), 'utf8') })
const settings = (over: Partial<CampaignSettings> = {}): CampaignSettings => ({
  files: [],
  sample: 'Quarry dust event',
  wavelength_nm: 550,
  density_g_cm3: 1.8,
  shape_factor: 1,
  ...over
})
const study = (): Study => demoStudy()
const withCampaign = (c: unknown) => JSON.stringify({ ...JSON.parse(serializeStudy(study())), campaign: c })

describe('the campaign in the study document', () => {
  it('keeps file references and merge parameters, and reads them back', () => {
    const c = settings({ files: [{ kind: 'mobility', path: 'field/valley-mobility.csv' }, { kind: 'aerodynamic', path: 'field/valley-aerodynamic.csv' }], step_s: 300 })
    const r = parseStudy(withCampaign(c))
    expect(r.ok).toBe(true)
    if (r.ok) expect(r.study.campaign).toEqual(c)
  })

  it('says what a campaign being set up still needs, and how to fix it, without refusing the study', () => {
    const c = { ...settings({ files: [{ kind: 'aerodynamic', path: 'a.csv' }, { kind: 'aerodynamic', path: 'b.csv' }, { kind: 'optical', path: 'c.csv' }] }), density_g_cm3: undefined, sample: 'Nope' }
    const r = parseStudy(withCampaign(c))
    expect(r.ok).toBe(true)
    if (!r.ok) return
    const w = r.warnings.join('\n')
    expect(w).toMatch(/campaign.files\[1\].kind: a second aerodynamic sizer file/)
    expect(w).toMatch(/campaign.density_g_cm3: an aerodynamic sizer needs the particle density.*; Give the particle density/)
    expect(w).toMatch(/campaign.counter: /)
    expect(w).toMatch(/campaign.sample: no sample is named "Nope"/)
    // the record is not made until they are settled
    const mob = input('mobility', 'valley-mobility.csv')
    const aer = input('aerodynamic', 'valley-aerodynamic.csv')
    expect(() => buildCampaignRecord([mob, aer], settings({ density_g_cm3: undefined }), study())).toThrow(/needs the particle density/)
    const bad = parseStudy(withCampaign(settings({ shape_factor: 0.5 })))
    expect(bad.ok).toBe(false)
    if (!bad.ok) expect(bad.problems[0].path).toBe('campaign.shape_factor')
  })

  it('keeps paths relative to the study file, and resolves them back', () => {
    expect(relativeFilePath('/home/e/studies/valley.mote', '/home/e/data/neph.csv')).toBe('../data/neph.csv')
    expect(relativeFilePath('/home/e/studies/valley.mote', '/home/e/studies/field/m.csv')).toBe('field/m.csv')
    expect(resolveFilePath('/home/e/studies/valley.mote', '../data/neph.csv')).toBe('/home/e/data/neph.csv')
    // another drive stays absolute; an unsaved study keeps the path as given
    expect(relativeFilePath('C:\\work\\v.mote', 'D:\\data\\m.csv')).toBe('D:/data/m.csv')
    expect(relativeFilePath(undefined, '/data/m.csv')).toBe('/data/m.csv')
    expect(resolveFilePath(undefined, 'field/m.csv')).toBeUndefined()
  })
})

describe('the record of the valley campaign', () => {
  const files = [input('mobility', 'valley-mobility.csv'), input('aerodynamic', 'valley-aerodynamic.csv'), input('scattering', 'valley-nephelometer.csv'), input('absorption', 'valley-absorption.csv')]
  const build = buildCampaignRecord(files, settings({ files: files.map((f) => ({ kind: f.kind, path: f.name })) }), study())
  const r = build.record!

  it('summarises every file as it was read', () => {
    expect(build.problem).toBeUndefined()
    const [mob, aer, neph, abs] = build.files
    expect(mob.ok && aer.ok && neph.ok && abs.ok).toBe(true)
    // the demo files (counted in the files): 72 mobility rows of 5 min, 62 mobility bins in its header row, 1 min aerodynamic
    expect(mob.rows).toBe(72)
    expect(mob.bins).toBe(62)
    expect(mob.interval).toBe('5 min')
    expect(aer.interval).toBe('1 min')
    expect(mob.firstTime).toBe('2026-06-01T08:00:20Z')
    expect(neph.channels).toContain('scattering 550 nm')
    expect(abs.channels).toEqual(['absorption 370 nm', 'absorption 520 nm', 'absorption 880 nm'])
  })

  it('marks the steps without the aerodynamic sizer as gaps, with null in every charted figure', () => {
    // the demo's aerodynamic sizer is off for 40 minutes (make-demo-files.ts): 8 steps of 5 min
    expect(r.gaps.size).toBe(8)
    for (const why of r.gaps.values()) expect(why).toBe('only mobility had data')
    const s = recordSeries(r)
    for (let i = 0; i < s.x.length; i++) {
      const row = s.row[i]
      for (const [name, v] of Object.entries(s.values)) {
        if (row >= 0 && r.present[row] && !name.includes('meas') && !name.includes('ratio')) expect(v[i], `${name} at ${i}`).not.toBeNull()
        if (row < 0 || !r.present[row]) expect(v[i]).toBeNull()
        if (v[i] !== null) expect(Number.isFinite(v[i])).toBe(true)
      }
    }
  })

  it('gives each row the number its bins hold (Σ dN/dlogD Δlog₁₀D, a conservation check)', () => {
    const k = r.present.indexOf(1)
    let sum = 0
    for (let j = 0; j < r.bins; j++) sum += r.dNdlogD[k * r.bins + j] * Math.log10(r.edgesUm[j + 1] / r.edgesUm[j])
    expect(r.cells[k * r.columns.length + r.columns.indexOf('dry_number_cm-3')] / sum).toBeCloseTo(1, 12)
  })

  it('compares the measured scattering and absorption beside the computed', () => {
    const s = recordSeries(r)
    expect(s.scatteringAtNm).toBe(550)
    const ratios = s.values.sca_ratio.filter((v): v is number => v !== null).sort((a, b) => a - b)
    expect(ratios.length).toBeGreaterThan(40)
    // the demo nephelometer reads σ/C with C > 1.15 for this coarse dust (README, optical-cli.test.ts), so the
    // uncorrected ratio computed/measured lies above 1.1
    expect(ratios[ratios.length >> 1]).toBeGreaterThan(1.1)
    // absorption made from the same aerosol (make-optical-demo-files.ts): carried to 550 nm, within a few per cent of 1
    const a = s.values.abs_ratio.filter((v): v is number => v !== null).sort((x, y) => x - y)
    expect(Math.abs(a[a.length >> 1] - 1)).toBeLessThan(0.05)
  })

  it('makes a one-row stretch into that row, and a longer one into the mean of its rows', () => {
    const k = r.present.indexOf(1)
    const one = stretchSample(r, r.times[k], r.times[k])
    expect(one.rows).toBe(1)
    const b = one.sample.size.kind === 'bins' ? one.sample.size.bins : undefined
    expect(b?.values).toEqual(Array.from(r.values.subarray(k * r.bins, (k + 1) * r.bins)))
    expect(b?.spread?.every((x) => x === 0)).toBe(true)
    expect(one.sample.name).toBe(`${r.timeText[k]}/${r.timeText[k]}`)
    expect(one.sample.composition).toEqual(r.sample.composition)
    // a stretch across the gap: its rows with data averaged, the gap rows counted and left out
    const [g0] = [...r.gaps.keys()]
    const s = stretchSample(r, r.times[g0 - 3], r.times[g0 + 10])
    expect(s.gapRows).toBe(8)
    expect(s.rows).toBe(14 - 8)
    expect(s.sample.size.kind === 'bins' && s.sample.size.bins.source).toMatch(/8 gap rows left out/)
  })

  it('refuses a stretch with no data instead of making an empty sample', () => {
    const [g0] = [...r.gaps.keys()]
    expect(() => stretchSample(r, r.times[g0], r.times[g0 + 2])).toThrow(InputError)
    expect(() => stretchSample(r, r.times[g0], r.times[g0 + 2])).toThrow(/gaps without a distribution/)
    expect(() => stretchSample(r, 0, 1)).toThrow(/no row of the record starts/)
  })

  it("gives a sample whose full optics equal the mean of the rows' figures (the optics are linear in the distribution)", () => {
    const k0 = r.present.indexOf(1)
    const s = stretchSample(r, r.times[k0], r.times[k0 + 5])
    const w = r.columns.length
    const mean = (name: string) => {
      let sum = 0
      for (let k = k0; k <= k0 + 5; k++) sum += r.cells[k * w + r.columns.indexOf(name)]
      return sum / 6
    }
    const o = computeSampleOptics(s.sample, { wavelengths_nm: [550], user_materials: study().user_materials })
    // independent path: the full size integration of the mean bins, at its 1e-4 tolerance (README, Accuracy)
    expect(o.wavelengths[0].ext / mean('ext_550nm_Mm-1')).toBeCloseTo(1, 3)
    expect(o.wavelengths[0].abs / mean('abs_550nm_Mm-1')).toBeCloseTo(1, 3)
    expect(o.number_cm3 / mean('dry_number_cm-3')).toBeCloseTo(1, 6)
  })
})

describe('one sizer file taken row by row', () => {
  it("averages a stretch as the sizer import's mean of the same rows does", () => {
    const f = input('mobility', 'valley-mobility.csv')
    const r = buildCampaignRecord([f], settings({ files: [{ kind: 'mobility', path: f.name }] }), study()).record!
    const table = parseSizerText(f.text, { fileName: f.name })
    const from = r.times[10]
    const to = r.times[20]
    const ref = averageRecords(table.records, { fromMs: from, toMs: to })
    const s = stretchSample(r, from, to)
    expect(s.rows).toBe(ref.count)
    const values = s.sample.size.kind === 'bins' ? s.sample.size.bins.values : []
    values.forEach((v, j) => expect(v).toBeCloseTo(ref.values[j], 9))
  })

  it('refuses a file it cannot read with the reason and the fix, and goes on with the others', () => {
    const broken: CampaignInput = { kind: 'scattering', name: 'neph.csv', text: 'time,scattering 550 nm\n2026-06-01T08:00:00Z,20\n' }
    const mob = input('mobility', 'valley-mobility.csv')
    const b = buildCampaignRecord([mob, broken], settings(), study())
    expect(b.record).toBeDefined()
    expect(b.files[1].ok).toBe(false)
    expect(b.files[1].error?.problem).toMatch(/unit/i)
    expect(b.files[1].error?.fix.length).toBeGreaterThan(10)
    const none = buildCampaignRecord([broken], settings(), study())
    expect(none.record).toBeUndefined()
    expect(none.problem?.message).toMatch(/no sizer/)
  })
})

describe('the record as CSV against motebench series', () => {
  let dir: string
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'motebench-campaign-'))
  })
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true })
  })

  it('writes what series writes on the merged file, to the printed precision', async () => {
    const merged = join(dir, 'merged.csv')
    const m = await runHere(runMerge, ['--mobility', demoPath('valley-mobility.csv'), '--aerodynamic', demoPath('valley-aerodynamic.csv'), '--density', '1.8', '--shape-factor', '1', '--out', merged])
    expect(m.code, m.stderr).toBe(0)
    const files = [input('mobility', 'valley-mobility.csv'), input('aerodynamic', 'valley-aerodynamic.csv'), input('scattering', 'valley-nephelometer.csv'), input('absorption', 'valley-absorption.csv')]
    const st = study()
    const r = buildCampaignRecord(files, settings(), st).record!
    const out = join(dir, 'record.csv')
    const s = await runHere(runSeries, [
      merged, '--study', join(repo, 'resources/demo.mote'), '--sample', 'Quarry dust event', '--wavelengths', r.wavelengthsNm.join(','),
      '--scattering', demoPath('valley-nephelometer.csv'), '--absorption', demoPath('valley-absorption.csv'), '--workers', '1', '--out', out
    ])
    expect(s.code, s.stderr).toBe(1) // the gap rows are left out by series, listed
    const theirs = (await readFile(out, 'utf8')).trimEnd().split('\n')
    const ours = recordCsv(r).trimEnd().split('\n')
    // the "#" lines name the files by path in series; compare the table
    const table = (lines: string[]) => lines.filter((l) => !l.startsWith('#'))
    expect(table(ours)).toEqual(table(theirs))
  }, 120_000)

  it("says, in the same words, at what humidity the rows are computed and what the nephelometer recorded", async () => {
    // the demo's nephelometer file with an RH column added: 30 % rising by 0.1 % a record (invented)
    const lines = readFileSync(demoPath('valley-nephelometer.csv'), 'utf8').trimEnd().split('\n')
    let k = 0
    const withRh = lines.map((l) => (l.startsWith('#') ? l : l.startsWith('time') ? `${l},RH (%)` : `${l},${(30 + 0.1 * k++).toFixed(1)}`)).join('\n') + '\n'
    const neph = join(dir, 'neph-rh.csv')
    await writeFile(neph, withRh)
    const merged = join(dir, 'merged-rh.csv')
    expect((await runHere(runMerge, ['--mobility', demoPath('valley-mobility.csv'), '--aerodynamic', demoPath('valley-aerodynamic.csv'), '--density', '1.8', '--shape-factor', '1', '--out', merged])).code).toBe(0)
    const st = study()
    const files = [input('mobility', 'valley-mobility.csv'), input('aerodynamic', 'valley-aerodynamic.csv'), { kind: 'scattering' as const, name: 'neph-rh.csv', text: withRh }]
    const r = buildCampaignRecord(files, settings(), st).record!
    const out = join(dir, 'record-rh.csv')
    const s = await runHere(runSeries, [merged, '--study', join(repo, 'resources/demo.mote'), '--sample', 'Quarry dust event', '--wavelengths', r.wavelengthsNm.join(','), '--scattering', neph, '--workers', '1', '--out', out])
    expect(s.code, s.stderr).toBe(1)
    const note = (text: string) => text.split('\n').filter((l) => l.startsWith('# humidity:'))
    const rh = st.samples.find((x) => x.name === 'Quarry dust event')!.rh_percent
    // k records from 30.0 %: mean 30 + 0.05 (k − 1), highest 30 + 0.1 (k − 1)
    const mean = Math.round((30 + 0.05 * (k - 1)) * 10) / 10
    const top = Math.round((30 + 0.1 * (k - 1)) * 10) / 10
    const expected = [`# humidity: the rows are computed at the sample's ${rh} %; neph-rh.csv recorded ${mean} % on average (30 to ${top} %, ${k} records), so where they differ the scattering ratios include the particles' growth between the two humidities`]
    expect(note(recordCsv(r))).toEqual(expected)
    expect(note(await readFile(out, 'utf8'))).toEqual(expected)
  }, 120_000)
})

describe('the fingerprint kept with a file reference', () => {
  it('notices a file that grew, was cut or had its head or tail changed', async () => {
    const { textFingerprint } = await import('../../src-core/index.ts')
    const text = readFileSync(demoPath('valley-aerodynamic.csv'), 'utf8')
    const f = textFingerprint(text)
    expect(textFingerprint(text)).toBe(f)
    expect(textFingerprint(text + '2026-06-01T14:00:45Z,1\n')).not.toBe(f)
    expect(textFingerprint(text.slice(0, -40))).not.toBe(f)
    expect(textFingerprint('X' + text.slice(1))).not.toBe(f)
  })
})
