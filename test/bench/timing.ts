// Timing helpers for `npm run bench`: medians of repeats, each repeat long enough to time well.

/** Median of a list of numbers. */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m])
}

/**
 * Runs `once` (which does `work` evaluations) repeatedly for at least `minMs` per repeat, `repeats` times
 * after a warm-up of at least half a second (so the JIT has settled), and returns the median nanoseconds per
 * evaluation.
 */
export function nsPerEvaluation(once: () => void, work: number, repeats = 7, minMs = 150): number {
  const t0 = performance.now()
  while (performance.now() - t0 < Math.max(minMs, 500)) once()
  const per: number[] = []
  for (let r = 0; r < repeats; r++) {
    let calls = 0
    const start = performance.now()
    let now = start
    do {
      once()
      calls++
      now = performance.now()
    } while (now - start < minMs)
    per.push(((now - start) * 1e6) / (calls * work))
  }
  return median(per)
}

/** Median milliseconds of `repeats` runs of `once`, after one warm-up run. */
export function msPerRun(once: () => void, repeats = 9): number {
  once()
  const per: number[] = []
  for (let r = 0; r < repeats; r++) {
    const start = performance.now()
    once()
    per.push(performance.now() - start)
  }
  return median(per)
}

/** One JSON line per case. */
export function report(caseName: string, figures: Record<string, number | string>): void {
  process.stdout.write(JSON.stringify({ case: caseName, ...figures }) + '\n')
}
