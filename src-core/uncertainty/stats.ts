/**
 * The statistics layer of the uncertainty runs: summaries of a set of draws, a histogram, the probability
 * that the layer warms with its binomial standard error, and Spearman's rank correlation.
 */
import { InputError } from '../errors.ts'

/** Histogram of a set of values: `edges` has one more entry than `counts`. */
export interface Histogram {
  edges: number[]
  counts: number[]
}

/** Summary of one figure over the draws. */
export interface FigureSummary {
  /** Number of draws summarised. */
  count: number
  mean: number
  /** Sample standard deviation (n − 1 in the denominator); 0 for a single draw. */
  sd: number
  median: number
  /** 5th and 95th percentiles: the 5–95 % range. */
  p05: number
  p95: number
  min: number
  max: number
  histogram: Histogram
}

/**
 * Quantile of sorted values by linear interpolation between order statistics (Hyndman & Fan 1996,
 * Am. Stat. 50:361, their definition 7, the default of R and NumPy; common practice).
 */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length
  if (n === 0) throw new InputError('quantile', 'there are no values', 'Give at least one value.')
  if (!(q >= 0 && q <= 1)) throw new InputError('quantile', `${q} is not a probability`, 'Give a quantile from 0 to 1.')
  const h = (n - 1) * q
  const lo = Math.floor(h)
  const hi = Math.min(n - 1, lo + 1)
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo])
}

/** Number of histogram bins for n values: the square-root rule, kept between 5 and 40 (common practice). */
export function histogramBinCount(n: number): number {
  return Math.min(40, Math.max(5, Math.ceil(Math.sqrt(n))))
}

/** Equal-width histogram from min to max (a single bin [v, v] when every value is v). */
export function histogramOf(values: ArrayLike<number>, bins = histogramBinCount(values.length)): Histogram {
  let min = Infinity
  let max = -Infinity
  for (let i = 0; i < values.length; i++) {
    const v = values[i]
    if (v < min) min = v
    if (v > max) max = v
  }
  if (!values.length) return { edges: [], counts: [] }
  if (min === max) return { edges: [min, max], counts: [values.length] }
  const counts = new Array<number>(bins).fill(0)
  const width = (max - min) / bins
  for (let i = 0; i < values.length; i++) {
    const j = Math.min(bins - 1, Math.floor((values[i] - min) / width))
    counts[j]++
  }
  const edges = Array.from({ length: bins + 1 }, (_, j) => (j === bins ? max : min + j * width))
  return { edges, counts }
}

/** Mean, standard deviation, median, 5–95 % range and histogram of a set of values (all finite). */
export function summarizeValues(values: ArrayLike<number>, where = 'values'): FigureSummary {
  const n = values.length
  if (n === 0) throw new InputError(where, 'there are no draws to summarise', 'Run at least one draw.')
  const sorted = Float64Array.from(values)
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(sorted[i])) throw new InputError(where, `draw ${i} gave ${sorted[i]}`, 'Check the inputs of that draw; every draw must give a finite value.')
  }
  sorted.sort()
  // Welford's running mean and variance (Welford 1962, Technometrics 4:419): no cancellation.
  let mean = 0
  let m2 = 0
  for (let i = 0; i < n; i++) {
    const d = values[i] - mean
    mean += d / (i + 1)
    m2 += d * (values[i] - mean)
  }
  return {
    count: n,
    mean,
    sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0,
    median: quantileSorted(sorted, 0.5),
    p05: quantileSorted(sorted, 0.05),
    p95: quantileSorted(sorted, 0.95),
    min: sorted[0],
    max: sorted[n - 1],
    histogram: histogramOf(sorted)
  }
}

/** Probability that a value is positive, estimated as a fraction, with its binomial standard error √(p(1−p)/n). */
export interface ProbabilityEstimate {
  probability: number
  standard_error: number
  count: number
  positives: number
}

export function probabilityPositive(values: ArrayLike<number>): ProbabilityEstimate {
  const n = values.length
  let k = 0
  for (let i = 0; i < n; i++) if (values[i] > 0) k++
  const p = n ? k / n : NaN
  return { probability: p, standard_error: n ? Math.sqrt((p * (1 - p)) / n) : NaN, count: n, positives: k }
}

/**
 * The standard error the early stop judges: √(p̃(1−p̃)/n) with p̃ = (k + 1)/(n + 2) (Laplace's rule of
 * succession), so that a run where every draw so far has the same sign does not stop on an apparent zero error.
 */
export function stoppingStandardError(positives: number, count: number): number {
  const p = (positives + 1) / (count + 2)
  return Math.sqrt((p * (1 - p)) / count)
}

/** Ranks 1..n of the values, ties given their average rank. */
export function ranksOf(values: ArrayLike<number>): Float64Array {
  const n = values.length
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a] - values[b])
  const ranks = new Float64Array(n)
  let i = 0
  while (i < n) {
    let j = i
    while (j + 1 < n && values[order[j + 1]] === values[order[i]]) j++
    const r = (i + j) / 2 + 1
    for (let t = i; t <= j; t++) ranks[order[t]] = r
    i = j + 1
  }
  return ranks
}

/** Pearson's correlation of two equally long series; null when either does not vary. */
export function pearsonCorrelation(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  const n = x.length
  if (n !== y.length) throw new InputError('correlation', `the series have ${n} and ${y.length} values`, 'Give two series of the same length.')
  if (n < 2) return null
  let mx = 0
  let my = 0
  for (let i = 0; i < n; i++) {
    mx += x[i]
    my += y[i]
  }
  mx /= n
  my /= n
  let sxy = 0
  let sxx = 0
  let syy = 0
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx
    const dy = y[i] - my
    sxy += dx * dy
    sxx += dx * dx
    syy += dy * dy
  }
  if (!(sxx > 0 && syy > 0)) return null
  return sxy / Math.sqrt(sxx * syy)
}

/**
 * Spearman's rank correlation ρ (Spearman 1904): Pearson's correlation of the ranks (ties averaged).
 * null when either series does not vary.
 */
export function spearmanRankCorrelation(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  return pearsonCorrelation(ranksOf(x), ranksOf(y))
}
