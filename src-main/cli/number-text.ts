// Numbers as the command line's CSV writes them: String(Number(v.toPrecision(7))), the value to 7 significant digits
// in JavaScript's shortest form ("0.1234568", "1234568", "1.5e-7"), without the two conversions through
// toPrecision's text and back, which took most of a `series` worker's time. Same text for every finite number.

const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`)) // exact doubles

/** JavaScript's Number-to-String of the decimal 0.d₁d₂…dₖ × 10ⁿ (digits without trailing zeros). */
function shortestForm(digits: string, n: number): string {
  const k = digits.length
  if (k <= n && n <= 21) return digits + '0'.repeat(n - k)
  if (0 < n && n <= 21) return digits.slice(0, n) + '.' + digits.slice(n)
  if (-6 < n && n <= 0) return '0.' + '0'.repeat(-n) + digits
  const e = n - 1
  return (k === 1 ? digits : digits[0] + '.' + digits.slice(1)) + (e < 0 ? 'e-' : 'e+') + Math.abs(e)
}

/**
 * A double's bits, read through a second view of its bytes: the binary exponent e₂ (|v| in [2^e₂, 2^(e₂+1)) for the
 * normal doubles sevenDigitMantissa takes) gives the decimal one as ⌊e₂·log₁₀2⌋ or one more, without a call to
 * Math.log10 (a fifth of the time of a number, in a micro-benchmark here).
 */
const BITS = new Float64Array(1)
const WORDS = new Uint32Array(BITS.buffer)
/** The word holding the sign, exponent and top of the mantissa: the second on a little-endian machine. */
const HIGH = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0
const LOG10_2 = Math.log10(2)

/** The decimal exponent n of the last sevenDigitMantissa: |v| rounds to 0.d₁…d₇ × 10ⁿ. */
let exponent = 0

/**
 * |v| (a > 0) rounded to 7 significant digits, as the integer m = d₁…d₇ in [1e6, 1e7), with its exponent in
 * `exponent`; or -1 where toPrecision must decide (outside 1e-16 .. 1e28, or within 1e-6 of a tie).
 */
function sevenDigitMantissa(a: number): number {
  // within 1e-16 .. 1e28 the scaled value is one correctly rounded operation on exact powers of ten
  if (!(a >= 1e-16 && a < 1e28)) return -1
  // the decimal exponent from the binary one (at most one too low: the step below mends that)
  BITS[0] = a
  let e = Math.floor((((WORDS[HIGH] >>> 20) & 0x7ff) - 1023) * LOG10_2)
  let scaled = e <= 6 ? a * POW10[6 - e] : a / POW10[e - 6]
  if (scaled >= 1e7) (e++, (scaled = e <= 6 ? a * POW10[6 - e] : a / POW10[e - 6]))
  else if (scaled < 1e6) (e--, (scaled = e <= 6 ? a * POW10[6 - e] : a / POW10[e - 6]))
  const low = Math.floor(scaled)
  const frac = scaled - low
  // far from a tie the rounding of the scaled value is that of the exact one; near one, ask toPrecision
  if (!(scaled >= 1e6 && scaled < 1e7 && Math.abs(frac - 0.5) > 1e-6)) return -1
  let m = frac > 0.5 ? low + 1 : low
  exponent = e + 1
  if (m === 1e7) (m = 1e6), exponent++
  return m
}

/** String(Number(v.toPrecision(7))) for a finite v. */
export function sevenDigits(v: number): string {
  if (v === 0) return '0'
  const m = sevenDigitMantissa(v < 0 ? -v : v)
  if (m < 0) return String(Number(v.toPrecision(7)))
  let digits = String(m)
  let end = digits.length
  while (digits.charCodeAt(end - 1) === 48) end--
  digits = digits.slice(0, end)
  return (v < 0 ? '-' : '') + shortestForm(digits, exponent)
}

const DIGITS = new Uint8Array(7)

/** Writes the characters of a string at `at` (codes below 256 only, else returns -1); returns the end. */
export function writeLatin1(s: string, out: Uint8Array, at: number): number {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i)
    if (c > 255) return -1
    out[at++] = c
  }
  return at
}

/**
 * Writes sevenDigits(v) as ASCII bytes at `at` of `out` (which has room for 32 more) and returns where it ends: the
 * same digits and form, without making a string (the rare values sevenDigits hands to toPrecision are written from
 * its string).
 */
export function writeSevenDigits(v: number, out: Uint8Array, at: number): number {
  if (v === 0) {
    out[at] = 48
    return at + 1
  }
  const mantissa = sevenDigitMantissa(v < 0 ? -v : v)
  if (mantissa < 0) return writeLatin1(String(Number(v.toPrecision(7))), out, at)
  const n = exponent
  // the 7 digits, then without trailing zeros (k of them); m below 1e7, so integer division by 10 is exact
  let m = mantissa | 0
  for (let i = 6; i >= 0; i--) {
    const q = (m / 10) | 0
    DIGITS[i] = 48 + m - q * 10
    m = q
  }
  let k = 7
  while (DIGITS[k - 1] === 48) k--
  if (v < 0) out[at++] = 45
  if (k <= n && n <= 21) {
    for (let i = 0; i < k; i++) out[at++] = DIGITS[i]
    for (let i = k; i < n; i++) out[at++] = 48
  } else if (0 < n && n <= 21) {
    for (let i = 0; i < n; i++) out[at++] = DIGITS[i]
    out[at++] = 46
    for (let i = n; i < k; i++) out[at++] = DIGITS[i]
  } else if (-6 < n && n <= 0) {
    out[at++] = 48
    out[at++] = 46
    for (let i = n; i < 0; i++) out[at++] = 48
    for (let i = 0; i < k; i++) out[at++] = DIGITS[i]
  } else {
    out[at++] = DIGITS[0]
    if (k > 1) {
      out[at++] = 46
      for (let i = 1; i < k; i++) out[at++] = DIGITS[i]
    }
    const x = n - 1
    out[at++] = 101
    out[at++] = x < 0 ? 45 : 43
    at = writeLatin1(String(x < 0 ? -x : x), out, at)
  }
  return at
}
