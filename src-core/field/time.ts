/**
 * Time stamps of field data, read in the common written forms and carried on as ISO 8601 text plus a number
 * (milliseconds since 1970-01-01T00:00 on the file's clock, for averaging and alignment).
 *
 * Forms read:
 *  - a date with numeric parts separated by '-', '/' or '.', in year-month-day order (ISO 8601) or, with a
 *    stated or detected order, day/month/year or month/day/year (two-digit years are 20yy), optionally followed
 *    (after a space or 'T') by a time of day;
 *  - a time of day H:MM, H:MM:SS or H:MM:SS.fff, optionally with AM/PM, optionally with a zone
 *    (Z, UTC, GMT, +hh:mm, +hhmm, +hh);
 *  - a decimal day of year (1.0 is 1 January 00:00) with a year from the file or the caller;
 *  - seconds since an epoch that the file names ("seconds since 2024-01-01 00:00 UTC", Unix time).
 * A time without a zone stays without one in the ISO text (a local clock); its number treats it as UTC, so
 * differences between times of one file are right, and times of two files compare when they share a clock.
 */

export type DateOrder = 'dmy' | 'mdy' | 'ymd'

const DATE = /^(\d{1,4})([-/.])(\d{1,2})\2(\d{1,4})(?:(?:\s+|T)(.*))?$/
const CLOCK = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*([AaPp][Mm])?\s*(Z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?$/

export interface DateParts {
  a: number
  b: number
  c: number
  /** Digits of the first and last parts (a 4-digit first part means year-month-day). */
  aDigits: number
  cDigits: number
  /** What follows the date (a time of day), or ''. */
  rest: string
}

/** The numeric parts of a date cell, or undefined when the cell does not start with a date. */
export function dateParts(cell: string): DateParts | undefined {
  const m = DATE.exec(cell)
  if (!m) return undefined
  return { a: +m[1], b: +m[3], c: +m[4], aDigits: m[1].length, cDigits: m[4].length, rest: m[5] ?? '' }
}

/** What a date says about its order: 'ymd' for a 4-digit first part, 'dmy'/'mdy' when a part exceeds 12. */
export function orderEvidence(p: DateParts): DateOrder | 'conflict' | undefined {
  if (p.aDigits === 4 && p.cDigits <= 2) return 'ymd'
  if (p.a > 12 && p.b > 12) return 'conflict'
  if (p.a > 12) return 'dmy'
  if (p.b > 12) return 'mdy'
  return undefined
}

/** A zone written after a time: minutes east of UTC, or undefined for none; NaN when unreadable. */
export function zoneMinutes(z: string | undefined): number | undefined {
  if (z === undefined || z === '') return undefined
  const s = z.trim().toUpperCase()
  if (s === 'Z' || s === 'UTC' || s === 'GMT') return 0
  const m = /^(?:UTC|GMT)?\s*([+-])(\d{1,2})(?::?(\d{2}))?$/.exec(s)
  if (!m) return NaN
  const v = +m[2] * 60 + (m[3] ? +m[3] : 0)
  return v > 14 * 60 ? NaN : m[1] === '-' ? -v : v
}

/** A time of day: seconds since midnight, and its zone (undefined when none). NaN seconds when unreadable. */
export function readClock(cell: string): { seconds: number; zone: number | undefined } {
  const m = CLOCK.exec(cell.trim())
  if (!m) return { seconds: NaN, zone: undefined }
  let h = +m[1]
  const min = +m[2]
  const s = m[3] ? +m[3] : 0
  const frac = m[4] ? +`0.${m[4]}` : 0
  if (m[5]) {
    if (h < 1 || h > 12) return { seconds: NaN, zone: undefined }
    const pm = m[5].toUpperCase() === 'PM'
    h = (h % 12) + (pm ? 12 : 0)
  }
  if (h > 24 || min > 59 || s > 60 || (h === 24 && (min > 0 || s > 0 || frac > 0))) return { seconds: NaN, zone: undefined }
  const zone = zoneMinutes(m[6])
  return { seconds: h * 3600 + min * 60 + s + frac, zone }
}

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]

/** Year, month, day of a date in the given order; undefined when it is not a real date. */
export function ymdOf(p: DateParts, order: DateOrder): [number, number, number] | undefined {
  let y: number, mo: number, d: number
  if (order === 'ymd') [y, mo, d] = [p.a, p.b, p.c]
  else if (order === 'dmy') [d, mo, y] = [p.a, p.b, p.c]
  else [mo, d, y] = [p.a, p.b, p.c]
  const yDigits = order === 'ymd' ? p.aDigits : p.cDigits
  if (yDigits === 2) y += 2000
  else if (yDigits !== 4) return undefined
  if (order !== 'ymd' && p.aDigits > 2) return undefined
  if (mo < 1 || mo > 12 || d < 1 || d > DAYS_IN_MONTH[mo - 1]) return undefined
  if (mo === 2 && d === 29 && !(y % 4 === 0 && (y % 100 !== 0 || y % 400 === 0))) return undefined
  return [y, mo, d]
}

const pad2 = (n: number): string => (n < 10 ? '0' : '') + n

/** A zone offset as ISO 8601 text: 'Z' for UTC, else ±hh:mm. */
export function zoneText(minutes: number): string {
  if (minutes === 0) return 'Z'
  const a = Math.abs(minutes)
  return `${minutes < 0 ? '-' : '+'}${pad2(Math.floor(a / 60))}:${pad2(a % 60)}`
}

/**
 * ISO 8601 text for a clock reading in milliseconds (the file's clock), with the zone when one is known.
 * Whole seconds are written without a fraction; a date alone (dateOnly) as YYYY-MM-DD.
 */
export function isoText(clockMs: number, zone: number | undefined, dateOnly = false): string {
  const t = new Date(clockMs).toISOString() // YYYY-MM-DDTHH:MM:SS.sssZ
  if (dateOnly) return t.slice(0, 10)
  const body = t.endsWith('.000Z') ? t.slice(0, 19) : t.slice(0, 23)
  return zone === undefined ? body : body + zoneText(zone)
}

/** A parsed time: ISO text and milliseconds since 1970 UTC (the clock's own reading for times without zone). */
export interface ParsedTime {
  iso: string
  ms: number
}

/**
 * A date cell, optionally with a time cell beside it (clock), in the given order. `defaultZone` (minutes)
 * applies to times that state none. Undefined when the cell is not a date of that order or the time is bad.
 */
export function readDateTime(dateCell: string, clockCell: string | undefined, order: DateOrder, defaultZone: number | undefined): ParsedTime | undefined {
  if (clockCell === undefined && order === 'ymd') {
    const fast = readPlainIso(dateCell, defaultZone)
    if (fast) return fast
  }
  const p = dateParts(dateCell.trim())
  if (!p) return undefined
  const ymd = ymdOf(p, order)
  if (!ymd) return undefined
  const clockText = clockCell !== undefined ? clockCell : p.rest
  const day = Date.UTC(ymd[0], ymd[1] - 1, ymd[2])
  if (clockText.trim() === '') {
    if (clockCell !== undefined) return undefined // a separate time column must hold a time
    return { iso: isoText(day, undefined, true), ms: day + (defaultZone ? -defaultZone * 60000 : 0) }
  }
  const c = readClock(clockText)
  if (!Number.isFinite(c.seconds) || (c.zone !== undefined && !Number.isFinite(c.zone))) return undefined
  const zone = c.zone ?? defaultZone
  const clockMs = day + Math.round(c.seconds * 1000)
  return { iso: isoText(clockMs, zone), ms: clockMs - (zone ?? 0) * 60000 }
}

const digit = (text: string, i: number): number => {
  const c = text.charCodeAt(i) - 48
  return c >= 0 && c <= 9 ? c : NaN
}
const digits2 = (text: string, i: number): number => 10 * digit(text, i) + digit(text, i + 1)

/**
 * The common machine-written form YYYY-MM-DDTHH:MM:SS, with 'T' or one space, optionally .fff (three digits)
 * and optionally Z, read character by character: what readDateTime gives for it, without its regular
 * expressions (a sizer's time column is read on every row). Undefined for anything else (a year before 1000,
 * 24:00, a leap second, other fractions or zones), which readDateTime's general path then reads or refuses;
 * test/field/time-fast.test.ts compares the two on many cells.
 */
export function readPlainIso(cell: string, defaultZone: number | undefined): ParsedTime | undefined {
  const n = cell.length
  if (n !== 19 && n !== 20 && n !== 23 && n !== 24) return undefined
  const sep = cell.charCodeAt(10)
  if (cell.charCodeAt(4) !== 45 || cell.charCodeAt(7) !== 45 || (sep !== 84 && sep !== 32) || cell.charCodeAt(13) !== 58 || cell.charCodeAt(16) !== 58) return undefined
  const zulu = cell.charCodeAt(n - 1) === 90 // 'Z'
  const fracEnd = zulu ? n - 1 : n
  if (fracEnd !== 19 && !(fracEnd === 23 && cell.charCodeAt(19) === 46)) return undefined
  const y = 100 * digits2(cell, 0) + digits2(cell, 2)
  const mo = digits2(cell, 5)
  const d = digits2(cell, 8)
  const h = digits2(cell, 11)
  const mi = digits2(cell, 14)
  const sec = digits2(cell, 17)
  const ms = fracEnd === 23 ? 100 * digit(cell, 20) + digits2(cell, 21) : 0
  // NaN (a character that is not a digit) fails every comparison below
  if (!(y >= 1000 && mo >= 1 && mo <= 12 && d >= 1 && d <= DAYS_IN_MONTH[mo - 1] && h <= 23 && mi <= 59 && sec <= 59 && ms >= 0)) return undefined
  if (mo === 2 && d === 29 && !(y % 4 === 0 && (y % 100 !== 0 || y % 400 === 0))) return undefined
  const clockMs = Date.UTC(y, mo - 1, d, h, mi, sec, ms)
  const zone = zulu ? 0 : defaultZone
  // ISO text as isoText writes it: 'T', a fraction only when not whole, the zone when known
  const body = ms === 0 ? (n === 19 || n === 20) && sep === 84 ? cell.slice(0, 19) : cell.slice(0, 10) + 'T' + cell.slice(11, 19) : sep === 84 ? cell.slice(0, 23) : cell.slice(0, 10) + 'T' + cell.slice(11, 23)
  const iso = zone === undefined ? body : zulu && body.length === n - 1 && sep === 84 ? cell : body + zoneText(zone)
  return { iso, ms: clockMs - (zone ?? 0) * 60000 }
}

/** A decimal day of year (1.0 = 1 January 00:00) of `year`, rounded to the second. */
export function readDayOfYear(value: number, year: number, zone: number | undefined): ParsedTime | undefined {
  const leap = year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0)
  if (!(value >= 1 && value < (leap ? 367 : 366))) return undefined
  const clockMs = Date.UTC(year, 0, 1) + Math.round((value - 1) * 86400) * 1000
  return { iso: isoText(clockMs, zone), ms: clockMs - (zone ?? 0) * 60000 }
}

/** Seconds since an epoch (its clock reading in ms and zone) as a time. */
export function readEpochSeconds(seconds: number, epoch: { clockMs: number; zone: number | undefined }): ParsedTime {
  const clockMs = epoch.clockMs + Math.round(seconds * 1000)
  return { iso: isoText(clockMs, epoch.zone), ms: clockMs - (epoch.zone ?? 0) * 60000 }
}

/**
 * The epoch a column header or metadata value names: "seconds since 2024-01-01 00:00:00 UTC",
 * "s since 2024-01-01T00:00Z", "Unix time" / "POSIX" / "epoch seconds" (1970-01-01 UTC). Undefined when none.
 */
export function epochNamed(text: string): { clockMs: number; zone: number | undefined; text: string } | undefined {
  const since = /\bsince\s+(\d{4}-\d{1,2}-\d{1,2}(?:[T ]\s*[0-9:.]+)?)\s*(Z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?/i.exec(text)
  if (since) {
    const zone = zoneMinutes(since[2])
    if (zone !== undefined && !Number.isFinite(zone)) return undefined
    const t = readDateTime(since[1].replace(/\s+/g, ' '), undefined, 'ymd', undefined)
    if (!t) return undefined
    return { clockMs: t.ms, zone, text: `${t.iso}${zone !== undefined ? zoneText(zone) : ''}` }
  }
  if (/\b(unix|posix)\b|\bepoch\s*(seconds|time|s)\b/i.test(text)) return { clockMs: 0, zone: 0, text: '1970-01-01T00:00:00Z (Unix time)' }
  return undefined
}

/** A date order stated as a format ("dd/mm/yyyy", "MM-DD-YY", "yyyy.mm.dd") or a name ("dmy", "day/month/year"). */
export function statedOrder(text: string): DateOrder | undefined {
  const t = text.toLowerCase()
  if (/\bd{1,2}[-/.]m{1,2}[-/.]y{2,4}\b|\bdmy\b|day[-/ ]month[-/ ]year/.test(t)) return 'dmy'
  if (/\bm{1,2}[-/.]d{1,2}[-/.]y{2,4}\b|\bmdy\b|month[-/ ]day[-/ ]year/.test(t)) return 'mdy'
  if (/\by{4}[-/.]m{1,2}[-/.]d{1,2}\b|\bymd\b|year[-/ ]month[-/ ]day|iso\s*-?\s*8601/.test(t)) return 'ymd'
  return undefined
}

export const DATE_ORDER_NAMES: Record<DateOrder, string> = { dmy: 'day/month/year', mdy: 'month/day/year', ymd: 'year-month-day' }
