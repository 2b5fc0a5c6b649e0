// materials, material, growth, population and forcing, run in this process through the CLI's runGuarded.
import { describe, expect, it } from 'vitest'
import { runForcing } from '../../src-main/cli/forcing.ts'
import { runGrowth } from '../../src-main/cli/growth.ts'
import { runMaterial, runMaterials } from '../../src-main/cli/materials.ts'
import { runPopulation } from '../../src-main/cli/population.ts'
import { expectOneLine, runHere } from './helpers.ts'

const json = (s: string) => JSON.parse(s)

describe('motebench materials / material', () => {
  it('materials --json lists every component with id, name, density, κ and wavelength range', async () => {
    const r = await runHere(runMaterials, ['--json'])
    expect(r.code).toBe(0)
    const list = json(r.stdout) as Record<string, unknown>[]
    expect(list.length).toBeGreaterThan(3)
    for (const m of list) expect(Object.keys(m).sort()).toEqual(['density', 'id', 'kappa', 'name', 'wavelength_max_nm', 'wavelength_min_nm'])
    expect(list.map((m) => m.id)).toEqual(expect.arrayContaining(['water', 'ammonium-sulfate']))
  })

  it('material water --wavelength 550nm gives n ≈ 1.333 (Hale & Querry 1973, Appl. Opt. 12:555, Table I: 1.333, read via the database copy) with exactly the documented keys', async () => {
    const r = await runHere(runMaterial, ['water', '--wavelength', '550nm', '--json'])
    expect(r.code).toBe(0)
    const m = json(r.stdout)
    expect(Object.keys(m).sort()).toEqual(['density', 'k', 'kappa', 'n', 'source'])
    expect(m.n).toBeCloseTo(1.333, 2)
    expect(m.k).toBeLessThan(1e-6) // water is nearly transparent in the visible (Hale & Querry 1973, Table I: 1.96e-9)
    expect(m.kappa).toBe(0)
    expect(m.density).toBeCloseTo(0.997, 2) // water near 25 °C (CRC Handbook, from memory)
    expect(m.source).toMatch(/Hale/)
  })

  it('material NAME --wavelength 10um --json works for every catalogue component, with a finite index and a named source (issue 22)', async () => {
    const list = json((await runHere(runMaterials, ['--json'])).stdout) as { id: string; wavelength_min_nm: number; wavelength_max_nm: number }[]
    expect(list.length).toBe(9)
    for (const c of list) {
      expect(c.wavelength_min_nm, c.id).toBeLessThanOrEqual(200)
      expect(c.wavelength_max_nm, c.id).toBeGreaterThanOrEqual(40000)
      const r = await runHere(runMaterial, [c.id, '--wavelength', '10um', '--json'])
      expect(r.code, `${c.id}: ${r.stderr}`).toBe(0)
      const m = json(r.stdout)
      expect(Object.keys(m).sort()).toEqual(['density', 'k', 'kappa', 'n', 'source'])
      expect(m.n, c.id).toBeGreaterThan(0)
      expect(m.k, c.id).toBeGreaterThanOrEqual(0)
      expect(m.source, c.id).toMatch(/(19|20)\d\d|common practice|assumption/)
    }
    // water at 10 µm: 1.218 + 0.0508i (Hale & Querry 1973, Appl. Opt. 12:555, Table I, read via the refractiveindex.info database copy)
    const w = json((await runHere(runMaterial, ['water', '--wavelength', '10um', '--json'])).stdout)
    expect(w.n).toBeCloseTo(1.218, 6)
    expect(w.k).toBeCloseTo(0.0508, 6)
    expect(w.source).toContain('database/data-nk/main/H2O/Hale.yml')
  })

  it('a wavelength outside a component\'s table is refused with its range (exit 2, one line), never extrapolated', async () => {
    const list = json((await runHere(runMaterials, ['--json'])).stdout) as { id: string; wavelength_min_nm: number; wavelength_max_nm: number }[]
    for (const c of list) {
      for (const wl of [`${c.wavelength_max_nm * 1.5}nm`, `${c.wavelength_min_nm / 2}nm`]) {
        const r = await runHere(runMaterial, [c.id, '--wavelength', wl, '--json'])
        expect(r.code, `${c.id} at ${wl}`).toBe(2)
        expect(r.stdout).toBe('')
        expectOneLine(r.stderr)
        expect(r.stderr).toContain(`${c.wavelength_min_nm / 1000} to ${c.wavelength_max_nm / 1000} µm`)
      }
    }
  })

  it('an unknown component exits 2 with one line listing the known names', async () => {
    const r = await runHere(runMaterial, ['unobtainium', '--wavelength', '550nm'])
    expect(r.code).toBe(2)
    expectOneLine(r.stderr)
    expect(r.stderr).toMatch(/unobtainium/)
    expect(r.stderr).toMatch(/water/)
    expect(r.stderr).toMatch(/ammonium-sulfate/)
  })

  it('a missing or unreadable wavelength exits 2 with one line', async () => {
    for (const args of [['water'], ['water', '--wavelength', 'green'], ['water', '--wavelength', '550']]) {
      const r = await runHere(runMaterial, args)
      expect(r.code).toBe(2)
      expectOneLine(r.stderr)
    }
  })
})

describe('motebench growth', () => {
  it('without the Kelvin term equals (1 + κ·RH/(100 − RH))^(1/3) (Petters & Kreidenweis 2007 closed form)', async () => {
    for (const [kappa, rh] of [
      [0.61, 90],
      [1.28, 75],
      [0.1, 50]
    ]) {
      const r = await runHere(runGrowth, ['--kappa', String(kappa), '--rh', String(rh), '--diameter', '100nm', '--no-kelvin', '--json'])
      expect(r.code).toBe(0)
      const g = json(r.stdout)
      expect(Object.keys(g).sort()).toEqual(['growth_factor', 'warnings', 'wet_diameter_nm'])
      const closed = Math.cbrt(1 + (kappa * rh) / (100 - rh))
      expect(g.growth_factor).toBeCloseTo(closed, 10)
      expect(g.wet_diameter_nm).toBeCloseTo(100 * closed, 8)
    }
  })

  it('the Kelvin term lowers the growth of small particles and hardly matters for large ones (Köhler theory)', async () => {
    const gf = async (d: string, kelvin: boolean) =>
      json((await runHere(runGrowth, ['--kappa', '0.61', '--rh', '90', '--diameter', d, '--temperature', '298K', '--json', ...(kelvin ? [] : ['--no-kelvin'])])).stdout).growth_factor as number
    const closed = Math.cbrt(1 + (0.61 * 90) / 10)
    expect(await gf('30nm', true)).toBeLessThan(closed - 0.05)
    expect(Math.abs((await gf('10um', true)) - closed)).toBeLessThan(1e-3)
  })

  it('bad arguments exit 2 with one line (RH at saturation, missing κ, unknown option)', async () => {
    for (const args of [
      ['--kappa', '0.61', '--rh', '100', '--diameter', '100nm'],
      ['--rh', '90', '--diameter', '100nm'],
      ['--kappa', '0.61', '--rh', '90', '--diameter', '100nm', '--kelvinn']
    ]) {
      const r = await runHere(runGrowth, args)
      expect(r.code).toBe(2)
      expectOneLine(r.stderr)
    }
  })
})

describe('motebench population', () => {
  it('tiny non-absorbing particles: extinction Ångström exponent 4, no absorption, Rayleigh cross-section (Bohren & Huffman ch. 5)', async () => {
    const r = await runHere(runPopulation, ['--mode', '1000,10nm,1.2', '--m', '1.5+0i', '--wavelengths', '400,550,700nm', '--json'])
    expect(r.code).toBe(0)
    const p = json(r.stdout)
    expect(Object.keys(p).sort()).toEqual(['angstrom_abs', 'angstrom_ext', 'angstrom_sca', 'mass_ug_m3', 'number_cm3', 'volume_um3_cm3', 'warnings', 'wavelengths'])
    for (const w of p.wavelengths) {
      expect(Object.keys(w).sort()).toEqual(['abs', 'backscatter_fraction', 'ext', 'g', 'sca', 'ssa', 'upscatter_fraction', 'wavelength_nm'])
      expect(w.abs).toBe(0) // k = 0: no absorption
    }
    expect(p.angstrom_ext).toBeGreaterThan(3.97)
    expect(p.angstrom_ext).toBeLessThan(4.03)
    // Rayleigh: C_sca = (2π⁵/3) D⁶/λ⁴ |(m²−1)/(m²+2)|² (Bohren & Huffman 1983, eq. 5.8), with the lognormal
    // moment ⟨D⁶⟩ = D_g⁶ exp(18 ln²σ_g) (Hatch–Choate); µm² × cm⁻³ = Mm⁻¹.
    const K = (1.5 ** 2 - 1) / (1.5 ** 2 + 2)
    const d6 = 0.01 ** 6 * Math.exp(18 * Math.log(1.2) ** 2)
    const expected = (1000 * (2 * Math.PI ** 5) / 3) * d6 * K * K / 0.55 ** 4
    const at550 = p.wavelengths.find((w: { wavelength_nm: number }) => w.wavelength_nm === 550)
    expect(Math.abs(at550.sca / expected - 1)).toBeLessThan(0.01)
    // number and volume of the mode (Hatch–Choate: V = N (π/6) D_g³ exp(4.5 ln²σ_g)); unit density without --density
    expect(p.number_cm3).toBeCloseTo(1000, 0)
    const volume = 1000 * (Math.PI / 6) * 0.01 ** 3 * Math.exp(4.5 * Math.log(1.2) ** 2)
    expect(Math.abs(p.volume_um3_cm3 / volume - 1)).toBeLessThan(1e-3)
    expect(p.mass_ug_m3).toBeCloseTo(p.volume_um3_cm3, 12)
  })

  it('tiny absorbing particles of constant index: absorption Ångström exponent 1 (Q_abs = 4x Im((m²−1)/(m²+2)), Bohren & Huffman eq. 5.11)', async () => {
    const r = await runHere(runPopulation, ['--mode', '100000,10nm,1.2', '--m', '1.8+0.5i', '--density', '1.8', '--wavelengths', '400,550,700nm', '--json'])
    expect(r.code).toBe(0)
    const p = json(r.stdout)
    expect(Math.abs(p.angstrom_abs - 1)).toBeLessThan(0.03)
    const volume = 100000 * (Math.PI / 6) * 0.01 ** 3 * Math.exp(4.5 * Math.log(1.2) ** 2)
    expect(Math.abs(p.mass_ug_m3 / (1.8 * volume) - 1)).toBeLessThan(1e-3)
  })

  it('catalogue material and humidity: conservation ext = sca + abs, ssa = sca/ext; a readable table without --json', async () => {
    const r = await runHere(runPopulation, ['--mode', '1000,0.12um,1.8', '--material', 'ammonium-sulfate', '--rh', '80', '--wavelengths', '450,550,700nm', '--json', '--tolerance', '1e-3'])
    expect(r.code).toBe(0)
    for (const w of json(r.stdout).wavelengths) {
      expect(w.ext).toBeCloseTo(w.sca + w.abs, 8)
      expect(w.ssa).toBeCloseTo(w.sca / w.ext, 12)
    }
    const text = await runHere(runPopulation, ['--mode', '1000,0.12um,1.8', '--material', 'ammonium-sulfate', '--wavelengths', '550nm', '--tolerance', '1e-3'])
    expect(text.code).toBe(0)
    expect(text.stdout).toMatch(/ext Mm⁻¹/)
  })

  it('bad arguments exit 2 with one line', async () => {
    for (const args of [
      ['--mode', '1000,0.12um', '--material', 'ammonium-sulfate'],
      ['--mode', '1000,0.12,1.8', '--material', 'ammonium-sulfate'],
      ['--mode', '1000,0.12um,1.8', '--material', 'ammonium-sulfate', '--m', '1.5+0i'],
      ['--mode', '1000,0.12um,1.8'],
      ['--mode', '1000,0.12um,0.5', '--m', '1.5+0i'],
      ['--mode', '1000,0.12um,1.8', '--m', '1.5-0.1i'],
      ['--mode', '1000,0.12um,1.8', '--material', 'kryptonite'],
      ['--mode', '1000,0.12um,1.8', '--material', 'water', '--wavelengths', '450,450nm']
    ]) {
      const r = await runHere(runPopulation, args)
      expect(r.code, args.join(' ')).toBe(2)
      expectOneLine(r.stderr)
    }
  })
})

describe('motebench forcing', () => {
  // Chylek & Wong (1995): ΔF = −(S₀/4) T² (1 − A_c) [2(1 − R_s)² β̄ ω τ − 4 R_s (1 − ω) τ], S₀ = 1361 W m⁻² (Kopp & Lean 2011)
  const chylekWong = (tau: number, w: number, b: number, rs: number, T = 0.76, ac = 0.6) => -(1361 / 4) * T * T * (1 - ac) * (2 * (1 - rs) ** 2 * b * w * tau - 4 * rs * (1 - w) * tau)
  const critical = (rs: number, b: number) => (2 * rs) / (2 * rs + b * (1 - rs) ** 2)

  it('thin layer: forcing, efficiency and ω_crit follow Chylek & Wong (1995); the documented keys', async () => {
    const r = await runHere(runForcing, ['--tau', '0.2', '--ssa', '0.92', '--upscatter', '0.24', '--surface-albedo', '0.15', '--cloud', '0.5', '--transmittance', '0.8', '--json'])
    expect(r.code).toBe(0)
    const f = json(r.stdout)
    for (const k of ['forcing_w_m2', 'efficiency_w_m2_per_tau', 'critical_ssa', 'verdict', 'caution']) expect(f).toHaveProperty(k)
    expect(f.forcing_w_m2).toBeCloseTo(chylekWong(0.2, 0.92, 0.24, 0.15, 0.8, 0.5), 10)
    expect(f.efficiency_w_m2_per_tau).toBeCloseTo(chylekWong(1, 0.92, 0.24, 0.15, 0.8, 0.5), 10)
    expect(f.critical_ssa).toBeCloseTo(critical(0.15, 0.24), 12)
    expect(f.verdict).toBe('cools')
    expect(f.caution).toMatch(/screening estimate/)
  })

  it('ω_crit for R_s = 0.15, β̄ = 0.25 is 2R_s/(2R_s + β̄(1−R_s)²) (Chylek & Wong 1995) and the verdict flips across it', async () => {
    const wc = critical(0.15, 0.25)
    const at = async (ssa: number) => json((await runHere(runForcing, ['--tau', '0.3', '--ssa', String(ssa), '--upscatter', '0.25', '--surface-albedo', '0.15', '--margin', '0.05', '--json'])).stdout)
    const above = await at(wc + 0.05)
    const below = await at(wc - 0.05)
    expect(above.critical_ssa).toBeCloseTo(wc, 12)
    expect(above.verdict).toBe('cools')
    expect(below.verdict).toBe('warms')
    expect(above.forcing_w_m2).toBeLessThan(0)
    expect(below.forcing_w_m2).toBeGreaterThan(0)
    // within the margin: too close to call
    expect((await at(wc)).verdict).toBe('too close to call')
  })

  it('two-stream: TOA, surface and atmosphere terms; a non-absorbing layer (ω = 1) heats no air (energy conservation)', async () => {
    const r = await runHere(runForcing, ['--tau', '0.2', '--ssa', '1', '--g', '0.65', '--two-stream', '--cos-zenith', '0.5', '--surface-albedo', '0.15', '--json'])
    expect(r.code).toBe(0)
    const f = json(r.stdout)
    for (const k of ['forcing_w_m2', 'efficiency_w_m2_per_tau', 'critical_ssa', 'verdict', 'caution', 'toa_w_m2', 'surface_w_m2', 'atmosphere_w_m2']) expect(f).toHaveProperty(k)
    expect(Math.abs(f.atmosphere_w_m2)).toBeLessThan(1e-9)
    expect(f.toa_w_m2).toBeLessThan(0) // a pure scatterer over a dark surface cools
    expect(f.toa_w_m2).toBeCloseTo(f.surface_w_m2, 9)
    const absorbing = json((await runHere(runForcing, ['--tau', '0.2', '--ssa', '0.8', '--g', '0.65', '--two-stream', '--surface-albedo', '0.15', '--json'])).stdout)
    expect(absorbing.atmosphere_w_m2).toBeGreaterThan(0) // an absorbing layer heats the air
    expect(absorbing.toa_w_m2 - absorbing.surface_w_m2).toBeCloseTo(absorbing.atmosphere_w_m2, 9)
  })

  it('bad arguments exit 2 with one line naming the option', async () => {
    const out = await runHere(runForcing, ['--tau', '0.2', '--ssa', '1.5', '--upscatter', '0.24', '--surface-albedo', '0.15'])
    expect(out.code).toBe(2)
    expectOneLine(out.stderr)
    expect(out.stderr).toMatch(/--ssa/)
    for (const args of [
      ['--tau', '0.2', '--ssa', '0.9', '--surface-albedo', '0.15'],
      ['--tau', '0.2', '--ssa', '0.9', '--two-stream', '--surface-albedo', '0.15'],
      ['--tau', 'lots', '--ssa', '0.9', '--upscatter', '0.2', '--surface-albedo', '0.15']
    ]) {
      const r = await runHere(runForcing, args)
      expect(r.code).toBe(2)
      expectOneLine(r.stderr)
    }
  })
})

describe('A:B and LO:HI options', () => {
  it('every command refuses a value that is not two values with one line, the form and an example (exit 2)', async () => {
    const { runClosure } = await import('../../src-main/cli/closure.ts')
    const { runRebin } = await import('../../src-main/cli/rebin.ts')
    const { runTruncation } = await import('../../src-main/cli/truncation.ts')
    const { runMerge } = await import('../../src-main/cli/merge.ts')
    const cases: [(argv: string[]) => Promise<number> | number, string[], RegExp][] = [
      [runClosure, ['--sizer', 'resources/sizer-single-comma.csv', '--sca', '550:40±2', '--n-range', '1.3'], /^motebench: closure: --n-range "1\.3" is not LO:HI, e\.g\. 1\.3:1\.8\n$/],
      [runRebin, ['--edges', '0.3,0.5,0.7', '--m', '1.5+0i', '--wavelength', '633nm', '--angles', '35:90:120'], /^motebench: rebin: --angles "35:90:120" is not A:B, e\.g\. 35:120\n$/],
      [runTruncation, ['--study', 'resources/demo.mote', '--sample', 'Quarry dust event', '--wavelength', '550nm', '--angles', '7'], /^motebench: truncation: --angles "7" is not A:B, e\.g\. 7:170\n$/],
      [runMerge, ['--mobility', 'resources/field/valley-mobility.csv', '--aerodynamic', 'resources/field/valley-aerodynamic.csv', '--density', '1.8', '--out', 'never-written.csv', '--mobility-range', '10nm-600nm'], /^motebench: merge: --mobility-range "10nm-600nm" is not LO:HI, e\.g\. 10nm:600nm\n$/]
    ]
    for (const [command, args, message] of cases) {
      const r = await runHere(command, args)
      expect(r.code, args.join(' ')).toBe(2)
      expect(r.stderr, args.join(' ')).toMatch(message)
    }
  })
})
