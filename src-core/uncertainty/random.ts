/**
 * Seeded random numbers for the uncertainty runs, so that a run repeats exactly.
 *
 * - Generator: xoshiro128** (Blackman & Vigna 2018, "Scrambled linear pseudorandom number generators",
 *   ACM Trans. Math. Softw. 47:36; reference code at prng.di.unimi.it): 128 bits of state, 32-bit output.
 * - Seeding: the four state words come from the 32-bit finaliser of MurmurHash3 (fmix32, Appleby) applied to
 *   a Weyl sequence with the golden-ratio increment 0x9e3779b9, in the manner of SplitMix (Steele, Lea &
 *   Flood 2014, OOPSLA). This is how a (seed, draw, stream) triple becomes an independent substream: draw i's
 *   numbers depend only on the seed and i, so draws can be computed in any order, on any worker.
 * - Normal variates: by the inverse of the normal distribution function (Acklam's rational approximation,
 *   relative error 1.15e-9, followed by one Halley step on erfc, which brings it to full double precision),
 *   rather than Box–Muller: one uniform per variate, which keeps Latin hypercube strata and truncation exact.
 */
import { erfc } from '../sizes/index.ts'

/** MurmurHash3's 32-bit finaliser (Appleby): a bijective avalanche mix of a 32-bit word. */
export function mix32(h: number): number {
  h ^= h >>> 16
  h = Math.imul(h, 0x85ebca6b)
  h ^= h >>> 13
  h = Math.imul(h, 0xc2b2ae35)
  h ^= h >>> 16
  return h >>> 0
}

/** xoshiro128** with 32-bit state words. `nextUint32` and `nextUniform` advance it. */
export class Xoshiro128 {
  private s0: number
  private s1: number
  private s2: number
  private s3: number

  /** Seeds from up to three 32-bit keys (seed, draw index, stream id) through a SplitMix-style Weyl sequence. */
  constructor(seed: number, draw = 0, stream = 0) {
    let w = mix32((seed >>> 0) ^ 0x6a09e667) // the first 32 bits of √2's fraction, to separate seed 0 from 0
    w = mix32(w ^ Math.imul((draw >>> 0) + 1, 0x9e3779b9))
    w = mix32(w ^ Math.imul((stream >>> 0) + 1, 0x85ebca6b))
    const next = () => {
      w = (w + 0x9e3779b9) >>> 0
      return mix32(w)
    }
    this.s0 = next()
    this.s1 = next()
    this.s2 = next()
    this.s3 = next()
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1 // the all-zero state is the one forbidden state
  }

  /** Next 32-bit output: rotl(s1 · 5, 7) · 9, then the xoshiro state update. */
  nextUint32(): number {
    const r = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0
    const t = this.s1 << 9
    this.s2 ^= this.s0
    this.s3 ^= this.s1
    this.s1 ^= this.s2
    this.s0 ^= this.s3
    this.s2 ^= t
    this.s3 = rotl(this.s3, 11)
    return r
  }

  /** A uniform number strictly inside (0, 1), with 53 random bits (two outputs). */
  nextUniform(): number {
    const hi = this.nextUint32() >>> 5 // 27 bits
    const lo = this.nextUint32() >>> 6 // 26 bits
    return (hi * 67108864 + lo + 0.5) / 9007199254740992
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k))
}

// Acklam's coefficients (P. J. Acklam, "An algorithm for computing the inverse normal cumulative
// distribution function", 2003; from memory, checked by the tests against erfc to 1e-12).
const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239]
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1]
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783]
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416]
const P_LOW = 0.02425

/** Φ(x) = P(Z ≤ x) for a standard normal Z, with full relative accuracy in the lower tail. */
export function normalCdf(x: number): number {
  return 0.5 * erfc(-x / Math.SQRT2)
}

/** Φ⁻¹(p): the standard normal quantile, 0 < p < 1 (−∞ at 0, +∞ at 1). */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN
  if (p === 0) return -Infinity
  if (p === 1) return Infinity
  let x: number
  if (p < P_LOW) {
    const q = Math.sqrt(-2 * Math.log(p))
    x = (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1)
  } else if (p <= 1 - P_LOW) {
    const q = p - 0.5
    const r = q * q
    x = ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1)
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p))
    x = -(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1)
  }
  // One Halley step on e(x) = Φ(x) − p (Acklam's refinement); in the upper tail on the complement.
  const e = p > 0.5 ? -(0.5 * erfc(x / Math.SQRT2) - (1 - p)) : 0.5 * erfc(-x / Math.SQRT2) - p
  const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2)
  return x - u / (1 + (x * u) / 2)
}

/** A random permutation of 0..n−1 (Fisher–Yates, Durstenfeld's form), from the generator. */
export function randomPermutation(n: number, rng: Xoshiro128): Uint32Array {
  const p = new Uint32Array(n)
  for (let i = 0; i < n; i++) p[i] = i
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(rng.nextUniform() * (i + 1))
    const t = p[i]
    p[i] = p[j]
    p[j] = t
  }
  return p
}
