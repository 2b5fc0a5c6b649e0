import { describe, expect, it } from 'vitest'
import {
  dNdlnD,
  dNdlnDOfLnD,
  dNdlogD,
  type LognormalMode,
  massConcentration,
  modeFromMass,
  modeFromNumber,
  modeFromVolume,
  moment,
  numberConcentration,
  surfaceConcentration,
  surfaceMedianDiameter,
  toVolumeForm,
  volumeConcentration,
  volumeMedianDiameter
} from '../../src-core/index.ts'
import { trapezoidMoment } from './helpers.ts'

/** Trapezoid rule in u = ln D of D^k dN/dlnD over ±span ln σ_g about the D^k median, with n intervals. */
function numericMoment(mode: LognormalMode, k: number, n = 4000, span = 14, upTo = Infinity): number {
  const l = Math.log(mode.gsd)
  const c = Math.log(mode.median) + k * l * l
  return trapezoidMoment(mode, k, c - span * l, Math.min(c + span * l, upTo), n)
}

const GSDS = [1.05, 1.5, 2.5, 3]

describe('lognormal modes: Hatch–Choate (Seinfeld & Pandis, ch. 8)', () => {
  it('moments M_k = N D_g^k exp(k² ln²σ_g / 2) agree with numerical integration of dN/dlnD, k = 0..6', () => {
    for (const gsd of GSDS) {
      const mode = modeFromNumber({ number: 2500, median: 0.12, gsd })
      for (let k = 0; k <= 6; k++) {
        expect(Math.abs(moment(mode, k) / numericMoment(mode, k) - 1)).toBeLessThan(1e-9)
      }
    }
  })

  it('surface = π M₂, volume = (π/6) M₃ against numerical integration of πD² and πD³/6 (spheres)', () => {
    const mode = modeFromNumber({ number: 800, median: 0.3, gsd: 1.8 })
    expect(numberConcentration(mode)).toBe(800)
    expect(Math.abs(surfaceConcentration(mode) / (Math.PI * numericMoment(mode, 2)) - 1)).toBeLessThan(1e-9)
    expect(Math.abs(volumeConcentration(mode) / ((Math.PI / 6) * numericMoment(mode, 3)) - 1)).toBeLessThan(1e-9)
  })

  it('surface and volume medians split the surface and volume in half (numerical integration)', () => {
    for (const gsd of GSDS) {
      const mode = modeFromNumber({ number: 100, median: 0.05, gsd })
      const dsg = surfaceMedianDiameter(mode)
      const dvg = volumeMedianDiameter(mode)
      expect(numericMoment(mode, 2, 4000, 14, Math.log(dsg)) / numericMoment(mode, 2)).toBeCloseTo(0.5, 9)
      expect(numericMoment(mode, 3, 4000, 14, Math.log(dvg)) / numericMoment(mode, 3)).toBeCloseTo(0.5, 9)
      // Hatch–Choate: D_vg = D_g exp(3 ln²σ_g)
      expect(dvg / mode.median).toBeCloseTo(Math.exp(3 * Math.log(gsd) ** 2), 12)
    }
  })

  it('dN/dlnD peaks at D_g, is symmetric in ln D, and dN/dlogD = ln(10) dN/dlnD integrates to N over log₁₀D', () => {
    const mode = modeFromNumber({ number: 1000, median: 0.1, gsd: 1.7 })
    expect(dNdlnD(mode, 0.1)).toBeGreaterThan(dNdlnD(mode, 0.1 * 1.001))
    expect(dNdlnD(mode, 0.1)).toBeGreaterThan(dNdlnD(mode, 0.1 / 1.001))
    expect(dNdlnD(mode, 0.1 * 3) / dNdlnD(mode, 0.1 / 3)).toBeCloseTo(1, 12)
    // ∫ dN/dlogD dlog₁₀D by trapezoid over ±14 ln σ_g
    const l = Math.log(1.7)
    const a = Math.log10(0.1) - (14 * l) / Math.LN10
    const b = Math.log10(0.1) + (14 * l) / Math.LN10
    const n = 4000
    let s = 0
    for (let i = 0; i <= n; i++) {
      const f = dNdlogD(mode, 10 ** (a + ((b - a) * i) / n))
      s += i === 0 || i === n ? f / 2 : f
    }
    expect((s * (b - a)) / n).toBeCloseTo(1000, 8)
  })

  it('dN/dlnD as a function of ln D integrates to N over ln D and peaks at ln D_g, and rejects a bad mode once', () => {
    // Normalisation of the lognormal (Seinfeld & Pandis, Atmospheric Chemistry and Physics, ch. 8):
    // ∫ dN/dlnD dlnD = N. Trapezoid over ±14 ln σ_g, which is exact to rounding for a Gaussian (common practice).
    const mode = modeFromNumber({ number: 250, median: 0.35, gsd: 2.1 })
    const f = dNdlnDOfLnD(mode)
    const l = Math.log(2.1)
    const a = Math.log(0.35) - 14 * l
    const n = 2000
    const h = (28 * l) / n
    let s = 0
    for (let i = 0; i <= n; i++) s += (i === 0 || i === n ? 0.5 : 1) * f(a + i * h)
    expect(s * h).toBeCloseTo(250, 9)
    // its peak: N / (√(2π) ln σ_g) at D = D_g (the Gaussian's height)
    expect(f(Math.log(0.35))).toBeCloseTo(250 / (Math.sqrt(2 * Math.PI) * l), 12)
    expect(() => dNdlnDOfLnD({ number: 1, median: 0.1, gsd: 1 })).toThrow(/gsd/)
  })

  it('volume form → number form → volume form round trip', () => {
    for (const gsd of GSDS) {
      const v = { volume: 12.5, volumeMedian: 0.35, gsd }
      const mode = modeFromVolume(v)
      const back = toVolumeForm(mode)
      expect(back.volume / v.volume).toBeCloseTo(1, 12)
      expect(back.volumeMedian / v.volumeMedian).toBeCloseTo(1, 12)
      // and independently: numerical (π/6)∫D³ dN of the number-form mode gives the volume asked for
      expect(((Math.PI / 6) * numericMoment(mode, 3)) / v.volume).toBeCloseTo(1, 9)
    }
  })

  it('mass form: mass = density × volume, with µm³ cm⁻³ × g cm⁻³ = µg m⁻³', () => {
    const mode = modeFromMass({ mass: 17.7, massMedian: 0.3, density: 1.77, gsd: 1.6 })
    expect(volumeConcentration(mode)).toBeCloseTo(10, 10)
    expect(massConcentration(mode, 1.77)).toBeCloseTo(17.7, 10)
    // Nearly monodisperse: 1000 cm⁻³ of 1 µm unit-density spheres weigh 1000·π/6 µg m⁻³
    // (m = N ρ π d³/6, Hinds, Aerosol Technology, from memory; 1 µm³ cm⁻³ · 1 g cm⁻³ = 1e-12 g · 1e6 m⁻³ = 1 µg m⁻³)
    const mono = modeFromNumber({ number: 1000, median: 1, gsd: 1.001 })
    expect(massConcentration(mono, 1) / ((1000 * Math.PI) / 6)).toBeCloseTo(1, 5)
  })
})
