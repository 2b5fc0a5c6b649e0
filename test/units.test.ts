// Reading what people type: numbers, lengths, temperatures, complex indices and wavelength lists; and numbers
// written back to people in messages.
import { describe, expect, it } from 'vitest'
import { InputError, parseComplexIndex, parseLength, parseNumber, parseTemperature, parseWavelengthList, readableBeside, readableNumber, readAmount, readLength } from '../src-core/index.ts'

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

  it('refuses a bare number that the list\'s unit puts far outside every built-in table (0.2–40 µm), naming the unit meant', () => {
    // "0.7um" last makes the bare numbers µm: 450 µm was surely 450 nm
    expect(() => parseWavelengthList('450, 550, 0.7um', 'w')).toThrow(/"450" has no unit, so it was read in µm like the last one \("0\.7um"\): 450 µm .*Write its unit \("450 nm"\)/)
    // no unit at all, or nm last: a bare 0.45 is 0.45 nm, surely 0.45 µm
    expect(() => parseWavelengthList('0.45, 0.55, 0.7', 'w')).toThrow(/"0\.45" has no unit, so it was read in nm .*Write its unit \("0\.45 um"\), or give the wavelengths in nm \(for example 450\)/)
    expect(() => parseWavelengthList('0.45, 550nm', 'w')).toThrow(/"0\.45" has no unit/)
    // with its unit written, a length is read as written (a material's table judges its range)
    expect(parseWavelengthList('50 nm, 0.2 um', 'w')).toEqual([50, 200])
    expect(parseWavelengthList('200, 40000', 'w')).toEqual([200, 40000])
    expect(parseWavelengthList('0.2, 40um', 'w')).toEqual([200, 40000])
  })
})

describe('typed numbers: thousands separators, decimal commas and percent signs (common practice)', () => {
  const why = (f: () => unknown): string => {
    try {
      f()
    } catch (e) {
      return (e as Error).message
    }
    return 'no error'
  }

  it('reads thousands separators only between groups of exactly three digits', () => {
    expect(parseNumber('9,000', 'N')).toBe(9000)
    expect(parseNumber('1,234,567.5', 'N')).toBe(1234567.5)
    expect(parseNumber('12 500', 'N')).toBe(12500)
    expect(parseNumber('12\u202f500', 'N')).toBe(12500)
    expect(parseNumber('−2.5e3', 'N')).toBe(-2500)
    expect(parseNumber('.5', 'N')).toBe(0.5)
    // a group that is not three digits long is not a thousands group
    expect(() => parseNumber('9,0000', 'N')).toThrow(InputError)
    expect(() => parseNumber('1 5', 'N')).toThrow(/not one number/)
  })

  it('refuses a comma that could be a decimal mark, offering both readings', () => {
    expect(why(() => parseNumber('1,5', 'N'))).toMatch(/^N: "1,5" is ambiguous: .*comma.*Write 1\.5 or 15/)
    expect(why(() => parseNumber('12,50', 'N'))).toMatch(/Write 12\.50 or 1250/)
    // a leading zero cannot be a thousands group: only the decimal reading is offered
    expect(why(() => parseNumber('0,85', 'x'))).toMatch(/Write 0\.85, with a point/)
    expect(() => parseNumber('1.500,5', 'N')).toThrow(InputError)
  })

  it('reads a percent sign only where the value is a fraction or a percentage', () => {
    expect(parseNumber('80%', 'f', { percent: 'fraction' })).toBeCloseTo(0.8, 15)
    expect(parseNumber('80 %', 'f', { percent: 'fraction' })).toBeCloseTo(0.8, 15)
    expect(parseNumber('0.8', 'f', { percent: 'fraction' })).toBe(0.8)
    expect(parseNumber('80%', 'rh', { percent: 'percent' })).toBe(80)
    expect(() => parseNumber('80%', 'N')).toThrow(/percent sign/)
  })

  it('refuses words, hexadecimal and empty text', () => {
    expect(() => parseNumber('twelve', 'N')).toThrow(/not a number/)
    expect(() => parseNumber('0x10', 'N')).toThrow(/not a number/)
    expect(() => parseNumber('  ', 'N')).toThrow(/no value/)
  })

  it('reads a bare length in the unit the field shows, and reports the unit typed', () => {
    expect(readLength('60', 'D', { defaultUnit: 'nm' })).toEqual({ um: 0.06, unit: 'nm', written: false })
    expect(readLength('60', 'D', { defaultUnit: 'um' }).um).toBe(60)
    expect(readLength('2.5 µm', 'D', { defaultUnit: 'nm' })).toEqual({ um: 2.5, unit: 'um', written: true })
    expect(readLength('1e3 nm', 'D', { defaultUnit: 'um' }).um).toBeCloseTo(1, 12)
    expect(readLength('1,500 nm', 'D').um).toBeCloseTo(1.5, 12)
    expect(() => readLength('1,5 um', 'D')).toThrow(/1\.5 or 15/)
    expect(parseLength('60', 'D', { defaultUnit: 'nm' })).toBeCloseTo(0.06, 15)
  })

  it('refuses a length above the limit in the unit it was typed in', () => {
    const o = { defaultUnit: 'nm' as const, max_um: 1000, what: 'a median diameter' }
    const nm = why(() => readLength('1e9 nm', 'CMD', o))
    expect(nm).toMatch(/1e9 nm is larger than a median diameter can be \(at most 1\u202f000\u202f000 nm\)/)
    expect(nm).not.toMatch(/µm/)
    expect(why(() => readLength('2 mm', 'CMD', o))).toMatch(/at most 1 mm/)
    expect(readLength('1 mm', 'CMD', o).um).toBeCloseTo(1000, 9)
  })

  it('reads temperatures with the number rules', () => {
    expect(parseTemperature('25 °C', 't')).toBeCloseTo(298.15, 10)
    expect(() => parseTemperature('25,5 degC', 't')).toThrow(/25\.5 or 255/)
  })
})

describe('numbers in messages, as a person reads them (SI digit grouping, common practice)', () => {
  it('keeps about four significant digits, never fewer than the whole-number digits', () => {
    expect(readableNumber(24753.820996152685)).toBe('24\u202f754')
    expect(readableNumber(1234.5678)).toBe('1235')
    expect(readableNumber(0.000123456)).toBe('0.0001235')
    expect(readableNumber(0.1 + 0.2)).toBe('0.3')
    expect(readableNumber(-3.5)).toBe('−3.5')
    expect(readableNumber(1e12)).toBe('1e12')
    expect(readableNumber(2.5e-7)).toBe('2.5e-7')
  })

  it('shows more digits where four would read as the limit broken', () => {
    expect(readableBeside(0.99999, 1)).toBe('0.99999')
    expect(readableBeside(1.00004, 1)).toBe('1.00004')
    expect(readableBeside(24753.82, 0, 10)).toBe('24\u202f754')
  })
})

describe('typed amounts of particles: a bare number is in the unit shown, a written unit is converted (SI: 1 mg = 1000 µg, 1 m³ = 10⁶ cm³)', () => {
  const value = (text: string, kind: 'number' | 'volume' | 'mass') => readAmount(text, 'amount', kind)

  it('reads a bare number in the field unit, with the usual number rules', () => {
    expect(value('22', 'mass')).toEqual({ value: 22, written: false })
    expect(value('9,000', 'number')).toEqual({ value: 9000, written: false })
    expect(value('1.5e3', 'number')).toEqual({ value: 1500, written: false })
    expect(() => value('1,5', 'mass')).toThrow(/ambiguous/)
    expect(() => value('', 'mass')).toThrow(/no value/)
  })

  it('converts a mass concentration typed in mg m⁻³ or ng m⁻³ to µg m⁻³', () => {
    expect(value('0.14 mg/m3', 'mass')).toEqual({ value: 140, written: true })
    expect(value('0.14 mg m⁻³', 'mass').value).toBe(140)
    expect(value('500 ng/m^3', 'mass').value).toBe(0.5)
    expect(value('22 µg m⁻³', 'mass')).toEqual({ value: 22, written: true })
  })

  it('converts a number concentration typed per m³ or per cm³ in any common spelling', () => {
    expect(value('6e9 m⁻³', 'number').value).toBe(6000)
    expect(value('6000 /cm3', 'number').value).toBe(6000)
    expect(value('6000 cm-3', 'number').value).toBe(6000)
    expect(value('6000 #/cm3', 'number').value).toBe(6000)
    expect(value('12 500 cm⁻³', 'number').value).toBe(12500)
  })

  it('converts a volume concentration (1 cm³ m⁻³ = 10¹² µm³ per 10⁶ cm³ = 10⁶ µm³ cm⁻³)', () => {
    expect(value('3 um3/cm3', 'volume').value).toBe(3)
    expect(value('3e-6 cm³ m⁻³', 'volume').value).toBe(3)
  })

  it('refuses a unit of another quantity, a word, and a negative amount, naming the unit a bare number is in', () => {
    expect(() => value('22 ug', 'mass')).toThrow(/not a mass concentration.*µg m⁻³/)
    expect(() => value('0.14 mg/m3', 'number')).toThrow(/not a number concentration/)
    expect(() => value('22 bananas', 'mass')).toThrow(InputError)
    expect(() => value('-5 ug/m3', 'mass')).toThrow(/below zero/)
    expect(() => value('22 %', 'mass')).toThrow(/percent/)
  })
})
