/**
 * Gauss–Legendre quadrature (private helper of the climate module).
 * Nodes are the zeros of the Legendre polynomial P_n found by Newton's method from the asymptotic first
 * guess cos(π(i − 1/4)/(n + 1/2)); weights w_i = 2/((1 − x_i²) P_n'(x_i)²).
 * Abramowitz, M. & Stegun, I. A. (1964), Handbook of Mathematical Functions, §25.4.29 (from memory).
 */
const cache = new Map<number, { x: Float64Array; w: Float64Array }>()

/** Nodes and weights on [−1, 1] for n ≥ 1 points; exact for polynomials of degree ≤ 2n − 1. */
export function legendreNodesWeights(n: number): { x: Float64Array; w: Float64Array } {
  const hit = cache.get(n)
  if (hit) return hit
  const x = new Float64Array(n)
  const w = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5))
    let dp = 1
    for (let iter = 0; iter < 100; iter++) {
      // Recurrence (j+1) P_{j+1} = (2j+1) z P_j − j P_{j−1}
      let p0 = 1
      let p1 = z
      for (let j = 1; j < n; j++) {
        const p2 = ((2 * j + 1) * z * p1 - j * p0) / (j + 1)
        p0 = p1
        p1 = p2
      }
      const pn = n === 1 ? z : p1
      const pnm1 = n === 1 ? 1 : p0
      dp = (n * (z * pn - pnm1)) / (z * z - 1)
      const dz = pn / dp
      z -= dz
      if (Math.abs(dz) < 1e-15) break
    }
    // recompute derivative at the converged node
    let p0 = 1
    let p1 = z
    for (let j = 1; j < n; j++) {
      const p2 = ((2 * j + 1) * z * p1 - j * p0) / (j + 1)
      p0 = p1
      p1 = p2
    }
    const pn = n === 1 ? z : p1
    const pnm1 = n === 1 ? 1 : p0
    dp = (n * (z * pn - pnm1)) / (z * z - 1)
    x[n - 1 - i] = z
    w[n - 1 - i] = 2 / ((1 - z * z) * dp * dp)
  }
  const out = { x, w }
  cache.set(n, out)
  return out
}

/** Nodes and weights mapped to [a, b]. */
export function legendreOnInterval(n: number, a: number, b: number): { x: Float64Array; w: Float64Array } {
  const { x, w } = legendreNodesWeights(n)
  const half = 0.5 * (b - a)
  const mid = 0.5 * (a + b)
  const xs = new Float64Array(n)
  const ws = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    xs[i] = mid + half * x[i]
    ws[i] = half * w[i]
  }
  return { x: xs, w: ws }
}
