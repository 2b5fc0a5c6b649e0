/**
 * Small complex-number helpers for the mixing rules, on (re, im) pairs of plain numbers.
 * Internal to src-core/materials: not part of the public API.
 */

/** A complex number as a mutable pair; used only as a scratch/output slot, never built in a loop. */
export interface Pair {
  re: number
  im: number
}

/** ε = m² for m = n + ik: ε = (n² − k²) + i·2nk. Writes into `out` and returns it. */
export function permittivityOf(n: number, k: number, out: Pair): Pair {
  out.re = n * n - k * k
  out.im = 2 * n * k
  return out
}

/**
 * Principal square root of a + ib, written as (n, k) with n >= 0.
 * Uses the cancellation-free form: for a >= 0, n = sqrt((|ε| + a)/2), k = b/(2n);
 * for a < 0, |k| = sqrt((|ε| − a)/2), n = |b|/(2|k|), k taking the sign of b.
 */
export function sqrtPair(a: number, b: number, out: Pair): Pair {
  const r = Math.hypot(a, b)
  if (r === 0) {
    out.re = 0
    out.im = 0
    return out
  }
  if (a >= 0) {
    const n = Math.sqrt((r + a) / 2)
    out.re = n
    out.im = b / (2 * n)
  } else {
    const t = Math.sqrt((r - a) / 2)
    out.re = Math.abs(b) / (2 * t)
    out.im = b < 0 ? -t : t
  }
  return out
}
