// motebench study on the demo study (resources/demo.mote), run in this process through the CLI's runGuarded.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runStudy } from '../../src-main/cli/study.ts'
import { expectOneLine, repo, runHere } from './helpers.ts'

const demo = join(repo, 'resources/demo.mote')
let dir: string
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-study-'))
})
afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

/** A CSV line split into cells (the demo's names hold no commas or quotes). */
const cellsOf = (line: string) => line.split(',')
// Chylek & Wong (1995) critical single-scattering albedo.
const critical = (rs: number, b: number) => (2 * rs) / (2 * rs + b * (1 - rs) ** 2)

describe('motebench study', () => {
  it('JSON: each chosen sample with optics at every wavelength, figures, forcing and verdict', async () => {
    // the demo's fine-particle samples (its dust and sea-salt samples take far longer, being coarse)
    const chosen = ['Winter wood smoke', 'Aged soot with sulfate coating', 'Humid sulfate–nitrate episode']
    const r = await runHere(runStudy, [demo, '--format', 'json', '--tolerance', '1e-3', ...chosen.flatMap((n) => ['--sample', n])])
    expect(r.code).toBe(0)
    const out = JSON.parse(r.stdout)
    const study = JSON.parse(await readFile(demo, 'utf8'))
    expect(out.samples.map((s: { name: string }) => s.name)).toEqual(chosen)
    for (const s of out.samples) {
      expect(s.optics.wavelengths.map((w: { wavelength_nm: number }) => w.wavelength_nm)).toEqual(study.wavelengths_nm)
      for (const w of s.optics.wavelengths) expect(w.ext).toBeCloseTo(w.sca + w.abs, 6) // extinction = scattering + absorption
      expect(['cools', 'warms', 'too close to call']).toContain(s.forcing.verdict)
      expect(s.forcing.critical_ssa).toBeCloseTo(critical(s.forcing.surface_albedo, s.forcing.upscatter_550), 10)
      expect(s.forcing.verdict === 'cools').toBe(s.forcing.thin_layer_w_m2 <= -s.forcing.margin_w_m2)
    }
    expect(out.caution).toMatch(/screening estimate/)
  })

  it('CSV for one sample: one row per wavelength, units in the column names, forcing columns, written atomically with --out', async () => {
    const file = join(dir, 'smoke.csv')
    const r = await runHere(runStudy, [demo, '--format', 'csv', '--sample', 'Winter wood smoke', '--tolerance', '1e-3', '--out', file])
    expect(r.code).toBe(0)
    expect(r.stdout).toBe('')
    const lines = (await readFile(file, 'utf8')).trimEnd().split('\n')
    const header = cellsOf(lines[0])
    for (const c of ['sample', 'wavelength_nm', 'ext_Mm-1', 'sca_Mm-1', 'abs_Mm-1', 'ssa', 'g', 'dry_mass_ug_m-3', 'thin_layer_forcing_W_m-2', 'critical_ssa', 'verdict']) expect(header).toContain(c)
    const study = JSON.parse(await readFile(demo, 'utf8'))
    expect(lines.length - 1).toBe(study.wavelengths_nm.length)
    const col = (row: string[], name: string) => row[header.indexOf(name)]
    for (const line of lines.slice(1)) {
      const row = cellsOf(line)
      expect(col(row, 'sample')).toBe('Winter wood smoke')
      const ext = Number(col(row, 'ext_Mm-1'))
      expect(ext).toBeCloseTo(Number(col(row, 'sca_Mm-1')) + Number(col(row, 'abs_Mm-1')), 3)
      // the verdict's critical albedo from the row's own surface albedo and β̄ (Chylek & Wong 1995)
      expect(Number(col(row, 'critical_ssa'))).toBeCloseTo(critical(Number(col(row, 'surface_albedo')), Number(col(row, 'upscatter_550'))), 5)
    }
    expect((await readdir(dir)).filter((f) => f.includes('.tmp'))).toEqual([])
  })

  it('a broken study prints every problem with its path and fix and exits 2; no output file', async () => {
    const d = JSON.parse(await readFile(demo, 'utf8'))
    d.samples[1].size.modes[0].gsd = 0.9
    d.site.surface = 'lava'
    const broken = join(dir, 'broken.mote')
    await writeFile(broken, JSON.stringify(d, null, 2))
    const out = join(dir, 'never.csv')
    const r = await runHere(runStudy, [broken, '--format', 'csv', '--out', out])
    expect(r.code).toBe(2)
    expect(r.stderr).toMatch(/2 problems/)
    expect(r.stderr).toContain('samples[1].size.modes[0].gsd')
    expect(r.stderr).toContain('site.surface')
    expect(r.stderr.match(/fix: /g)?.length).toBe(2)
    expect(r.stderr).not.toMatch(/\.ts:\d+/)
    expect(await readdir(dir)).not.toContain('never.csv')
  })

  it('an unknown sample, a bad format or a missing file exit 2 with one line', async () => {
    const unknown = await runHere(runStudy, [demo, '--sample', 'Volcano'])
    expect(unknown.code).toBe(2)
    expectOneLine(unknown.stderr)
    expect(unknown.stderr).toContain('Coastal haze day')
    for (const args of [[demo, '--format', 'xml'], [join(dir, 'missing.mote')], []]) {
      const r = await runHere(runStudy, args)
      expect(r.code).toBe(2)
      expectOneLine(r.stderr)
    }
  })
})
