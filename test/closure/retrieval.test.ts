// Optical closure: synthetic measurements from a known index are recovered within their stated uncertainty, and
// a case whose answer is not unique is flagged.
import { describe, expect, it } from 'vitest'
import { computeSampleOptics, InputError, normalQuantile, retrieveRefractiveIndex, Xoshiro128, type SizeSpec } from '../../src-core/index.ts'

const size: SizeSpec = { kind: 'modes', modes: [{ by: 'number', number_cm3: 3000, median_um: 0.12, gsd: 1.6 }] }

/** Synthetic "measurements": the study pipeline (computeSampleOptics) with a constant user index. */
function synthetic(n: number, k: number, wavelengths: number[]) {
  const study = { wavelengths_nm: wavelengths, user_materials: [{ id: 'truth', name: 'known index', index: { kind: 'constant' as const, n, k }, density_g_cm3: 1.5, kappa: 0 }] }
  return computeSampleOptics({ name: 'synthetic', size, composition: { components: [{ material: 'truth', volume_fraction: 1 }], mixing: 'volume-average' }, rh_percent: 0, rh_history: 'rising', layer: { kind: 'depth', depth_m: 1 } }, study, { angularWavelengthsNm: [] }).wavelengths
}

const coarse = { gridN: 11, kPerDecade: 3 }

describe('closure retrieval', () => {
  it('recovers a known index from noisy scattering at three wavelengths and absorption at one (within 3 sd)', () => {
    const truth = { n: 1.55, k: 0.03 }
    const rows = synthetic(truth.n, truth.k, [450, 550, 700])
    const g = new Xoshiro128(1)
    // noise: 5 % on scattering, 10 % on absorption (typical stated instrument uncertainties, common practice)
    const noisy = (v: number, rel: number) => ({ value: v * (1 + rel * normalQuantile(g.nextUniform())), sd: v * rel })
    const r = retrieveRefractiveIndex(
      { size, scattering: rows.map((w) => ({ wavelength_nm: w.wavelength_nm, ...noisy(w.sca, 0.05) })), absorption: [{ wavelength_nm: 550, ...noisy(rows[1].abs, 0.1) }] },
      coarse
    )
    expect(r.unique).toBe(true)
    expect(r.best.sd_n).not.toBeNull()
    expect(r.best.sd_k).not.toBeNull()
    expect(Math.abs(r.best.n - truth.n)).toBeLessThan(3 * r.best.sd_n!)
    expect(Math.abs(r.best.k - truth.k)).toBeLessThan(3 * r.best.sd_k!)
    // the stated uncertainties are informative, not the whole domain
    expect(r.best.sd_n!).toBeLessThan(0.05)
    expect(r.best.sd_k!).toBeLessThan(0.01)
    expect(r.dof).toBe(2)
  })

  it('recovers a non-absorbing index with backscatter fraction, and k at its lower bound', () => {
    const rows = synthetic(1.45, 0, [450, 700])
    const r = retrieveRefractiveIndex(
      {
        size,
        scattering: rows.map((w) => ({ wavelength_nm: w.wavelength_nm, value: w.sca, sd: 0.03 * w.sca })),
        absorption: [{ wavelength_nm: 450, value: rows[0].abs, sd: 0.2 }],
        backscatter_fraction: [{ wavelength_nm: 450, value: rows[0].backscatter_fraction, sd: 0.01 }]
      },
      coarse
    )
    expect(Math.abs(r.best.n - 1.45)).toBeLessThan(0.01)
    expect(r.best.k).toBeLessThan(1e-3)
    expect(r.best.chi2).toBeLessThan(0.1)
  })

  it('flags scattering alone at one wavelength as not unique: n and k trade off (common practice)', () => {
    const rows = synthetic(1.55, 0.03, [550])
    const r = retrieveRefractiveIndex({ size, scattering: [{ wavelength_nm: 550, value: rows[0].sca, sd: 0.03 * rows[0].sca }] }, coarse)
    expect(r.unique).toBe(false)
    expect(r.warnings.some((w) => w.startsWith('not unique'))).toBe(true)
    // every reported solution reproduces the one measurement (χ² well below Δχ²)
    for (const s of [r.best, ...r.alternatives]) expect(s.chi2).toBeLessThan(r.delta_chi2)
    // and they are different indices
    if (r.alternatives.length) expect(Math.max(...r.alternatives.map((a) => Math.abs(a.n - r.best.n) + Math.abs(a.k - r.best.k)))).toBeGreaterThan(0.02)
  })

  it('refuses measurements without an uncertainty, and no measurements at all', () => {
    expect(() => retrieveRefractiveIndex({ size, scattering: [{ wavelength_nm: 550, value: 10, sd: 0 }] })).toThrow(InputError)
    expect(() => retrieveRefractiveIndex({ size })).toThrow(/no measurements/)
  })
})
