// Warnings where a figure comes from a method outside its range, in the CLI's text, JSON and CSV; and the two
// forcing methods given the same scattering.
import { join } from 'node:path'
import Papa from 'papaparse/papaparse.js'
import { describe, expect, it } from 'vitest'
import { runForcing } from '../../src-main/cli/forcing.ts'
import { runGrowth } from '../../src-main/cli/growth.ts'
import { runPopulation } from '../../src-main/cli/population.ts'
import { runStudy } from '../../src-main/cli/study.ts'
import { repo, runHere } from './helpers.ts'

const json = (s: string) => JSON.parse(s)
const issueLayer = ['--tau', '5', '--ssa', '0.9', '--upscatter', '0.2', '--surface-albedo', '0.1']
// Chylek & Wong (1995) with S₀ = 1361 W m⁻² (Kopp & Lean 2011), T = 0.76, A_c = 0.6
const chylekWong = (tau: number, w: number, b: number, rs: number) => -(1361 / 4) * 0.76 ** 2 * 0.4 * (2 * (1 - rs) ** 2 * b * w * tau - 4 * rs * (1 - w) * tau)

describe('motebench forcing: warnings and the scattering each method assumes', () => {
  it('the issue’s thick layer (τ 5): the thin-layer figure carries a warning naming the two-stream figure, in JSON and text', async () => {
    const r = await runHere(runForcing, [...issueLayer, '--json'])
    expect(r.code).toBe(0)
    const f = json(r.stdout)
    expect(f.forcing_w_m2).toBeCloseTo(chylekWong(5, 0.9, 0.2, 0.1), 9) // −98.9 W m⁻²
    expect(f.warnings).toHaveLength(1)
    expect(f.warnings[0]).toMatch(/Thin-layer forcing -98\.9 W m⁻².*two-stream/)
    expect(f.warnings[0]).toContain(`${Number(f.two_stream_w_m2.toPrecision(3))} W m⁻²`)
    const text = await runHere(runForcing, issueLayer)
    expect(text.stdout).toMatch(/^warning: Thin-layer forcing/m)
  })

  it('a thin layer (τ 0.01) has an empty warnings list', async () => {
    const f = json((await runHere(runForcing, ['--tau', '0.01', '--ssa', '0.9', '--upscatter', '0.2', '--surface-albedo', '0.1', '--json'])).stdout)
    expect(f.warnings).toEqual([])
  })

  it('--two-stream --upscatter: at τ = 0.001 the two methods agree within 10τ of the forcing scale (second order; Chylek & Wong 1995 as the thin limit of the two-stream layer)', async () => {
    const thin = json((await runHere(runForcing, ['--tau', '0.001', '--ssa', '0.9', '--upscatter', '0.2', '--surface-albedo', '0.1', '--json'])).stdout)
    const two = json((await runHere(runForcing, ['--tau', '0.001', '--ssa', '0.9', '--upscatter', '0.2', '--g', '0.7', '--two-stream', '--surface-albedo', '0.1', '--json'])).stdout)
    const scale = (1361 / 4) * 0.76 ** 2 * 0.4 * 0.001
    expect(Math.abs(two.forcing_w_m2 - thin.forcing_w_m2)).toBeLessThan(10 * 0.001 * scale)
    expect(two.upscatter).toBe(0.2)
    expect(two.upscatter_source).toMatch(/given/)
  })

  it('--two-stream without --upscatter says which upscatter it assumed: (1 − g²)(2 − 3μ₀g/(1 + g))/4 = 0.176 for g = 0.7, μ₀ = 0.5 (thin limit of the Eddington equations)', async () => {
    const two = json((await runHere(runForcing, ['--tau', '0.001', '--ssa', '0.9', '--g', '0.7', '--two-stream', '--surface-albedo', '0.1', '--json'])).stdout)
    expect(two.upscatter).toBeCloseTo((0.51 * (2 - (1.5 * 0.7) / 1.7)) / 4, 12)
    expect(two.upscatter_source).toMatch(/delta-Eddington/)
    const text = await runHere(runForcing, ['--tau', '0.001', '--ssa', '0.9', '--g', '0.7', '--two-stream', '--surface-albedo', '0.1'])
    expect(text.stdout).toMatch(/upscatter fraction 0\.176.*delta-Eddington/)
  })
})

describe('warnings of population, growth and study', () => {
  it('population --json: warnings is [] for a dry population and names the humidity at 97 % RH (κ-Köhler near saturation)', async () => {
    const args = ['--mode', '1000,0.12um,1.8', '--material', 'ammonium-sulfate', '--wavelengths', '550nm', '--tolerance', '1e-2', '--json']
    expect(json((await runHere(runPopulation, args)).stdout).warnings).toEqual([])
    const wet = json((await runHere(runPopulation, [...args, '--rh', '97'])).stdout)
    expect(wet.warnings).toHaveLength(1)
    expect(wet.warnings[0]).toMatch(/97 % RH/)
  })

  it('growth --json: warnings from 95 % RH, none at 90 %', async () => {
    const at = async (rh: string) => json((await runHere(runGrowth, ['--kappa', '0.61', '--rh', rh, '--diameter', '100nm', '--json'])).stdout).warnings
    expect(await at('90')).toEqual([])
    expect((await at('96')).join(' ')).toMatch(/96 % RH/)
  })

  it('study: the humid sulfate–nitrate sample (τ ≈ 2) lists its warning per sample in JSON, in the CSV’s last column and in the text', async () => {
    const base = [join(repo, 'resources/demo.mote'), '--sample', 'Humid sulfate–nitrate episode', '--sample', 'Winter wood smoke', '--tolerance', '1e-2']
    const out = json((await runHere(runStudy, [...base, '--format', 'json'])).stdout)
    const humid = out.samples.find((s: { name: string }) => s.name.startsWith('Humid'))
    expect(humid.warnings.join(' ')).toMatch(/Thin-layer forcing.*Use the two-stream figure/)
    expect(out.samples.find((s: { name: string }) => s.name.startsWith('Winter')).warnings).toEqual([])
    const [header, ...cells] = Papa.parse((await runHere(runStudy, [...base, '--format', 'csv'])).stdout.trimEnd()).data
    expect(header.at(-1)).toBe('warnings')
    const rows = cells.map((c) => Object.fromEntries(header.map((h, i) => [h, c[i]])))
    expect(rows.length).toBeGreaterThan(1)
    for (const row of rows) {
      if (row.sample.startsWith('Humid')) expect(row.warnings).toMatch(/Thin-layer forcing/)
      else expect(row.warnings).toBe('')
    }
    expect((await runHere(runStudy, base)).stdout).toMatch(/^ {2}warning: Thin-layer forcing/m)
  })
})
