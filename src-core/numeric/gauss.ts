/**
 * Gauss–Legendre quadrature on [−1, 1]: nodes and weights by Newton's method on the Legendre
 * polynomial P_n from the Chebyshev-like first guess cos(π (i − 1/4)/(n + 1/2))
 * (Abramowitz & Stegun 1964, §25.4.29; Press et al., Numerical Recipes, §4.6).
 * Exact for polynomials of degree ≤ 2n − 1. Results are cached per n; treat them as read-only.
 */
export interface QuadratureRule {
  nodes: Float64Array
  weights: Float64Array
}

const cache = new Map<number, QuadratureRule>()
const pd = new Float64Array(2)

/** P_n(z) and P_n'(z) into out[0], out[1], by the three-term recurrence (n ≥ 1, |z| < 1). */
function legendreAt(n: number, z: number, out: Float64Array): void {
  let p0 = 1
  let p1 = z
  for (let k = 2; k <= n; k++) {
    const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k
    p0 = p1
    p1 = p2
  }
  out[0] = p1
  out[1] = n === 1 ? 1 : (n * (z * p1 - p0)) / (z * z - 1)
}

export function gaussLegendre(n: number): QuadratureRule {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`gaussLegendre: n must be a positive integer, got ${n}`)
  const hit = cache.get(n)
  if (hit) return hit
  const nodes = new Float64Array(n)
  const weights = new Float64Array(n)
  const half = (n + 1) >> 1
  for (let i = 0; i < half; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5))
    for (let iter = 0; iter < 100; iter++) {
      legendreAt(n, z, pd)
      const dz = pd[0] / pd[1]
      z -= dz
      if (Math.abs(dz) < 1e-16) break
    }
    legendreAt(n, z, pd) // the derivative at the converged node
    const w = 2 / ((1 - z * z) * pd[1] * pd[1])
    nodes[i] = -z
    nodes[n - 1 - i] = z
    weights[i] = w
    weights[n - 1 - i] = w
  }
  if (n % 2 === 1) nodes[half - 1] = 0
  const rule = { nodes, weights }
  cache.set(n, rule)
  return rule
}

/** Gauss–Legendre rule mapped onto [a, b] (a new rule; not cached). */
export function gaussLegendreOn(n: number, a: number, b: number): QuadratureRule {
  const { nodes, weights } = gaussLegendre(n)
  const h = 0.5 * (b - a)
  const c = 0.5 * (b + a)
  const out = { nodes: new Float64Array(n), weights: new Float64Array(n) }
  for (let i = 0; i < n; i++) {
    out.nodes[i] = c + h * nodes[i]
    out.weights[i] = h * weights[i]
  }
  return out
}
