// A study with a component given by expressions, through the built command line (node bin/motebench.mjs), in the
// main thread and in the worker threads (the expression compiler must be in every bundle that reads studies: the
// app's optics workers are built without it and load it on demand, src-core/expressionCompiler.ts). The check is a
// reduction: k = 0.01·550/λ equals the constant
// k = 0.01 at 550 nm, so every 550 nm figure must be the constant component's to the last digit, and at 450 nm the
// expression's larger k must absorb more.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { repo, run, type Ran } from './helpers.ts'

const dir = mkdtempSync(join(tmpdir(), 'motebench-expressions-'))
const SAMPLE = 'Blue tail'

/** The demo's humid sulfate sample made of one own component, its index as given; with an uncertainty on its k. */
function writeStudy(name: string, index: object): string {
  const demo = JSON.parse(readFileSync(join(repo, 'resources/demo.mote'), 'utf8'))
  const sample = { ...demo.samples[4], name: SAMPLE, composition: { components: [{ material: 'blue-tail', volume_fraction: 1 }], mixing: 'volume-average' } }
  const study = {
    ...demo,
    wavelengths_nm: [450, 550, 700],
    samples: [sample],
    user_materials: [{ id: 'blue-tail', name: 'Blue tail', density_g_cm3: 1.5, kappa: 0.1, index }],
    uncertainty: { samples: { [SAMPLE]: { inputs: [{ quantity: 'k', material: 'blue-tail', apply: 'factor', distribution: { kind: 'lognormal', median: 1, gsd: 1.3 } }] } } }
  }
  const file = join(dir, `${name}.mote`)
  writeFileSync(file, JSON.stringify(study))
  return file
}

const runs: Record<string, Ran> = {}
const csv: Record<string, string> = {}
beforeAll(async () => {
  const files = { expression: writeStudy('expression', { kind: 'expression', n: '1.6', k: '0.01 * 550 / wl_nm' }), constant: writeStudy('constant', { kind: 'constant', n: 1.6, k: 0.01 }) }
  const sizer = join(repo, 'resources/sizer-series-semicolon.csv')
  await Promise.all(
    Object.entries(files).flatMap(([kind, file]) => [
      run(['study', file, '--json']).then((r) => (runs[`study-${kind}`] = r)),
      run(['uncertainty', file, '--sample', SAMPLE, '--draws', '40', '--seed', '3', '--workers', '2', '--json']).then((r) => (runs[`uncertainty-${kind}`] = r)),
      run(['series', sizer, '--study', file, '--sample', SAMPLE, '--wavelengths', '450,550', '--workers', '2', '--out', join(dir, `${kind}.csv`)]).then((r) => {
        runs[`series-${kind}`] = r
        if (r.code === 0) csv[kind] = readFileSync(join(dir, `${kind}.csv`), 'utf8')
      })
    ])
  )
}, 240_000)
afterAll(() => rmSync(dir, { recursive: true, force: true }))

interface Row {
  wavelength_nm: number
  ext: number
  sca: number
  abs: number
  g: number
  backscatter_fraction: number
  upscatter_fraction: number
  mass_ext_dry: number
  visual_range_km: number
}
const rows = (r: Ran): Row[] => JSON.parse(r.stdout).samples[0].optics.wavelengths

describe('a component given by expressions in the built command line', () => {
  it('study: at 550 nm the figures of k = 0.01 · 550/λ are those of k = 0.01; at 450 nm it absorbs more', () => {
    for (const k of ['study-expression', 'study-constant']) expect(runs[k].code, runs[k].stderr).toBe(0)
    const e = rows(runs['study-expression'])
    const c = rows(runs['study-constant'])
    const at = (rs: Row[], wl: number) => rs.find((r) => r.wavelength_nm === wl)!
    // the figures of one wavelength (not the Ångström exponents, which take the neighbouring wavelengths)
    const own = (r: Row) => [r.ext, r.sca, r.abs, r.g, r.backscatter_fraction, r.upscatter_fraction, r.mass_ext_dry, r.visual_range_km]
    expect(own(at(e, 550))).toEqual(own(at(c, 550)))
    expect(own(at(e, 550)).every(Number.isFinite)).toBe(true)
    expect(at(e, 450).abs).toBeGreaterThan(at(c, 450).abs * 1.1) // k 22 % larger at 450 nm
  })

  it('uncertainty (draws in a worker thread): the 550 nm figures are the same draw for draw', () => {
    for (const k of ['uncertainty-expression', 'uncertainty-constant']) expect(runs[k].code, runs[k].stderr).toBe(0)
    const figures = (r: Ran) => Object.fromEntries((JSON.parse(r.stdout).figures as { key: string }[]).map((f) => [f.key, f]))
    const e = figures(runs['uncertainty-expression'])
    const c = figures(runs['uncertainty-constant'])
    for (const key of ['ext', 'sca', 'abs', 'ssa', 'g', 'forcing']) expect(e[key], key).toEqual(c[key])
  })

  it('series (rows in worker threads): the 550 nm columns are the same, the 450 nm absorption larger', () => {
    for (const k of ['series-expression', 'series-constant']) expect(runs[k].code, runs[k].stderr).toBe(0)
    const table = (text: string) => {
      const [head, ...lines] = text.trim().split('\n')
      const names = head.split(',')
      return lines.map((l) => Object.fromEntries(l.split(',').map((v, i) => [names[i], v])))
    }
    const e = table(csv.expression)
    const c = table(csv.constant)
    expect(e.length).toBe(c.length)
    expect(e.length).toBeGreaterThan(0)
    for (let i = 0; i < e.length; i++) {
      for (const col of ['ext_550nm_Mm-1', 'sca_550nm_Mm-1', 'abs_550nm_Mm-1', 'ssa_550nm', 'g_550nm']) expect(e[i][col], col).toBe(c[i][col])
      expect(Number(e[i]['abs_450nm_Mm-1'])).toBeGreaterThan(Number(c[i]['abs_450nm_Mm-1']))
    }
  })
})
