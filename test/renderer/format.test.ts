// Displayed numbers: the minus sign U+2212, not the hyphen (typographic practice, e.g. ISO 80000-1 / SI Brochure
// 9th ed. §5.4: "the minus sign", common practice), and the field readers take it back.
import { describe, expect, it } from 'vitest'
import { fixed, num, signed } from '../../src-renderer/format.ts'
import { readNumber } from '../../src-renderer/edit/Field.tsx'

describe('numbers on screen', () => {
  it('negative numbers and exponents carry U+2212', () => {
    expect(num(-1.25)).toBe('\u22121.25')
    expect(num(2.5e-7, 2)).toBe('2.5e\u22127')
    expect(fixed(-0.5, 2)).toBe('\u22120.50')
    expect(signed(-3.14159)).toBe('\u22123.14')
    expect(signed(2)).toBe('+2')
  })
  it('a value rounding to zero is not written −0.00', () => {
    expect(fixed(-0.0001, 2)).toBe('0.00')
  })
  it('what is written can be read back', () => {
    for (const x of [-1.25, 2.5e-7, -4.5e-9, 123456]) expect(readNumber('x')(num(x, 6))).toBeCloseTo(x, 12)
  })
})
