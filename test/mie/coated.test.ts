// Coated sphere: reductions to the homogeneous sphere and the absorption enhancement of a coated core.
import { describe, expect, it } from 'vitest'
import { coatedSphereEfficiencies, CoatedWorkspace, InputError, sphereEfficiencies } from '../../src-core/index.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)
const fields = ['qext', 'qsca', 'qback', 'g'] as const

describe('coated sphere reduces to a homogeneous sphere (Bohren & Huffman 1983, §8.1)', () => {
  it('equal core and shell indices give the homogeneous sphere of the outer size', () => {
    for (const [xc, xs, n, k] of [[0.5, 1, 1.5, 0.1], [5, 10, 1.53, 0.01], [50, 100, 1.95, 0.79], [300, 500, 1.33, 1e-6]]) {
      const c = coatedSphereEfficiencies(xc, n, k, xs, n, k)
      const h = sphereEfficiencies(xs, n, k)
      for (const f of fields) expect(rel(c[f], h[f])).toBeLessThan(1e-12)
    }
  })

  it('indices that differ by 1e-9 agree with the homogeneous sphere to ~1e-8 (continuity of the general path)', () => {
    for (const [xc, xs, n, k] of [[2, 4, 1.5, 0.01], [20, 30, 1.53, 0.1], [80, 120, 1.33, 0]]) {
      const c = coatedSphereEfficiencies(xc, n + 1e-9, k, xs, n, k)
      const h = sphereEfficiencies(xs, n, k)
      for (const f of fields) expect(rel(c[f], h[f])).toBeLessThan(1e-7)
    }
  })

  it('a core that fills the particle is the homogeneous core sphere', () => {
    for (const [x, nc, kc, ns, ks] of [[1, 1.95, 0.79, 1.5, 0], [10, 1.95, 0.79, 1.53, 0], [60, 1.53, 0.008, 1.33, 0]]) {
      const c = coatedSphereEfficiencies(x, nc, kc, x, ns, ks)
      const h = sphereEfficiencies(x, nc, kc)
      for (const f of fields) expect(rel(c[f], h[f])).toBeLessThan(1e-9)
    }
  })

  it('a vanishing core leaves the homogeneous shell sphere', () => {
    for (const [xs, nc, kc, ns, ks] of [[1, 1.95, 0.79, 1.5, 0], [10, 1.95, 0.79, 1.53, 0.001], [100, 2, 1, 1.33, 0]]) {
      const c = coatedSphereEfficiencies(1e-5 * xs, nc, kc, xs, ns, ks)
      const h = sphereEfficiencies(xs, ns, ks)
      for (const f of ['qext', 'qsca', 'g'] as const) expect(rel(c[f], h[f])).toBeLessThan(1e-9)
    }
  })

  it('no absorption when neither core nor shell absorbs', () => {
    const c = coatedSphereEfficiencies(3, 2.0, 0, 7, 1.4, 0)
    expect(c.qabs).toBe(0)
  })
})

describe('absorption enhancement by a non-absorbing coating ("lensing")', () => {
  // A black-carbon core (Bond & Bergstrom 2006: 1.95 + 0.79i near 550 nm) of 100 nm diameter at 550 nm,
  // coated with a non-absorbing shell (1.50, sulfate-like, from memory). The absorption cross-section of the
  // coated particle divided by that of the bare core must exceed 1 and grow with shell thickness
  // (e.g. Bond, Habib & Bergstrom 2006, J. Geophys. Res. 111:D20211, from memory: up to ~1.5–2 for thick coats).
  it('exceeds 1 and rises with shell thickness', () => {
    const xCore = (Math.PI * 0.1) / 0.55
    const bare = sphereEfficiencies(xCore, 1.95, 0.79).qabs * xCore * xCore
    let last = 1
    for (const ratio of [1.2, 1.5, 2, 3]) {
      const xs = xCore * ratio
      const coated = coatedSphereEfficiencies(xCore, 1.95, 0.79, xs, 1.5, 0).qabs * xs * xs
      const enhancement = coated / bare
      expect(enhancement).toBeGreaterThan(last)
      last = enhancement
    }
    expect(last).toBeGreaterThan(1.3)
    expect(last).toBeLessThan(3)
  })
})

describe('coated sphere input', () => {
  it('refuses a core larger than the particle, with the sizes in the message', () => {
    expect(() => coatedSphereEfficiencies(5, 1.5, 0, 4, 1.4, 0)).toThrow(InputError)
    expect(() => coatedSphereEfficiencies(5, 1.5, 0, 4, 1.4, 0)).toThrow(/core/)
  })
  it('refuses indices outside the domain and names core or shell', () => {
    expect(() => coatedSphereEfficiencies(1, 1.5, -1, 2, 1.4, 0)).toThrow(/core/)
    expect(() => coatedSphereEfficiencies(1, 1.5, 0, 2, 40, 0)).toThrow(/shell/)
  })
  it('a workspace can be reused across sizes without carrying state', () => {
    const ws = new CoatedWorkspace()
    const a1 = coatedSphereEfficiencies(2, 1.95, 0.79, 5, 1.5, 0, ws).qext
    coatedSphereEfficiencies(200, 1.95, 0.79, 500, 1.5, 0, ws)
    expect(coatedSphereEfficiencies(2, 1.95, 0.79, 5, 1.5, 0, ws).qext).toBe(a1)
  })
})
