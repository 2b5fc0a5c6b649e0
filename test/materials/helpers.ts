import { expect } from 'vitest'
import { InputError } from '../../src-core/index.ts'
// Test-side complex arithmetic, written independently of src-core so the checks do not mirror the code.
export interface C {
  re: number
  im: number
}
export const c = (re: number, im = 0): C => ({ re, im })
export const add = (a: C, b: C): C => c(a.re + b.re, a.im + b.im)
export const sub = (a: C, b: C): C => c(a.re - b.re, a.im - b.im)
export const mul = (a: C, b: C): C => c(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re)
export const scale = (s: number, a: C): C => c(s * a.re, s * a.im)
export const div = (a: C, b: C): C => {
  const d = b.re * b.re + b.im * b.im
  return c((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d)
}
export const abs = (a: C): number => Math.hypot(a.re, a.im)
/** ε = m² from m = n + ik. */
export const eps = (m: { n: number; k: number }): C => mul(c(m.n, m.k), c(m.n, m.k))

/** The message of the InputError that `fn` throws (fails the test if it throws anything else, or nothing). */
export function thrownMessage(fn: () => unknown): string {
  try {
    fn()
  } catch (e) {
    expect(e).toBeInstanceOf(InputError)
    return (e as Error).message
  }
  throw new Error('expected an InputError')
}
