// Optical particle counter re-binning: identity for the calibration index, the Rayleigh limit, absorbing
// particles sized too small, and flags where the response is not monotonic.
import { describe, expect, it } from 'vitest'
import { opcResponseCurve, PSL_INDEX, rebinOpcEdges } from '../../src-core/index.ts'

const geometry = { wavelengthNm: 633, lowDeg: 35, highDeg: 120 }

describe('optical particle counter re-binning', () => {
  it('is the identity when the sample index is the calibration index', () => {
    const edges = [0.1, 0.2, 0.3, 0.5, 0.8, 1.2, 2]
    const r = rebinOpcEdges(edges, PSL_INDEX, geometry)
    r.edges.forEach((e, i) => {
      expect(e.true_um).toBeCloseTo(edges[i], 6)
      expect(e.candidates_um.some((c) => Math.abs(c / edges[i] - 1) < 1e-6)).toBe(true)
    })
  })

  it('in the Rayleigh limit maps D by (|K_PSL|²/|K|²)^(1/6), K = (m²−1)/(m²+2) (Bohren & Huffman ch. 5, closed form)', () => {
    const K2 = (n: number, k: number) => {
      const re = n * n - k * k
      const im = 2 * n * k
      const ar = re - 1
      const br = re + 2
      return (ar * ar + im * im) / (br * br + im * im)
    }
    const m = { n: 1.45, k: 0.02 }
    const r = rebinOpcEdges([0.01, 0.02], m, geometry)
    const factor = Math.pow(K2(1.59, 0) / K2(m.n, m.k), 1 / 6)
    // x ≤ 0.1: the Rayleigh form holds to about x² ≈ 1 %; allow 1 %
    for (const e of r.edges) expect(e.true_um / e.calibration_um).toBeCloseTo(factor, 2)
  })

  it('maps an absorbing particle (same n as PSL) to a larger true diameter for particles near and above the wavelength (common practice)', () => {
    const r = rebinOpcEdges([0.4, 0.6, 0.8, 2, 3, 5], { n: 1.59, k: 0.1 }, geometry)
    for (const e of r.edges) expect(e.true_um).toBeGreaterThan(e.calibration_um)
  })

  it('flags bins where the response is not monotonic and lists every candidate diameter', () => {
    // PSL's response over 35°–120° at 633 nm has Mie resonances between about 1 and 3 µm (see the curve)
    const d = Array.from({ length: 200 }, (_, i) => 0.8 + (2.4 * i) / 199)
    const curve = opcResponseCurve(d, PSL_INDEX, geometry)
    let turns = 0
    for (let i = 2; i < curve.length; i++) if (Math.sign(curve[i] - curve[i - 1]) !== Math.sign(curve[i - 1] - curve[i - 2])) turns++
    expect(turns).toBeGreaterThan(0)
    const r = rebinOpcEdges([0.5, 1, 1.5, 2], { n: 1.5, k: 0 }, geometry)
    expect(r.bins.some((b) => b.flagged)).toBe(true)
    const amb = r.edges.filter((e) => e.ambiguous)
    expect(amb.length).toBeGreaterThan(0)
    for (const e of amb) expect(e.candidates_um.length + e.calibration_candidates_um.length).toBeGreaterThan(2)
    // a flagged bin says why
    for (const b of r.bins.filter((x) => x.flagged)) expect(b.reasons.length).toBeGreaterThan(0)
  })
})
