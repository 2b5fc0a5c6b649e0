import { describe, expect, it } from 'vitest'
import { aerodynamicDiameter, cunninghamSlipCorrection, MEAN_FREE_PATH_AIR_UM, volumeDiameterFromAerodynamic } from '../../src-core/index.ts'

describe('Cunningham slip correction (Seinfeld & Pandis, ch. 9)', () => {
  it('uses λ = 0.0651 µm for air at 298 K, 1 atm (Seinfeld & Pandis ch. 9)', () => {
    expect(MEAN_FREE_PATH_AIR_UM).toBe(0.0651)
  })

  it('C_c(0.1 µm) ≈ 2.9 and C_c(1 µm) ≈ 1.16 (Seinfeld & Pandis table 9.3, from memory)', () => {
    expect(Math.abs(cunninghamSlipCorrection(0.1) - 2.88)).toBeLessThan(0.05)
    expect(Math.abs(cunninghamSlipCorrection(1) - 1.16)).toBeLessThan(0.01)
    // C_c(10 µm) ≈ 1.016 (same table, from memory)
    expect(Math.abs(cunninghamSlipCorrection(10) - 1.016)).toBeLessThan(0.002)
  })

  it('has the continuum and free-molecular limits: (C_c − 1) d / 2λ → 1.257 for d ≫ λ, → 1.657 for d ≪ λ', () => {
    const lam = MEAN_FREE_PATH_AIR_UM
    expect(((cunninghamSlipCorrection(100) - 1) * 100) / (2 * lam)).toBeCloseTo(1.257, 10)
    expect(((cunninghamSlipCorrection(1e-5) - 1) * 1e-5) / (2 * lam)).toBeCloseTo(1.657, 3)
    // C_c decreases with size
    expect(cunninghamSlipCorrection(0.05)).toBeGreaterThan(cunninghamSlipCorrection(0.5))
  })
})

describe('aerodynamic diameter, Stokes regime with slip (Seinfeld & Pandis ch. 9; Hinds, Aerosol Technology ch. 3)', () => {
  it('a unit-density sphere (χ = 1) has d_a = d at every size (definition, ρ₀ = 1 g cm⁻³)', () => {
    for (const d of [0.005, 0.1, 1, 2.5, 30]) expect(aerodynamicDiameter(d, 1) / d).toBeCloseTo(1, 12)
  })

  it('d_a → d √(ρ_p/χ) as slip vanishes (large d) (Hinds, from memory)', () => {
    const r100 = aerodynamicDiameter(100, 2) / (100 * Math.SQRT2)
    const r10 = aerodynamicDiameter(10, 2) / (10 * Math.SQRT2)
    expect(Math.abs(r100 - 1)).toBeLessThan(1e-3)
    expect(Math.abs(r100 - 1)).toBeLessThan(Math.abs(r10 - 1)) // approaches the limit with size
    expect(aerodynamicDiameter(200, 1.5, { shapeFactor: 1.5 }) / 200).toBeCloseTo(1, 3)
  })

  it('d_a → d ρ_p/χ in the free-molecular limit, where C_c ∝ 1/d (follows from the limit above, Seinfeld & Pandis ch. 9)', () => {
    expect(aerodynamicDiameter(1e-4, 2) / 1e-4).toBeCloseTo(2, 2)
  })

  it('satisfies ρ₀ χ d_a² C_c(d_a) = ρ_p d_v² C_c(d_v), and the inverse recovers d_v', () => {
    for (const [d, rho, chi] of [[0.05, 1.8, 1], [0.7, 2.65, 1.36], [3, 1.2, 1.1], [12, 1.0, 1.5]]) {
      const da = aerodynamicDiameter(d, rho, { shapeFactor: chi })
      const lhs = chi * da * da * cunninghamSlipCorrection(da)
      const rhs = rho * d * d * cunninghamSlipCorrection(d)
      expect(lhs / rhs).toBeCloseTo(1, 12)
      expect(volumeDiameterFromAerodynamic(da, rho, { shapeFactor: chi }) / d).toBeCloseTo(1, 12)
    }
  })
})
