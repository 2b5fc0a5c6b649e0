/**
 * Small helpers shared by the size-distribution code: number formatting for error messages
 * and the common checks. Not part of the public API.
 */
import { InputError } from '../errors.ts'

/** A number as a person would write it in a message: 4 significant digits, no trailing zeros. */
export function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x)
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a >= 1e-4 && a < 1e6) return String(Number(x.toPrecision(4)))
  return x.toExponential(3).replace(/\.?0+e/, 'e')
}

/** Throws unless value is a finite number (the usual way NaN sneaks in from a parser). */
export function requireFinite(where: string, value: number, what: string, fix: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(where, `${what} is ${String(value)}, not a finite number`, fix)
  }
}

/** Throws unless value is finite and > 0. */
export function requirePositive(where: string, value: number, what: string, unit: string, fix: string): void {
  requireFinite(where, value, what, fix)
  if (value <= 0) throw new InputError(where, `${what} is ${fmt(value)}${unit ? ' ' + unit : ''}; it must be greater than 0`, fix)
}

/** Throws unless value is finite and >= 0. */
export function requireNonNegative(where: string, value: number, what: string, unit: string, fix: string): void {
  requireFinite(where, value, what, fix)
  if (value < 0) throw new InputError(where, `${what} is ${fmt(value)}${unit ? ' ' + unit : ''}; it must not be negative`, fix)
}
