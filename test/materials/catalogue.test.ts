import { describe, expect, it } from 'vitest'
import { InputError, defineUserMaterial, getMaterial, indexSourceAt, listMaterials, refractiveIndexAt, type Material, type TableIndex } from '../../src-core/index.ts'
import { c, div, eps, sub, add } from './helpers.ts'

const IDS = ['water', 'ammonium-sulfate', 'ammonium-nitrate', 'sea-salt', 'black-carbon', 'organic-matter', 'brown-carbon', 'mineral-dust', 'sulfuric-acid']

function thrown(fn: () => unknown): unknown {
  try {
    fn()
  } catch (e) {
    return e
  }
  throw new Error('expected a throw')
}

/**
 * Absorption cross-section per volume of a sphere small compared with λ, ∝ Im((ε−1)/(ε+2))/λ
 * (Rayleigh limit; Bohren & Huffman 1983, Absorption and Scattering of Light by Small Particles, §5.2).
 */
function smallParticleAbsorption(m: { n: number; k: number }, wl: number): number {
  const e = eps(m)
  return div(sub(e, c(1)), add(e, c(2))).im / wl
}

describe('catalogue contents', () => {
  it('holds the nine components with lowercase hyphenated ids (project brief)', () => {
    const ids = listMaterials().map((m) => m.id)
    expect([...ids].sort()).toEqual([...IDS].sort())
    for (const id of ids) expect(id).toMatch(/^[a-z]+(-[a-z]+)*$/)
  })

  it('gives each component a name, density > 0, κ in 0–2 and a source for every value (project brief)', () => {
    for (const m of listMaterials()) {
      expect(m.name.length).toBeGreaterThan(0)
      expect(m.densityGcm3).toBeGreaterThan(0)
      expect(m.kappa).toBeGreaterThanOrEqual(0)
      expect(m.kappa).toBeLessThanOrEqual(2)
      expect(m.sources.index.length).toBeGreaterThan(0)
      expect(m.sources.density.length).toBeGreaterThan(0)
      expect(m.sources.kappa.length).toBeGreaterThan(0)
      expect(m.index.kind).toBe('table')
      if (m.index.kind === 'table') {
        expect(m.index.sources.length).toBe(m.index.wavelengthsUm.length)
        // every row cites a year-dated publication, or says it is common practice or this catalogue's assumption
        for (const s of m.index.sources) expect(s).toMatch(/(19|20)\d\d|common practice|assumption/)
      }
    }
  })

  it('covers 0.2 µm to at least 40 µm for every component (issue 22: through the thermal infrared)', () => {
    for (const m of listMaterials()) {
      expect(m.rangeUm[0]).toBeLessThanOrEqual(0.2)
      expect(m.rangeUm[1]).toBeGreaterThanOrEqual(40)
      for (const wl of [0.2, 0.3, 0.55, 1.0, 2.5]) {
        const { n, k } = refractiveIndexAt(m, wl)
        expect(n).toBeGreaterThan(1)
        expect(k).toBeGreaterThanOrEqual(0)
      }
      // in the infrared n may fall below 1 across a strong band (anomalous dispersion), but stays positive
      for (const wl of [3, 5, 8, 9.6, 10, 12, 15, 20, 30, 40]) {
        const { n, k } = refractiveIndexAt(m, wl)
        expect(n, `${m.id} at ${wl} µm`).toBeGreaterThan(0)
        expect(k, `${m.id} at ${wl} µm`).toBeGreaterThanOrEqual(0)
      }
    }
  })

  it('every index row in the thermal infrared (> 2.5 µm) names its source: a read database file or "(from memory)" or an assumption (issue 22)', () => {
    for (const m of listMaterials()) {
      if (m.index.kind !== 'table') continue
      m.index.wavelengthsUm.forEach((w, i) => {
        if (w <= 2.5) return
        const s = (m.index as TableIndex).sources[i]
        expect(s, `${m.id} at ${w} µm`).toMatch(/via refractiveindex\.info database \(CC0\), file database\/|\(from memory|assumption/)
      })
    }
  })
})

describe('catalogue values against the literature', () => {
  it('water: n ≈ 1.333 and k ≈ 2e-9 at 0.55 µm (Hale & Querry 1973, Appl. Opt. 12:555, Table I: 1.333, 1.96e-9, read via the refractiveindex.info database copy)', () => {
    const m = refractiveIndexAt(getMaterial('water'), 0.55)
    expect(Math.abs(m.n - 1.333)).toBeLessThan(0.001)
    expect(m.k).toBeGreaterThan(1e-9)
    expect(m.k).toBeLessThan(5e-9)
  })

  it('water: k rises strongly into the near infrared, ~1e-4 near 1.5 µm, ~1e-3 at 2 µm (Hale & Querry 1973, Appl. Opt. 12:555, read via the database copy)', () => {
    const w = getMaterial('water')
    const k055 = refractiveIndexAt(w, 0.55).k
    const k10 = refractiveIndexAt(w, 1.0).k
    const k15 = refractiveIndexAt(w, 1.5).k
    const k20 = refractiveIndexAt(w, 2.0).k
    expect(k10 / k055).toBeGreaterThan(100)
    expect(k15).toBeGreaterThan(5e-5)
    expect(k15).toBeLessThan(5e-4)
    expect(k20).toBeGreaterThan(5e-4)
    expect(k20).toBeLessThan(3e-3)
    // the 3 µm O–H band: k = 0.298 at 2.95 µm (Hale & Querry 1973, Table I)
    expect(refractiveIndexAt(w, 2.95).k).toBeGreaterThan(0.2)
  })

  it('water in the thermal infrared: the 6.1 µm bend band, the 8–12 µm window and the strong absorption beyond 15 µm (Hale & Querry 1973, Table I: k 0.131 at 6.1 µm, 0.0508 at 10 µm, 0.402 at 15 µm)', () => {
    const w = getMaterial('water')
    expect(refractiveIndexAt(w, 6.1).k).toBeCloseTo(0.131, 3)
    expect(refractiveIndexAt(w, 10).k).toBeCloseTo(0.0508, 4)
    expect(refractiveIndexAt(w, 15).k).toBeCloseTo(0.402, 3)
    // the window is the least absorbing stretch between the bands
    expect(refractiveIndexAt(w, 10).k).toBeLessThan(refractiveIndexAt(w, 6.1).k / 2)
  })

  it('mineral dust: the silicate bands near 9.6 and 19–21 µm are far stronger than the window edges (illite, Querry 1987, CRDEC-CR-88009: k 1.52 at 9.615 µm, 1.57 at 21.28 µm; read via the database copy)', () => {
    const d = getMaterial('mineral-dust')
    expect(refractiveIndexAt(d, 9.6154).k).toBeGreaterThan(1.3)
    expect(refractiveIndexAt(d, 21.2766).k).toBeGreaterThan(1.3)
    expect(refractiveIndexAt(d, 8.0).k).toBeLessThan(0.15)
    expect(refractiveIndexAt(d, 12.0).k).toBeLessThan(0.2)
  })

  it('sea salt beyond 2.25 µm (NaCl, Querry 1987): transparent through the window, n ≈ 1.50 at 10 µm (Querry 1987 table: 1.500, 0.000)', () => {
    const m = refractiveIndexAt(getMaterial('sea-salt'), 10)
    expect(m.n).toBeCloseTo(1.5, 3)
    expect(m.k).toBeLessThan(1e-3)
  })

  it('ammonium sulfate: the sulfate band near 9 µm absorbs strongly, the window near 11–12 µm weakly (Toon, Pollack & Khare 1976, from memory)', () => {
    const a = getMaterial('ammonium-sulfate')
    expect(refractiveIndexAt(a, 9.0).k).toBeGreaterThan(0.3)
    expect(refractiveIndexAt(a, 11.5).k).toBeLessThan(0.1)
  })

  it('ammonium sulfate: n ≈ 1.52–1.53 in the visible, nearly non-absorbing (Toon, Pollack & Khare 1976, J. Geophys. Res. 81:5733, from memory)', () => {
    for (const wl of [0.45, 0.55, 0.65]) {
      const m = refractiveIndexAt(getMaterial('ammonium-sulfate'), wl)
      expect(m.n).toBeGreaterThanOrEqual(1.515)
      expect(m.n).toBeLessThanOrEqual(1.535)
      expect(m.k).toBeLessThan(1e-5)
    }
  })

  it('ammonium nitrate: n ≈ 1.554 near 633 nm (Tang 1996, J. Geophys. Res. 101:19245, from memory)', () => {
    expect(Math.abs(refractiveIndexAt(getMaterial('ammonium-nitrate'), 0.633).n - 1.554)).toBeLessThan(0.002)
  })

  it('sea salt: n ≈ 1.50 at 0.55 µm (Shettle & Fenn 1979, AFGL-TR-79-0214, from memory)', () => {
    expect(Math.abs(refractiveIndexAt(getMaterial('sea-salt'), 0.55).n - 1.5)).toBeLessThan(0.005)
  })

  it('black carbon: 1.95 + 0.79i at 550 nm, held constant, density 1.8 (Bond & Bergstrom 2006, Aerosol Sci. Technol. 40:27)', () => {
    const bc = getMaterial('black-carbon')
    for (const wl of [0.3, 0.55, 1.0, 2.5]) {
      const m = refractiveIndexAt(bc, wl)
      expect(m.n).toBeCloseTo(1.95, 12)
      expect(m.k).toBeCloseTo(0.79, 12)
    }
    expect(bc.densityGcm3).toBe(1.8)
    expect(bc.kappa).toBe(0)
  })

  it('black carbon: absorption Ångström exponent of small particles is 1 (Bond & Bergstrom 2006: AAE ≈ 1 for BC)', () => {
    const bc = getMaterial('black-carbon')
    const a1 = smallParticleAbsorption(refractiveIndexAt(bc, 0.4), 0.4)
    const a2 = smallParticleAbsorption(refractiveIndexAt(bc, 0.7), 0.7)
    expect(-Math.log(a2 / a1) / Math.log(0.7 / 0.4)).toBeCloseTo(1, 10)
  })

  it('brown carbon: small-particle absorption Ångström exponent 4–6 over 0.4–0.7 µm (Kirchstetter et al. 2004, J. Geophys. Res. 109:D21208, from memory)', () => {
    const brc = getMaterial('brown-carbon')
    const a1 = smallParticleAbsorption(refractiveIndexAt(brc, 0.4), 0.4)
    const a2 = smallParticleAbsorption(refractiveIndexAt(brc, 0.7), 0.7)
    const aae = -Math.log(a2 / a1) / Math.log(0.7 / 0.4)
    expect(aae).toBeGreaterThan(4)
    expect(aae).toBeLessThan(6)
  })

  it('organic matter: non-absorbing in sunlight, n ≈ 1.53 at 550 nm (common practice; its infrared is read-tables.test.ts\'s)', () => {
    const m = refractiveIndexAt(getMaterial('organic-matter'), 0.55)
    expect(m.n).toBeCloseTo(1.53, 10)
    expect(m.k).toBe(0)
  })

  it('mineral dust: 1.53 + 0.008i at 550 nm, more absorbing in the UV (Shettle & Fenn 1979 dust-like, from memory)', () => {
    const d = getMaterial('mineral-dust')
    const m = refractiveIndexAt(d, 0.55)
    expect(m.n).toBeCloseTo(1.53, 10)
    expect(m.k).toBeCloseTo(0.008, 10)
    expect(refractiveIndexAt(d, 0.35).k).toBeGreaterThan(m.k)
  })

  it('sulfuric acid 75 %: n ≈ 1.43 in the visible (Palmer & Williams 1975, Appl. Opt. 14:208, from memory)', () => {
    expect(Math.abs(refractiveIndexAt(getMaterial('sulfuric-acid'), 0.55).n - 1.43)).toBeLessThan(0.01)
  })

  it('ammonium sulfate: deliquescence ≈ 80 %, efflorescence ≈ 35 % (Tang & Munkelwitz 1994, J. Geophys. Res. 99:18801, from memory)', () => {
    const pc = getMaterial('ammonium-sulfate').phaseChange
    expect(pc).toBeDefined()
    expect(pc!.deliquescenceRH).toBeGreaterThanOrEqual(79)
    expect(pc!.deliquescenceRH).toBeLessThanOrEqual(81)
    expect(pc!.efflorescenceRH).toBeGreaterThanOrEqual(30)
    expect(pc!.efflorescenceRH).toBeLessThanOrEqual(40)
  })

  it('κ: ammonium sulfate 0.61, ammonium nitrate 0.67 (Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, Table 1, from memory)', () => {
    expect(getMaterial('ammonium-sulfate').kappa).toBeCloseTo(0.61, 10)
    expect(getMaterial('ammonium-nitrate').kappa).toBeCloseTo(0.67, 10)
  })
})

describe('interpolation (documented scheme: n linear in ln λ; ln k linear in ln λ when both k > 0, else k linear in ln λ)', () => {
  function rows(m: Material) {
    if (m.index.kind !== 'table') throw new Error('not a table')
    return m.index
  }

  it('returns the tabulated values exactly at tabulated wavelengths (common practice)', () => {
    for (const m of listMaterials()) {
      const t = rows(m)
      for (let i = 0; i < t.wavelengthsUm.length; i++) {
        const v = refractiveIndexAt(m, t.wavelengthsUm[i])
        expect(v.n).toBe(t.n[i])
        expect(v.k).toBe(t.k[i])
      }
    }
  })

  it('at the geometric mean of two rows gives the mean of n and the geometric mean of k (closed form of the scheme)', () => {
    for (const m of listMaterials()) {
      const t = rows(m)
      for (let i = 0; i + 1 < t.wavelengthsUm.length; i++) {
        const wl = Math.sqrt(t.wavelengthsUm[i] * t.wavelengthsUm[i + 1])
        const v = refractiveIndexAt(m, wl)
        expect(v.n).toBeCloseTo((t.n[i] + t.n[i + 1]) / 2, 12)
        const kExpected = t.k[i] > 0 && t.k[i + 1] > 0 ? Math.sqrt(t.k[i] * t.k[i + 1]) : (t.k[i] + t.k[i + 1]) / 2
        expect(Math.abs(v.k - kExpected)).toBeLessThanOrEqual(1e-12 * Math.max(kExpected, 1e-300))
      }
    }
  })

  it('reproduces a power law in k exactly between rows (log–log interpolation is exact for k ∝ λ^p)', () => {
    // brown carbon is tabulated from k = 0.168 (λ/0.35)^−4 (Kirchstetter et al. 2004 anchor, from memory)
    const brc = getMaterial('brown-carbon')
    for (const wl of [0.33, 0.52, 0.77, 1.7, 2.3]) {
      expect(refractiveIndexAt(brc, wl).k / (0.168 * Math.pow(wl / 0.35, -4))).toBeCloseTo(1, 10)
    }
  })
})

describe('errors', () => {
  it('a wavelength outside the table throws InputError naming the component, the wavelength and the range', () => {
    const e = thrown(() => refractiveIndexAt(getMaterial('black-carbon'), 50))
    expect(e).toBeInstanceOf(InputError)
    const msg = (e as Error).message
    expect(msg).toContain('black-carbon')
    expect(msg).toContain('50 µm')
    expect(msg).toContain('0.2 to 40 µm')
    expect(thrown(() => refractiveIndexAt(getMaterial('ammonium-sulfate'), 0.15))).toBeInstanceOf(InputError)
  })

  it('a non-positive or non-finite wavelength throws InputError', () => {
    for (const wl of [0, -0.5, Number.NaN, Infinity]) {
      expect(thrown(() => refractiveIndexAt(getMaterial('water'), wl))).toBeInstanceOf(InputError)
    }
  })

  it('an unknown id throws InputError that lists the valid ids', () => {
    const e = thrown(() => getMaterial('soot'))
    expect(e).toBeInstanceOf(InputError)
    for (const id of IDS) expect((e as Error).message).toContain(id)
  })

  it('catalogue materials cannot be modified', () => {
    const m = getMaterial('water') as { densityGcm3: number }
    expect(() => {
      m.densityGcm3 = 2
    }).toThrow()
  })
})

describe('indexSourceAt: the source of the index at a wavelength', () => {
  it('names the tabulated row at its own wavelength, both neighbours between rows, and the whole index otherwise', () => {
    // a table whose rows have different sources, built through the public user-component path
    const m = defineUserMaterial(
      { id: 'two-sources', name: 'Two sources', densityGcm3: 1.5, source: 'A', index: { kind: 'table', rows: [[0.4, 1.5, 0.01], [0.6, 1.5, 0.01]] } },
      [0.5]
    )
    expect(indexSourceAt(m, 0.4)).toBe('A')
    const mixed: Material = { ...m, index: { ...(m.index as TableIndex), sources: ['A', 'B'] } }
    expect(indexSourceAt(mixed, 0.4)).toBe('A')
    expect(indexSourceAt(mixed, 0.6)).toBe('B')
    expect(indexSourceAt(mixed, 0.5)).toBe('A / B')
    const constant = defineUserMaterial({ id: 'flat', name: 'Flat', densityGcm3: 1, source: 'typed by hand', index: { kind: 'constant', n: 1.5, k: 0 } }, [0.55])
    expect(indexSourceAt(constant, 0.55)).toBe('typed by hand')
    // every catalogue component names a source at every tabulated wavelength
    for (const c of listMaterials()) {
      if (c.index.kind !== 'table') continue
      for (const w of c.index.wavelengthsUm) expect(indexSourceAt(c, w).length, `${c.id} at ${w} µm`).toBeGreaterThan(0)
    }
  })
})
