// Reading what people type: lengths, temperatures, complex indices and wavelength lists.
import { describe, expect, it } from 'vitest'
import { InputError, parseComplexIndex, parseLength, parseTemperature, parseWavelengthList } from '../src-core/index.ts'

describe('typed quantities (SI prefixes and the kelvin–Celsius offset, common practice)', () => {
  it('reads lengths in µm with units or a default unit', () => {
    expect(parseLength('550 nm', 'x')).toBeCloseTo(0.55, 12)
    expect(parseLength('0.12 µm', 'x')).toBeCloseTo(0.12, 12)
    expect(parseLength('0.12um', 'x')).toBeCloseTo(0.12, 12)
    expect(parseLength('1.2e-6 m', 'x')).toBeCloseTo(1.2, 12)
    expect(parseLength('120', 'x', 'nm')).toBeCloseTo(0.12, 12)
    expect(() => parseLength('120', 'diameter')).toThrow(/has no unit/)
    expect(() => parseLength('5 kg', 'diameter')).toThrow(/not a length/)
    expect(() => parseLength('-3 nm', 'diameter')).toThrow(InputError)
  })

  it('reads temperatures in K', () => {
    expect(parseTemperature('298', 't')).toBe(298)
    expect(parseTemperature('25 degC', 't')).toBeCloseTo(298.15, 10)
    expect(() => parseTemperature('-5', 't')).toThrow(/absolute zero/)
  })

  it('reads complex indices n + ik and refuses a negative k', () => {
    expect(parseComplexIndex('1.53+0.01i', 'm')).toEqual({ n: 1.53, k: 0.01 })
    expect(parseComplexIndex('1.33', 'm')).toEqual({ n: 1.33, k: 0 })
    expect(() => parseComplexIndex('1.5-1i', 'm')).toThrow(/negative/)
    expect(() => parseComplexIndex('soot', 'm')).toThrow(InputError)
  })

  it('reads wavelength lists in nm, with units or bare numbers, and checks order and count', () => {
    expect(parseWavelengthList('450, 550, 700', 'w')).toEqual([450, 550, 700])
    expect(parseWavelengthList('450 550 700', 'w')).toEqual([450, 550, 700])
    expect(parseWavelengthList('0.45 um; 550 nm', 'w')).toEqual([450, 550])
    expect(() => parseWavelengthList('550, 450', 'w', { ascending: true })).toThrow(/ascending/)
    expect(() => parseWavelengthList('1,2,3', 'w', { max: 2 })).toThrow(/at most 2/)
    expect(() => parseWavelengthList(' ', 'w')).toThrow(/no wavelength/)
    // a unit on the last item applies to the numbers without one (the command line's habit); else they are nm
    expect(parseWavelengthList('450,550,700nm', 'w')).toEqual([450, 550, 700])
    expect(parseWavelengthList('0.45, 0.55 um', 'w')).toEqual([450, 550])
    expect(parseWavelengthList('0.45um,550', 'w')).toEqual([450, 550])
    expect(parseWavelengthList(' 450, 550, ', 'w')).toEqual([450, 550])
    expect(() => parseWavelengthList('450,550,450nm', 'w', { distinct: true })).toThrow(/450 nm is given twice/)
    expect(() => parseWavelengthList('450, green', 'w')).toThrow(/green/)
  })
})
