/** Input checks private to the climate module. Each throws InputError with a plain-words fix. */
import { InputError } from '../errors.ts'
import { readableBeside, readableNumber } from '../numberText.ts'
import { DEFAULT_ATMOSPHERIC_TRANSMITTANCE, DEFAULT_CLOUD_FRACTION, SOLAR_CONSTANT_WM2 } from './constants.ts'

export function checkFinite(where: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(where, `${String(value)} is not a finite number`, 'Give a finite number.')
  }
}

export function checkRange(where: string, value: number, lo: number, hi: number, unit = ''): void {
  checkFinite(where, value)
  if (value < lo || value > hi) {
    const u = unit ? ` ${unit}` : ''
    const [l, h] = [readableNumber(lo), readableNumber(hi)]
    throw new InputError(where, `${readableBeside(value, lo, hi)}${u} is outside the valid range ${l}${u} to ${h}${u}`, `Give a value from ${l} to ${h}${u}.`)
  }
}

/** lo < value <= hi */
export function checkRangeOpenLow(where: string, value: number, lo: number, hi: number, unit = ''): void {
  checkFinite(where, value)
  if (value <= lo || value > hi) {
    const u = unit ? ` ${unit}` : ''
    throw new InputError(where, `${readableBeside(value, lo, hi)}${u} must be greater than ${readableNumber(lo)}${u} and at most ${readableNumber(hi)}${u}`, `Give a value above ${readableNumber(lo)} and up to ${readableNumber(hi)}${u}.`)
  }
}

export function checkInteger(where: string, value: number, lo: number, hi: number): void {
  if (!Number.isInteger(value) || value < lo || value > hi) {
    throw new InputError(where, `${String(value)} is not a whole number from ${lo} to ${hi}`, `Give a whole number from ${lo} to ${hi}.`)
  }
}

/** Evaluates a user-supplied function of μ₀ and checks that its value lies in [lo, hi]. */
export function evalChecked(where: string, f: (mu0: number) => number, mu0: number, lo: number, hi: number): number {
  const v = f(mu0)
  if (typeof v !== 'number' || !Number.isFinite(v) || v < lo || v > hi) {
    throw new InputError(where, `the function returned ${String(v)} at cos(solar zenith) = ${mu0}, outside ${lo} to ${hi}`, `Make the function return a number from ${lo} to ${hi} for every cos(solar zenith) in (0, 1].`)
  }
  return v
}

/**
 * The atmosphere above the layer with its defaults filled in and checked: transmittance T (0.76) and cloud
 * fraction A_c (0.6) after Haywood & Shine (1995, from memory), solar constant S₀ (1361 W m⁻², Kopp & Lean 2011).
 */
export function atmosphereAbove(i: { transmittance?: number; cloudFraction?: number; solarConstant?: number }): { T: number; Ac: number; S0: number } {
  const T = i.transmittance ?? DEFAULT_ATMOSPHERIC_TRANSMITTANCE
  const Ac = i.cloudFraction ?? DEFAULT_CLOUD_FRACTION
  const S0 = i.solarConstant ?? SOLAR_CONSTANT_WM2
  checkRange('transmittance', T, 0, 1)
  checkRange('cloudFraction', Ac, 0, 1)
  checkRange('solarConstant', S0, 0, 1e5, 'W m⁻²')
  return { T, Ac, S0 }
}
