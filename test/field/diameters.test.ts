// Volume-equivalent, mobility and aerodynamic diameters (DeCarlo, Slowik, Worsnop, Davidovits & Jimenez 2004,
// Aerosol Sci. Technol. 38:1185), with the Cunningham slip correction of src-core/sizes (Seinfeld & Pandis ch. 9).
import { describe, expect, it } from 'vitest'
import {
  aerodynamicDiameter,
  cunninghamSlipCorrection,
  edgesFromMidpoints,
  mobilityDiameter,
  PSL_INDEX,
  UNIT_DENSITY,
  volumeDiameterFromAerodynamic,
  volumeDiameterFromMobility,
  volumeEquivalentEdges
} from '../../src-core/index.ts'

describe('mobility diameter (DeCarlo et al. 2004: d_m / C_c(d_m) = χ d_ve / C_c(d_ve))', () => {
  it('satisfies the defining relation and the inverse recovers d_ve to 1e-12', () => {
    for (const chi of [1.05, 1.2, 1.6, 2.5]) {
      for (const d of [0.003, 0.02, 0.1, 0.5, 2, 15]) {
        const dm = mobilityDiameter(d, { shapeFactor: chi })
        const lhs = dm / cunninghamSlipCorrection(dm)
        const rhs = (chi * d) / cunninghamSlipCorrection(d)
        expect(lhs / rhs).toBeCloseTo(1, 12)
        expect(volumeDiameterFromMobility(dm, { shapeFactor: chi }) / d).toBeCloseTo(1, 12)
      }
    }
  })

  it('χ = 1: the mobility diameter is the volume-equivalent diameter (DeCarlo et al. 2004, spheres)', () => {
    for (const d of [0.005, 0.1, 3]) {
      expect(mobilityDiameter(d, { shapeFactor: 1 })).toBe(d)
      expect(volumeDiameterFromMobility(d)).toBe(d)
    }
  })

  it('d ≫ λ (continuum, C_c → 1): d_m → χ d_ve; d ≪ λ (free molecular, C_c ∝ 1/d): d_m → √χ d_ve (limits of the relation)', () => {
    expect(mobilityDiameter(500, { shapeFactor: 1.4 }) / 500).toBeCloseTo(1.4, 3)
    // free molecular: d_m²/(2λ·1.657) = χ d_ve²/(2λ·1.657) → d_m = √χ d_ve
    expect(mobilityDiameter(1e-5, { shapeFactor: 1.44 }) / 1e-5).toBeCloseTo(1.2, 3)
    // in between, a non-spherical particle is larger by mobility than by volume, and less so than χ
    const r = mobilityDiameter(0.1, { shapeFactor: 1.4 }) / 0.1
    expect(r).toBeGreaterThan(Math.sqrt(1.4))
    expect(r).toBeLessThan(1.4)
  })
})

describe('aerodynamic diameter to volume-equivalent (DeCarlo et al. 2004: ρ₀ d_a² C_c(d_a) = (ρ_p/χ) d_ve² C_c(d_ve))', () => {
  it('d ≫ λ: d_ve = d_a √(χ ρ₀ / ρ_p) (Stokes regime, the slip terms cancel)', () => {
    for (const [rho, chi] of [[1.8, 1], [2.65, 1.3], [1.2, 1.1]]) {
      const da = 200
      expect(volumeDiameterFromAerodynamic(da, rho, { shapeFactor: chi }) / (da * Math.sqrt((chi * UNIT_DENSITY) / rho))).toBeCloseTo(1, 3)
    }
  })

  it('round trip d_ve → d_a → d_ve to 1e-12 across the transition regime', () => {
    for (const d of [0.05, 0.3, 0.8, 2, 10]) {
      const da = aerodynamicDiameter(d, 1.8, { shapeFactor: 1.15 })
      expect(volumeDiameterFromAerodynamic(da, 1.8, { shapeFactor: 1.15 }) / d).toBeCloseTo(1, 12)
    }
  })
})

describe('volume-equivalent bin edges of a sizer', () => {
  const mid = [0.02, 0.04, 0.08, 0.16]
  const edges = edgesFromMidpoints(mid)

  it('map every edge through the conversion and keep them ascending (so per-bin counts are conserved)', () => {
    const m = volumeEquivalentEdges('mobility', edges, { shapeFactor: 1.3 })
    for (let i = 0; i < edges.length; i++) expect(m.edges[i] / volumeDiameterFromMobility(edges[i], { shapeFactor: 1.3 })).toBeCloseTo(1, 14)
    const a = volumeEquivalentEdges('aerodynamic', [0.5, 1, 2, 4], { shapeFactor: 1, density: 2 })
    for (let i = 1; i < 4; i++) expect(a.edges[i]).toBeGreaterThan(a.edges[i - 1])
  })

  it('an optical counter sampling PSL itself keeps its calibration edges (the re-binning is the identity for the calibration index)', () => {
    const cal = [0.3, 0.5, 0.7, 1.0]
    const r = volumeEquivalentEdges('optical', cal, { shapeFactor: 1, optical: { index: PSL_INDEX, geometry: { wavelengthNm: 780, lowDeg: 35, highDeg: 120 } } })
    for (let i = 0; i < cal.length; i++) expect(r.edges[i] / cal[i]).toBeCloseTo(1, 5)
  })

  it('asks for the density of aerodynamic diameters and for the index of optical ones, with the option to give', () => {
    expect(() => volumeEquivalentEdges('aerodynamic', [1, 2], { shapeFactor: 1 })).toThrow(/--density/)
    expect(() => volumeEquivalentEdges('optical', [1, 2], { shapeFactor: 1 })).toThrow(/--m/)
  })
})
