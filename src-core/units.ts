/**
 * Reading numbers that people type: plain numbers (with thousands separators and percent signs where they are
 * unambiguous), lengths with units ("120 nm", "0.12 um", "0.12 µm"), temperatures, and complex refractive
 * indices ("1.53+0.01i"). mathjs does the unit arithmetic (metric lengths and indices are read directly, to the
 * same numbers); this is for input, never for hot loops.
 */
import type { Unit } from 'mathjs'
import { mathUnit, mathUnitOf } from './mathjsOnDemand.ts'
import { InputError } from './errors.ts'
import { readableNumber } from './numberText.ts'

function normaliseUnitText(text: string): string {
  return text.trim().replace(/[µμ]/g, 'u')
}

function toUnit(text: string, where: string, example: string): Unit {
  try {
    return mathUnit(normaliseUnitText(text))
  } catch {
    throw new InputError(where, `"${text}" is not a quantity with a unit`, `Write a number and a unit, for example "${example}".`)
  }
}

/** What a percent sign means in a typed number: refused, a fraction (80 % = 0.8), or the number itself (a field in %). */
export type PercentSign = 'refuse' | 'fraction' | 'percent'

/** Spaces people put between digit groups: the ordinary, no-break, thin and narrow no-break spaces. */
const GROUP_SPACE = /[ \u00a0\u2009\u202f]/g
const PLAIN = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i
/** Groups of exactly three digits after the first one to three, then an optional decimal part and exponent. */
const GROUPED = (sep: string) => new RegExp(`^[+-]?\\d{1,3}(${sep}\\d{3})+(\\.\\d*)?(e[+-]?\\d+)?$`, 'i')
const GROUPED_COMMA = GROUPED(',')
const GROUPED_SPACE = GROUPED(' ')

/**
 * A number typed by a person. Read: "1500", "1.5e3", "−2" (the minus sign), thousands separators where they can
 * mean nothing else: commas or spaces between groups of exactly three digits, with a point (if any) as the decimal
 * mark ("9,000" and "12 500.5"). Refused, with the fix: a decimal comma ("1,5": write 1.5 or 15), other groupings,
 * and words. A percent sign is refused unless `percent` says what it means: 'fraction' ("80%" is 0.8) or
 * 'percent' (the field is in %, so "80%" is 80).
 */
export function parseNumber(text: string, where: string, options: { percent?: PercentSign } = {}): number {
  let t = text.trim().replace(/[\u2212\u2013]/g, '-')
  if (t === '') throw new InputError(where, 'no value was given', 'Type a number.')
  const hasPercent = /%\s*$/.test(t)
  if (hasPercent) {
    const percent = options.percent ?? 'refuse'
    if (percent === 'refuse') throw new InputError(where, `"${text}" has a percent sign, but this value is not a percentage`, 'Type the number alone, without %.')
    t = t.replace(/\s*%\s*$/, '')
  }
  let body = t.replace(GROUP_SPACE, ' ').replace(/\s+/g, ' ')
  if (body.includes(',')) {
    if (GROUPED_COMMA.test(body)) body = body.replace(/,/g, '')
    else {
      const m = /^([+-]?\d*),(\d+)$/.exec(body)
      if (m) {
        const point = `${m[1] || '0'}.${m[2]}`
        const joined = `${m[1]}${m[2]}`.replace(/^([+-]?)0+(?=\d)/, '$1')
        const zero = /^[+-]?0*$/.test(m[1])
        const fix = zero ? `Write ${point}, with a point as the decimal mark.` : `Write ${point} or ${joined} (a point is the decimal mark).`
        throw new InputError(where, `"${text.trim()}" is ambiguous: its comma could be a decimal mark or a thousands separator`, fix)
      }
      throw new InputError(where, `"${text.trim()}" is not a number`, 'Write a point as the decimal mark and commas only between groups of three digits, e.g. 12,500.5 or 12500.5.')
    }
  } else if (body.includes(' ')) {
    if (GROUPED_SPACE.test(body)) body = body.replace(/ /g, '')
    else throw new InputError(where, `"${text.trim()}" is not one number`, 'Type one number; spaces may only separate groups of three digits, e.g. 12 500.')
  }
  if (!PLAIN.test(body)) throw new InputError(where, `"${text.trim()}" is not a number`, 'Type a number such as 1.6 or 2.5e3.')
  const v = Number(body)
  if (!Number.isFinite(v)) throw new InputError(where, `"${text.trim()}" is too large a number`, 'Type a number below 1e300.')
  return hasPercent && options.percent === 'fraction' ? v / 100 : v
}

/** The unit names a length may be typed in, as written back to the person (µm for um). */
const LENGTH_UNIT_SHOWN: Record<string, string> = { nm: 'nm', um: 'µm', mm: 'mm', cm: 'cm', m: 'm', km: 'km' }

/**
 * µm per unit of the metric length units read without mathjs: a number in one of them is the typed decimal shifted
 * by a power of ten (SI), so for a number of at most 12 significant digits mathjs's conversion, rounded to 12
 * digits as readLength rounds it, gives that shifted decimal whatever the last bits of either product; the direct
 * path gives the same (test/units-direct.test.ts compares the two). Making mathjs's units took 0.14 s of a command's
 * start ("--wavelengths 450,550,700nm") when nothing else needed them.
 */
const LENGTH_UM_PER_UNIT: Record<string, number> = { nm: 1e-3, um: 1, mm: 1e3, cm: 1e4, m: 1e6, km: 1e9 }

/** `n` in `unitName` as µm to 12 significant digits, without mathjs where the unit is metric and `n` has at most 12 digits; else NaN. */
function directLengthUm(n: number, unitName: string): number {
  const factor = Object.hasOwn(LENGTH_UM_PER_UNIT, unitName) ? LENGTH_UM_PER_UNIT[unitName] : 0
  if (!factor || !Number.isFinite(n) || Number(n.toPrecision(12)) !== n) return NaN
  return Number((n * factor).toPrecision(12))
}

export interface LengthOptions {
  /** The unit of a bare number: the unit the field shows ('nm' or 'um'); without it a unit is required. */
  defaultUnit?: 'nm' | 'um'
  /** Largest accepted length, µm; a longer one is refused in the unit it was typed in. */
  max_um?: number
  /** Names the quantity in the message about `max_um`, e.g. "the median diameter". */
  what?: string
}

/** A length as typed: its value in µm, the unit it was given in ('nm', 'um', 'mm'…) and whether the unit was written. */
export interface TypedLength {
  um: number
  unit: string
  written: boolean
}

/**
 * A length typed by a person. A bare number is taken in `defaultUnit` (the unit the field shows); the number
 * follows parseNumber's rules ("1,500 nm" is 1500 nm; "1,5 um" is refused). Refused with the reason, in the unit
 * typed: no value, no unit where one is needed, a unit that is not a length, zero or less, above `max_um`.
 */
export function readLength(text: string, where: string, options: LengthOptions = {}): TypedLength {
  const t = normaliseUnitText(text)
  if (t === '') throw new InputError(where, 'no value was given', 'Type a length such as "120 nm" or "0.12 um".')
  const split = /^(.*?\d\.?)\s*([a-z]+)$/i.exec(t)
  let value: number
  let unitName: string
  if (!split) {
    const bare = parseNumber(t, where)
    if (!options.defaultUnit) throw new InputError(where, `"${text}" has no unit`, 'Add a unit, for example "550 nm" or "0.55 um".')
    unitName = options.defaultUnit
    value = unitName === 'nm' ? bare / 1000 : bare
  } else {
    const n = split[1].trim() === '' ? NaN : parseNumber(split[1], where)
    if (Number.isNaN(n)) throw new InputError(where, `"${text}" has no number`, 'Write a number and a unit, for example "550 nm".')
    unitName = split[2].toLowerCase() === 'micron' ? 'um' : split[2]
    value = directLengthUm(n, unitName)
    if (Number.isNaN(value)) {
      let u: Unit
      try {
        u = mathUnitOf(n, unitName)
      } catch {
        throw new InputError(where, `"${split[2]}" in "${text}" is not a unit`, 'Use a length unit such as nm, um (µm), mm or m.')
      }
      try {
        // 12 significant digits: the unit factors' round-off (1 mm is 1000.0000000000001 µm) is no one's value
        value = Number(u.toNumber('um').toPrecision(12))
      } catch {
        throw new InputError(where, `"${text}" is not a length`, 'Use a length unit such as nm, um (µm), mm or m.')
      }
    }
  }
  const shown = LENGTH_UNIT_SHOWN[unitName] ?? unitName
  if (!Number.isFinite(value) || value <= 0) {
    throw new InputError(where, `"${text.trim()}" is not a positive length`, 'Give a length greater than zero.')
  }
  if (options.max_um !== undefined && value > options.max_um) {
    const inUnit = mathUnitOf(options.max_um, 'um').toNumber(unitName)
    const what = options.what ?? 'the length'
    throw new InputError(where, `${text.trim()} is larger than ${what} can be (at most ${readableNumber(inUnit)} ${shown})`, `Check the number and its unit: give ${what} of at most ${readableNumber(inUnit)} ${shown}.`)
  }
  return { um: value, unit: unitName, written: !!split }
}

/**
 * A length typed by a person, in µm. A bare number is taken in `defaultUnit` ('nm' or 'um', or the options of
 * readLength); without a default a unit is required.
 */
export function parseLength(text: string, where: string, defaultUnit?: 'nm' | 'um' | LengthOptions): number {
  return readLength(text, where, typeof defaultUnit === 'string' ? { defaultUnit } : (defaultUnit ?? {})).um
}

/** How a mode's amount is given, and the unit a bare number is in (the study's: number_cm3, volume_um3_cm3, mass_ug_m3). */
export type AmountKind = 'number' | 'volume' | 'mass'

/** Each amount's unit: as mathjs reads it, as the field shows it, and other units it may be typed in. */
export const AMOUNT_UNITS: Record<AmountKind, { math: string; shown: string; what: string; others: string }> = {
  number: { math: 'cm^-3', shown: 'cm⁻³', what: 'a number concentration', others: '"6e9 m⁻³" or "6000 /cm3"' },
  volume: { math: 'um^3/cm^3', shown: 'µm³ cm⁻³', what: 'a volume concentration', others: '"3e-6 cm³ m⁻³" or "3 um3/cm3"' },
  mass: { math: 'ug/m^3', shown: 'µg m⁻³', what: 'a mass concentration', others: '"0.14 mg/m3" or "500 ng m⁻³"' }
}

const SUPERSCRIPTS: Record<string, string> = { '⁻': '-', '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9' }

/** "µg m⁻³" as mathjs reads it: "ug m^-3" (superscripts and "cm-3" to ^, µ to u, the "#" of a count dropped). */
function amountUnitText(unit: string): string {
  return normaliseUnitText(unit)
    .replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+/g, (s) => `^${[...s].map((c) => SUPERSCRIPTS[c]).join('')}`)
    .replace(/([a-z])-(\d)/gi, '$1^-$2')
    .replace(/^#\s*/, '')
}

/** A number (digits with group separators, a decimal part, an exponent) and what follows it. */
const AMOUNT_SPLIT = /^([+\-\u2212\u2013]?(?:\d[\d,\s\u00a0\u2009\u202f]*(?:\.\d*)?|\.\d+)(?:e[+\-\u2212]?\d+)?)(.*)$/i

/**
 * An amount of particles typed by a person, in the unit of `kind` (cm⁻³, µm³ cm⁻³ or µg m⁻³). A bare number is
 * in that unit, the one the field shows; a number written with a unit is converted (mathjs): "0.14 mg/m3" is
 * 140 µg m⁻³, "6e9 m⁻³" is 6000 cm⁻³. Refused with the reason: no value, a unit of another quantity, below zero.
 * `written` says whether a unit was typed.
 */
export function readAmount(text: string, where: string, kind: AmountKind): { value: number; written: boolean } {
  const u = AMOUNT_UNITS[kind]
  const t = text.trim()
  if (t === '') throw new InputError(where, 'no value was given', `Type ${u.what} in ${u.shown}, for example 1500.`)
  const split = AMOUNT_SPLIT.exec(t)
  const unit = split ? split[2].trim() : ''
  let value: number
  if (unit === '' || unit === '%') value = parseNumber(t, where)
  else {
    const n = parseNumber(split![1], where)
    let q: Unit
    try {
      q = mathUnit(`${n} ${amountUnitText(unit)}`)
    } catch {
      throw new InputError(where, `"${unit}" in "${t}" is not a unit`, `Give ${u.what}: a number alone is in ${u.shown}; a unit may be written, e.g. ${u.others}.`)
    }
    try {
      // 12 significant digits: the unit factors' round-off (1 mg/m3 is 999.9999999999999 µg/m3) is no one's value
      value = Number(q.toNumber(u.math).toPrecision(12))
    } catch {
      throw new InputError(where, `"${t}" is not ${u.what}`, `Give ${u.what}: a number alone is in ${u.shown}; a unit may be written, e.g. ${u.others}.`)
    }
  }
  if (!(value >= 0)) throw new InputError(where, `${t} is below zero`, `Give ${u.what} of zero or more.`)
  return { value, written: unit !== '' && unit !== '%' }
}

/** A temperature typed by a person, in K. A bare number is taken in kelvin; "25 degC", "25 °C" and "77 degF" are converted. */
export function parseTemperature(text: string, where: string): number {
  const t = normaliseUnitText(text)
  let value: number
  const split = /^(.*?\d\.?)\s*(°\s*[CF]|[a-z]+)$/i.exec(t)
  if (!split) value = parseNumber(t, where)
  else {
    const n = parseNumber(split[1], where)
    const u = toUnit(`${n} ${split[2].replace(/°\s*C$/i, 'degC').replace(/°\s*F$/i, 'degF')}`, where, '298 K')
    try {
      value = u.toNumber('K')
    } catch {
      throw new InputError(where, `"${text}" is not a temperature`, 'Use K, degC or degF, for example "298 K".')
    }
  }
  if (!Number.isFinite(value) || value <= 0) throw new InputError(where, `"${text}" is not above absolute zero`, 'Give a temperature in kelvin above 0, for example 298.')
  return value
}

/** A decimal number as Number() reads it, without its sign. */
const DECIMAL = '(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][+-]?\\d+)?'
/** n, n+ki or n−ki (the index's usual spelling), and ki+n (its parts the other way round). */
const INDEX_FIRST_REAL = new RegExp(`^([+-]?)(${DECIMAL})(?:([+-])(${DECIMAL})i)?$`)
const INDEX_FIRST_IMAGINARY = new RegExp(`^([+-]?)(${DECIMAL})i([+-])(${DECIMAL})$`)
/** Two real numbers added: an index whose i was left out. */
const REAL_SUM = new RegExp(`^[+-]?${DECIMAL}[+-]${DECIMAL}$`)

/** A signed decimal from its sign and digits, as mathjs's complex() reads a part (0 − x for a minus, so "−0" is 0). */
const signed = (sign: string | undefined, digits: string): number => (sign === '-' ? 0 - Number(digits) : Number(digits))

/**
 * Complex refractive index m = n + ik written as "1.53+0.01i", "1.53 + 0.01i", "0.01i+1.53" or "1.33" (j for i
 * too). k must be ≥ 0. Read here, not by mathjs: the numbers are those its complex() gives for these forms
 * (test/units-direct.test.ts), and two things it accepts are refused with their fix: a sum without i ("1.5+0.01",
 * which it reads as 1.51: an i left out would silently change n) and more than two terms. (Making mathjs's units
 * also took a command such as `sphere --m 1.5+0.01i` 0.1 s or more of its start.)
 */
export function parseComplexIndex(text: string, where: string): { n: number; k: number } {
  const t = text.replace(/\s+/g, '').replace(/j$/, 'i').replace(/[\u2212\u2013]/g, '-')
  const realFirst = INDEX_FIRST_REAL.exec(t)
  const imaginaryFirst = realFirst ? null : INDEX_FIRST_IMAGINARY.exec(t)
  let n: number
  let k: number
  if (realFirst) {
    n = signed(realFirst[1], realFirst[2])
    k = realFirst[4] === undefined ? 0 : signed(realFirst[3], realFirst[4])
  } else if (imaginaryFirst) {
    k = signed(imaginaryFirst[1], imaginaryFirst[2])
    n = signed(imaginaryFirst[3], imaginaryFirst[4])
  } else if (REAL_SUM.test(t)) {
    throw new InputError(where, `"${text}" has no imaginary part marked with i`, `Write the index as n+ki with an i after k, for example "${t}i".`)
  } else {
    throw new InputError(where, `"${text}" is not a complex refractive index`, 'Write it as n+ki, for example "1.53+0.01i".')
  }
  if (!Number.isFinite(n) || !Number.isFinite(k)) {
    throw new InputError(where, `"${text}" is not a complex refractive index`, 'Write it as n+ki, for example "1.53+0.01i".')
  }
  if (k < 0) {
    throw new InputError(where, `the imaginary part of "${text}" is negative`, 'Motebench writes m = n + ik with k ≥ 0 for an absorbing material; drop the minus sign.')
  }
  return { n, k }
}

/**
 * Bare numbers of a wavelength list below 100 nm or above 100 µm once read in the list's unit: far outside the
 * built-in materials' tables (0.2 to about 40 µm), so such a number was surely meant in the other unit ("450, 550,
 * 0.7um" read 450 as 450 µm), and the list is refused here with that said, rather than further on by a material's
 * table ("wavelength 450 µm is outside its tabulated range"). A length with its unit written is not checked here.
 */
function refuseBareInOtherUnit(part: string, nm: number, unit: 'nm' | 'um', last: string, where: string): void {
  const from = /[a-zµμ]$/i.test(last) ? `like the last one ("${last}")` : '(the unit of a list without one)'
  if (unit === 'um' && nm > 100_000) {
    throw new InputError(where, `"${part}" has no unit, so it was read in µm ${from}: ${readableNumber(nm / 1000)} µm is far beyond the built-in materials' tables (0.2 to 40 µm)`, `Write its unit ("${part} nm"), or give every wavelength in µm.`)
  }
  if (unit === 'nm' && nm < 100) {
    throw new InputError(where, `"${part}" has no unit, so it was read in nm ${from}: ${readableNumber(nm)} nm is far below the built-in materials' tables (200 nm to 40 µm)`, `Write its unit ("${part} um"), or give the wavelengths in nm (for example ${readableNumber(nm * 1000)}).`)
  }
}

/**
 * A list of wavelengths typed by a person, in nm: "450, 550, 700", "450 550 700", "0.45 um; 550 nm" or
 * "450,550,700nm". Numbers without a unit take the unit written on the last item (nm or um), else nm. A bare number
 * that this makes shorter than 100 nm or longer than 100 µm is refused, with the unit it was surely meant in. With
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
  const last = parts[parts.length - 1]
  const lastUnit = normaliseUnitText(/[a-zµμ]+$/i.exec(last)?.[0] ?? '').toLowerCase()
  const bareUnit = lastUnit === 'um' ? 'um' : 'nm'
  const values = parts.map((p) => {
    const length = readLength(p, where, { defaultUnit: bareUnit })
    const nm = Math.round(length.um * 1e9) / 1e6
    if (!length.written) refuseBareInOtherUnit(p, nm, bareUnit, last, where)
    return nm
  })
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

/**
 * Reads a few quantities as the app's fields show them, for a moment when nothing waits: mathjs's units are made on
 * the first read (about 0.2 s in a browser), and its reading code runs slowly for its first few calls, so the first
 * length or amount typed later pays for neither. (The app used to pay both as it started, reading every field's own text.)
 */
export function prepareQuantities(): void {
  for (let i = 0; i < 8; i++) {
    readLength('45 nm', 'a prepared length')
    readLength('2.5 µm', 'a prepared length')
    readAmount('6000 cm⁻³', 'a prepared amount', 'number')
    readAmount('3 µm³ cm⁻³', 'a prepared amount', 'volume')
    readAmount('50 µg m⁻³', 'a prepared amount', 'mass')
  }
}
