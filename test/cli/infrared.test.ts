// The infrared part in the command line: forcing's infrared options, and the study's JSON and CSV figures.
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { LONGWAVE_BANDS, longwaveForcing } from '../../src-core/index.ts'
import { runForcing } from '../../src-main/cli/forcing.ts'
import { runPopulation } from '../../src-main/cli/population.ts'
import { runStudy } from '../../src-main/cli/study.ts'
import { repo, runHere } from './helpers.ts'

const demo = join(repo, 'resources/demo.mote')
const layer = ['--tau', '0.2', '--ssa', '0.92', '--upscatter', '0.24', '--surface-albedo', '0.15']

describe('motebench forcing with the infrared part', () => {
  it('adds longwave_toa_w_m2, longwave_surface_w_m2 and net_toa_w_m2 = forcing_w_m2 + longwave_toa_w_m2, the verdict on the net', async () => {
    const r = await runHere(runForcing, [...layer, '--ir-tau', '0.1', '--ir-ssa', '0.5', '--layer-height', '3', '--surface-temperature', '300', '--json'])
    expect(r.code).toBe(0)
    const f = JSON.parse(r.stdout)
    expect(f.net_toa_w_m2).toBeCloseTo(f.forcing_w_m2 + f.longwave_toa_w_m2, 12)
    // the same layer through the library (the CLI adds nothing of its own)
    const lib = longwaveForcing({ bands: LONGWAVE_BANDS.map(() => ({ tau: 0.1, omega: 0.5, g: 0.5 })), surfaceTemperatureK: 300, surfaceEmissivity: 0.95, layerHeightKm: 3, layerDepthKm: 1, waterColumnCm: 2.5, cloudFraction: 0.6 })
    expect(f.longwave_toa_w_m2).toBe(lib.toaWm2)
    expect(f.longwave_surface_w_m2).toBe(lib.surfaceWm2)
    expect(f.longwave_toa_w_m2).toBeGreaterThan(0)
    expect(f.sunlight_verdict).toBe('cools')
    expect(f.verdict).toBe(Math.abs(f.net_toa_w_m2) < 0.5 ? 'too close to call' : f.net_toa_w_m2 < 0 ? 'cools' : 'warms')
    expect(f.longwave_inputs).toMatchObject({ surface_temperature_k: 300, layer_height_km: 3, water_column_cm: 2.5, surface_emissivity: 0.95 })
  })
  it('refuses out-of-range infrared inputs at their option with the range and reason (exit 2), and site options without --ir-tau', async () => {
    for (const [flag, value] of [['--surface-temperature', '400'], ['--emissivity', '0.2'], ['--layer-height', '30'], ['--water-column', '12']]) {
      const r = await runHere(runForcing, [...layer, '--ir-tau', '0.1', '--ir-ssa', '0.5', flag, value])
      expect(r.code).toBe(2)
      expect(r.stderr).toContain(flag)
      expect(r.stderr).toMatch(/outside .* to .*\(/)
    }
    const stray = await runHere(runForcing, [...layer, '--water-column', '2'])
    expect(stray.code).toBe(2)
    expect(stray.stderr).toContain('--ir-tau')
  })
})

describe('motebench forcing with per-band infrared figures', () => {
  const n = LONGWAVE_BANDS.length
  const list = (f: (i: number) => number) => LONGWAVE_BANDS.map((_, i) => String(f(i))).join(',')
  const site = ['--layer-height', '3', '--surface-temperature', '300', '--json']
  it(`takes ${n} comma-separated values, one per band, and gives the library's figure for those bands`, async () => {
    const tau = (i: number) => 0.02 + 0.01 * i
    const ssa = (i: number) => (i % 2 ? 0.3 : 0.6)
    const r = await runHere(runForcing, [...layer, '--ir-tau', list(tau), '--ir-ssa', list(ssa), '--ir-g', '0.4', ...site])
    expect(r.code, r.stderr).toBe(0)
    const f = JSON.parse(r.stdout)
    const bands = LONGWAVE_BANDS.map((_, i) => ({ tau: tau(i), omega: ssa(i), g: 0.4 }))
    const lib = longwaveForcing({ bands, surfaceTemperatureK: 300, surfaceEmissivity: 0.95, layerHeightKm: 3, layerDepthKm: 1, waterColumnCm: 2.5, cloudFraction: 0.6 })
    expect(f.longwave_toa_w_m2).toBe(lib.toaWm2)
    expect(f.longwave_inputs.ir_tau).toEqual(LONGWAVE_BANDS.map((_, i) => tau(i)))
    expect(f.longwave_inputs.ir_g).toBe(0.4)
    expect(f.longwave_inputs.longwave_bands.map((b: { lo_um: number; tau: number }) => [b.lo_um, b.tau])).toEqual(LONGWAVE_BANDS.map((b, i) => [b.loUm, tau(i)]))
  })
  it('one value in every band is the single-value form: the same figures', async () => {
    const one = await runHere(runForcing, [...layer, '--ir-tau', '0.1', '--ir-ssa', '0.5', ...site])
    const all = await runHere(runForcing, [...layer, '--ir-tau', list(() => 0.1), '--ir-ssa', list(() => 0.5), ...site])
    expect(JSON.parse(all.stdout).longwave_toa_w_m2).toBe(JSON.parse(one.stdout).longwave_toa_w_m2)
    expect(JSON.parse(all.stdout).net_toa_w_m2).toBe(JSON.parse(one.stdout).net_toa_w_m2)
  })
  it('refuses a wrong count with the count wanted and the bands in order, and names the band of a value out of range (exit 2)', async () => {
    const three = await runHere(runForcing, [...layer, '--ir-tau', '0.1,0.2,0.3', '--ir-ssa', '0.5'])
    expect(three.code).toBe(2)
    expect(three.stderr).toMatch(new RegExp(`--ir-tau takes one value .* or ${n}, one per band, not 3`))
    expect(three.stderr).toContain(LONGWAVE_BANDS.map((b) => `${b.loUm}–${b.hiUm}`).join(', '))
    const bad = await runHere(runForcing, [...layer, '--ir-tau', '0.1', '--ir-ssa', list((i) => (i === 4 ? 1.5 : 0.5))])
    expect(bad.code).toBe(2)
    expect(bad.stderr).toMatch(/--ir-ssa \(band 5, 9\.5–10\.5 µm\)/)
    const word = await runHere(runForcing, [...layer, '--ir-tau', list((i) => (i === 2 ? NaN : 0.1)), '--ir-ssa', '0.5'])
    expect(word.code).toBe(2)
    expect(word.stderr).toMatch(/--ir-tau \(value 3 of 12\): "NaN" is not a number/)
  })
  it("documents the bands' edges in its help", async () => {
    const { forcingHelp } = await import('../../src-main/cli/forcing.ts')
    for (const b of LONGWAVE_BANDS) expect(forcingHelp).toContain(`${b.loUm}–${b.hiUm}`)
  })
})

describe('motebench study: infrared and net figures', () => {
  it("each sample's forcing carries longwave_toa_w_m2, longwave_surface_w_m2 and net_toa_w_m2 in JSON, and the CSV the same columns", async () => {
    const r = await runHere(runStudy, [demo, '--format', 'json', '--tolerance', '1e-3', '--sample', 'Quarry dust event'])
    expect(r.code).toBe(0)
    const f = JSON.parse(r.stdout).samples[0].forcing
    expect(f.longwave_toa_w_m2).toBeGreaterThan(0)
    expect(typeof f.longwave_surface_w_m2).toBe('number')
    expect(f.net_toa_w_m2).toBeCloseTo(f.thin_layer_w_m2 + f.longwave_toa_w_m2, 12)
    expect(f.longwave.bands).toHaveLength(LONGWAVE_BANDS.length)
    const c = await runHere(runStudy, [demo, '--format', 'csv', '--tolerance', '1e-3', '--sample', 'Quarry dust event'])
    const [head, first] = c.stdout.split('\n')
    const cols = head.split(',')
    const cells = first.split(',')
    for (const k of ['longwave_toa_W_m-2', 'longwave_surface_W_m-2', 'net_toa_W_m-2']) expect(cols).toContain(k)
    expect(Number(cells[cols.indexOf('net_toa_W_m-2')])).toBeCloseTo(f.net_toa_w_m2, 6)
  })
})

describe('motebench population --infrared', () => {
  it('adds the band optics over 4–40 µm, one entry per band, absorption = extinction − scattering; the silicate band of dust absorbs more than the window beside it', async () => {
    const r = await runHere(runPopulation, ['--mode', '10,3um,1.8', '--material', 'mineral-dust', '--rh', '0', '--infrared', '--json', '--tolerance', '1e-3'])
    expect(r.code).toBe(0)
    const j = JSON.parse(r.stdout)
    expect(j.longwave_withheld).toBeNull()
    expect(j.longwave_bands.map((b: { lo_um: number }) => b.lo_um)).toEqual(LONGWAVE_BANDS.map((b) => b.loUm))
    for (const b of j.longwave_bands) expect(b.abs).toBeCloseTo(b.ext - b.sca, 9)
    // illite's Si–O stretching band at 9–10 µm (Querry 1987, the catalogue's dust) against the 11.5–12.5 µm window
    const at = (lo: number) => j.longwave_bands.find((b: { lo_um: number }) => b.lo_um === lo)
    expect(at(9.5).abs).toBeGreaterThan(at(11.5).abs)
  })
})
