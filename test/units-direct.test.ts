// The metric lengths and plain complex indices that src-core/units.ts reads without mathjs must read exactly as
// mathjs reads them (the library itself is the reference here: its unit conversion and its complex() parser).
import * as math from 'mathjs'
import { describe, expect, it } from 'vitest'
import { parseComplexIndex, readLength, Xoshiro128 } from '../src-core/index.ts'

/** What readLength gave before the direct path: mathjs's conversion, rounded to 12 significant digits. */
const byMathjs = (n: number, unit: string) => Number(math.unit(n, unit).toNumber('um').toPrecision(12))

describe('metric lengths read without mathjs (SI prefixes, common practice; mathjs as the reference)', () => {
  it('give mathjs\'s value, to the bit, for 1 to 17 significant digits in nm, um, mm, cm, m and km', () => {
    const rng = new Xoshiro128(20261205)
    const next = () => rng.nextUniform()
    let checked = 0
    for (const unit of ['nm', 'um', 'mm', 'cm', 'm', 'km']) {
      for (let digits = 1; digits <= 17; digits++) {
        for (let i = 0; i < 60; i++) {
          const mantissa = (1 + Math.floor(next() * 9 * 10 ** (digits - 1))).toString()
          const exponent = Math.floor(next() * 13) - 6
          const text = `${mantissa}e${exponent} ${unit}`
          const n = Number(`${mantissa}e${exponent}`)
          expect(readLength(text, 'test').um, text).toBe(byMathjs(n, unit))
          checked++
        }
      }
    }
    // edge cases: a half, the longest 12-digit numbers, trailing zeros, and 15 digits (read by mathjs, not directly)
    for (const text of ['0.5 nm', '1234567890.12 nm', '0.000123456789012 km', '999999999999 nm', '1.00000000000 mm', '5e-7 m']) {
      const [num, unit] = text.split(' ')
      expect(readLength(text, 'test').um, text).toBe(byMathjs(Number(num), unit))
    }
    expect(checked).toBe(6 * 17 * 60)
  })

  it('reads µ, micron and a bare default as before, and leaves other units to mathjs', () => {
    expect(readLength('0.55 µm', 'test').um).toBe(0.55)
    expect(readLength('0.55 micron', 'test').um).toBe(0.55)
    expect(readLength('550', 'test', { defaultUnit: 'nm' }).um).toBe(0.55)
    // not metric: mathjs reads them (1 in = 25 400 µm exactly, by definition)
    expect(readLength('1 inch', 'test').um).toBe(25400)
    expect(() => readLength('5 kg', 'test')).toThrow(/not a length/)
    expect(() => readLength('5 NM', 'test')).toThrow()
  })
})

describe('plain complex indices read without mathjs (mathjs complex() as the reference)', () => {
  const cases = [
    '1.5', '1.53+0.01i', '1.53 + 0.01i', '1.33', '1.5+0i', '1.5-0i', '0+0i', '-0', '2', '.5+.1i', '1.+2.i', '1e0+1e-3i',
    '1.55+1.2e-7i', '1.95+0.79i', '3.5+2.5j', '1.5+0.010000000000000002i', '+1.5+0.2i', '1.5-0.2i',
    '0.000001+123456789i', '12345678901234567890+1i'
  ]
  for (const text of cases) {
    it(`"${text}" as mathjs reads it`, () => {
      const t = text.replace(/\s+/g, '').replace(/j$/, 'i')
      const c = math.complex(t) as unknown as { re: number; im: number }
      if (c.im < 0) {
        expect(() => parseComplexIndex(text, 'test')).toThrow(/negative/)
        return
      }
      const got = parseComplexIndex(text, 'test')
      expect(Object.is(got.n, c.re), `n of ${text}: ${got.n} against ${c.re}`).toBe(true)
      expect(Object.is(got.k, c.im), `k of ${text}: ${got.k} against ${c.im}`).toBe(true)
    })
  }

  it('reads the parts the other way round and an upper-case exponent too', () => {
    expect(parseComplexIndex('0.01i+1.53', 'test')).toEqual({ n: 1.53, k: 0.01 })
    expect(parseComplexIndex('1E0+1E-3i', 'test')).toEqual({ n: 1, k: 0.001 })
    expect(parseComplexIndex('1.53 − 0i', 'test')).toEqual({ n: 1.53, k: 0 })
  })

  it('refuses a sum without i, which mathjs would add up (1.5+0.01 as 1.51), and other forms, with the fix', () => {
    expect(math.complex('1.5+0.01').re).toBe(1.51)
    expect(() => parseComplexIndex('1.5+0.01', '--m')).toThrow(/no imaginary part marked with i.*1\.5\+0\.01i/)
    expect(() => parseComplexIndex('1.5+0.01i+0.02', '--m')).toThrow(/not a complex refractive index/)
    expect(() => parseComplexIndex('1.5+i', '--m')).toThrow(/not a complex refractive index/)
    expect(() => parseComplexIndex('abc', '--m')).toThrow(/not a complex refractive index/)
    expect(() => parseComplexIndex('1.5 0.01i', '--m')).toThrow(/not a complex refractive index/)
  })
})
