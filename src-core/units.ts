/**
 * Reading numbers that people type: lengths with units ("120 nm", "0.12 um", "0.12 µm"), temperatures,
 * and complex refractive indices ("1.53+0.01i"). mathjs does the unit arithmetic; this is for input,
 * never for hot loops.
 */
import type { Unit } from 'mathjs'
import { mathComplex, mathUnit } from './mathjsOnDemand.ts'
import { InputError } from './errors.ts'

function normaliseUnitText(text: string): string {
  return text.trim().replace(/[µμ]/g, 'u').replace(/,/g, '.')
}

function toUnit(text: string, where: string, example: string): Unit {
  try {
    return mathUnit(normaliseUnitText(text))
  } catch {
    throw new InputError(where, `"${text}" is not a quantity with a unit`, `Write a number and a unit, for example "${example}".`)
  }
}

/**
 * A length typed by a person, in µm. A bare number is taken in `defaultUnit` ('nm' or 'um');
 * without a default a unit is required.
 */
export function parseLength(text: string, where: string, defaultUnit?: 'nm' | 'um'): number {
  const t = normaliseUnitText(text)
  if (t === '') throw new InputError(where, 'no value was given', 'Type a length such as "120 nm" or "0.12 um".')
  const bare = Number(t)
  let value: number
  if (Number.isFinite(bare)) {
    if (!defaultUnit) throw new InputError(where, `"${text}" has no unit`, 'Add a unit, for example "550 nm" or "0.55 um".')
    value = defaultUnit === 'nm' ? bare / 1000 : bare
  } else {
    const u = toUnit(t, where, '550 nm')
    try {
      value = u.toNumber('um')
    } catch {
      throw new InputError(where, `"${text}" is not a length`, 'Use a length unit such as nm, um (µm), mm or m.')
    }
  }
  if (!Number.isFinite(value) || value <= 0) {
    throw new InputError(where, `"${text}" is not a positive length`, 'Give a length greater than zero.')
  }
  return value
}

/** A temperature typed by a person, in K. A bare number is taken in kelvin. */
export function parseTemperature(text: string, where: string): number {
  const t = normaliseUnitText(text)
  const bare = Number(t)
  let value: number
  if (t !== '' && Number.isFinite(bare)) value = bare
  else {
    const u = toUnit(t.replace(/°\s*C$/, 'degC').replace(/°\s*F$/, 'degF'), where, '298 K')
    try {
      value = u.toNumber('K')
    } catch {
      throw new InputError(where, `"${text}" is not a temperature`, 'Use K, degC or degF, for example "298 K".')
    }
  }
  if (!Number.isFinite(value) || value <= 0) throw new InputError(where, `"${text}" is not above absolute zero`, 'Give a temperature in kelvin above 0, for example 298.')
  return value
}

/** Complex refractive index m = n + ik written as "1.53+0.01i", "1.53 + 0.01i" or "1.33". k must be ≥ 0. */
export function parseComplexIndex(text: string, where: string): { n: number; k: number } {
  let c: { re: number; im: number }
  try {
    c = mathComplex(text.replace(/\s+/g, '').replace(/j$/, 'i'))
  } catch {
    throw new InputError(where, `"${text}" is not a complex refractive index`, 'Write it as n+ki, for example "1.53+0.01i".')
  }
  if (!Number.isFinite(c.re) || !Number.isFinite(c.im)) {
    throw new InputError(where, `"${text}" is not a complex refractive index`, 'Write it as n+ki, for example "1.53+0.01i".')
  }
  if (c.im < 0) {
    throw new InputError(where, `the imaginary part of "${text}" is negative`, 'Motebench writes m = n + ik with k ≥ 0 for an absorbing material; drop the minus sign.')
  }
  return { n: c.re, k: c.im }
}

/**
 * A list of wavelengths typed by a person, in nm: "450, 550, 700", "450 550 700", "0.45 um; 550 nm" or
 * "450,550,700nm". Numbers without a unit take the unit written on the last item (nm or um), else nm. With
 * `ascending`, each must be longer than the one before; with `distinct`, none may repeat; `max` caps the count.
 */
export function parseWavelengthList(text: string, where: string, options: { ascending?: boolean; distinct?: boolean; max?: number } = {}): number[] {
  // split at commas or semicolons, and at spaces that are followed by a number (so "450 nm" stays whole)
  const parts = text
    .trim()
    .split(/\s*[,;]\s*|\s+(?=[\d.])/)
    .filter((p) => p !== '')
  if (!parts.length) throw new InputError(where, 'no wavelength was given', 'Type one or more wavelengths in nm, such as 450, 550, 700.')
  if (options.max !== undefined && parts.length > options.max) {
    throw new InputError(where, `${parts.length} wavelengths were given`, `Give at most ${options.max}.`)
  }
  const lastUnit = normaliseUnitText(/[a-zµμ]+$/i.exec(parts[parts.length - 1])?.[0] ?? '').toLowerCase()
  const bareUnit = lastUnit === 'um' ? 'um' : 'nm'
  const values = parts.map((p) => Math.round(parseLength(p, where, bareUnit) * 1e9) / 1e6)
  for (let i = 1; i < values.length; i++) {
    if (options.ascending && !(values[i] > values[i - 1])) {
      throw new InputError(where, `${values[i]} nm does not follow ${values[i - 1]} nm in ascending order`, 'List the wavelengths from shortest to longest, each once.')
    }
    if (options.distinct && values.indexOf(values[i]) < i) {
      throw new InputError(where, `${values[i]} nm is given twice`, 'List each wavelength once.')
    }
  }
  return values
}
