import { describe, expect, it } from 'vitest'
import { defineUserMaterial, refractiveIndexAt } from '../../src-core/index.ts'
import { thrownMessage } from './helpers.ts'

const STUDY = [0.35, 0.55, 1.0]

describe('user components: constant index', () => {
  it('returns the same index at every wavelength', () => {
    const m = defineUserMaterial({ id: 'grey', densityGcm3: 1.5, index: { kind: 'constant', n: 1.6, k: 0.01 } }, STUDY)
    for (const wl of [0.2, 0.55, 10]) expect(refractiveIndexAt(m, wl)).toEqual({ n: 1.6, k: 0.01 })
    expect(m.kappa).toBe(0)
  })

  it('rejects n <= 0 and k < 0 with InputError naming the component', () => {
    expect(thrownMessage(() => defineUserMaterial({ id: 'bad', densityGcm3: 1, index: { kind: 'constant', n: 0, k: 0 } }, STUDY))).toContain('bad')
    expect(thrownMessage(() => defineUserMaterial({ id: 'bad', densityGcm3: 1, index: { kind: 'constant', n: 1.5, k: -0.1 } }, STUDY))).toContain('-0.1')
  })

  it('rejects a bad density, κ, id, or a catalogue id', () => {
    const index = { kind: 'constant', n: 1.5, k: 0 } as const
    thrownMessage(() => defineUserMaterial({ id: 'x', densityGcm3: 0, index }, STUDY))
    thrownMessage(() => defineUserMaterial({ id: 'x', densityGcm3: 1, kappa: -0.1, index }, STUDY))
    thrownMessage(() => defineUserMaterial({ id: 'My Smoke', densityGcm3: 1, index }, STUDY))
    expect(thrownMessage(() => defineUserMaterial({ id: 'water', densityGcm3: 1, index }, STUDY))).toContain('catalogue')
  })
})

describe('user components: table', () => {
  const rows: [number, number, number][] = [
    [1.2, 1.48, 0.002],
    [0.3, 1.55, 0.02],
    [0.6, 1.5, 0]
  ]

  it('accepts already-parsed rows in any order and interpolates them (n linear in ln λ)', () => {
    const m = defineUserMaterial({ id: 'tab', densityGcm3: 1.2, index: { kind: 'table', rows } }, [0.4, 1.0])
    expect(m.rangeUm).toEqual([0.3, 1.2])
    expect(refractiveIndexAt(m, 0.6)).toEqual({ n: 1.5, k: 0 })
    // geometric mean of 0.6 and 1.2: n is the mean; one k is zero so k is linear in ln λ, also the mean
    const mid = refractiveIndexAt(m, Math.sqrt(0.72))
    expect(mid.n).toBeCloseTo(1.49, 12)
    expect(mid.k).toBeCloseTo(0.001, 12)
  })

  it('rejects a study wavelength outside the table, naming component and wavelength', () => {
    const msg = thrownMessage(() => defineUserMaterial({ id: 'tab', densityGcm3: 1.2, index: { kind: 'table', rows } }, [0.55, 2.0]))
    expect(msg).toContain('tab')
    expect(msg).toContain('2 µm')
  })

  it('rejects repeated wavelengths, n <= 0, k < 0 and a single row', () => {
    thrownMessage(() => defineUserMaterial({ id: 't', densityGcm3: 1, index: { kind: 'table', rows: [[0.5, 1.5, 0], [0.5, 1.6, 0]] } }, [0.5]))
    expect(thrownMessage(() => defineUserMaterial({ id: 't', densityGcm3: 1, index: { kind: 'table', rows: [[0.4, 1.5, 0], [0.5, -1, 0]] } }, [0.45]))).toContain('0.5 µm')
    thrownMessage(() => defineUserMaterial({ id: 't', densityGcm3: 1, index: { kind: 'table', rows: [[0.4, 1.5, -1e-3], [0.5, 1.5, 0]] } }, [0.45]))
    thrownMessage(() => defineUserMaterial({ id: 't', densityGcm3: 1, index: { kind: 'table', rows: [[0.4, 1.5, 0]] } }, [0.4]))
  })
})

describe('user components: mathjs expressions of wl_um and wl_nm', () => {
  it('evaluates a power law in k: 0.02 (λ/550 nm)^−5 (closed form)', () => {
    const m = defineUserMaterial({ id: 'smoke', densityGcm3: 1.3, kappa: 0.1, index: { kind: 'expression', n: '1.5', k: '0.02 * (wl_nm/550)^-5' } }, STUDY)
    expect(refractiveIndexAt(m, 0.55).k).toBeCloseTo(0.02, 14)
    expect(refractiveIndexAt(m, 0.4).k / (0.02 * Math.pow(400 / 550, -5))).toBeCloseTo(1, 12)
    expect(refractiveIndexAt(m, 0.4).n).toBe(1.5)
  })

  it('wl_um and wl_nm describe the same wavelength (1 µm = 1000 nm)', () => {
    const a = defineUserMaterial({ id: 'a', densityGcm3: 1, index: { kind: 'expression', n: '1.5 + 0.004 / wl_um^2', k: '0' } }, STUDY)
    const b = defineUserMaterial({ id: 'b', densityGcm3: 1, index: { kind: 'expression', n: '1.5 + 4000 / wl_nm^2', k: '0' } }, STUDY)
    for (const wl of [0.3, 0.55, 2]) expect(refractiveIndexAt(a, wl).n).toBeCloseTo(refractiveIndexAt(b, wl).n, 12)
  })

  it('an expression that does not parse says so, with the expression text', () => {
    const msg = thrownMessage(() => defineUserMaterial({ id: 'p', densityGcm3: 1, index: { kind: 'expression', n: '1.5 * (wl_um', k: '0' } }, STUDY))
    expect(msg).toContain('1.5 * (wl_um')
    expect(msg).toContain('parse')
  })

  it('non-real, NaN, infinite or unknown-variable results say so, with the expression text', () => {
    for (const k of ['sqrt(-wl_um)', '0/0', '1/(wl_um - wl_um)', 'x * 2']) {
      expect(thrownMessage(() => defineUserMaterial({ id: 'q', densityGcm3: 1, index: { kind: 'expression', n: '1.5', k } }, STUDY))).toContain(k)
    }
  })

  it('k < 0 or n <= 0 at a study wavelength names that wavelength', () => {
    // k = 0.01 (λ − 0.5 µm) is negative only at 0.35 µm among the study wavelengths
    const msg = thrownMessage(() => defineUserMaterial({ id: 'neg', densityGcm3: 1, index: { kind: 'expression', n: '1.5', k: '0.01 * (wl_um - 0.5)' } }, STUDY))
    expect(msg).toContain('neg')
    expect(msg).toContain('0.35 µm')
    const msg2 = thrownMessage(() => defineUserMaterial({ id: 'neg', densityGcm3: 1, index: { kind: 'expression', n: '1 - wl_um', k: '0' } }, STUDY))
    expect(msg2).toContain('1 µm')
  })
})
