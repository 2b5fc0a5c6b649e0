// Bench cases for single spheres.
import { AngularTable, angularFromCoefficients, coatedSphereEfficiencies, CoatedWorkspace, MieWorkspace, newAngularScattering, sphereEfficiencies, UPSCATTER_SCATTERING_COSINES } from '../../src-core/index.ts'
import { nsPerEvaluation, report } from './timing.ts'

/** The sphere-grid sizes: x_i = 0.05 · 10^(3.3 i / 1999), i = 0 … 1999. */
function gridSizes(count = 2000): Float64Array {
  const xs = new Float64Array(count)
  for (let i = 0; i < count; i++) xs[i] = 0.05 * Math.pow(10, (3.3 * i) / (count - 1))
  return xs
}

export function benchSphereGrid(): void {
  const xs = gridSizes()
  const count = xs.length
  const ws = new MieWorkspace()
  let sink = 0
  const ns = nsPerEvaluation(() => {
    for (let i = 0; i < count; i++) sink += sphereEfficiencies(xs[i], 1.53, 0.01, ws).qext
  }, count, 7, 1000 / 7)
  report('sphere-grid', { evaluations: count, m: '1.53+0.01i', ns_per_eval: Math.round(ns) })
  if (!Number.isFinite(sink)) throw new Error("sphere-grid produced a non-finite sum")
}

export function benchSphereLarge(): void {
  const ws = new MieWorkspace()
  for (const x of [1000, 10000]) {
    const ns = nsPerEvaluation(() => void sphereEfficiencies(x, 1.33, 1e-8, ws), 1, 5, 200)
    report('sphere-large', { x, m: '1.33+1e-8i', us_per_eval: Number((ns / 1000).toFixed(2)) })
  }
}

export function benchSphereAngles(): void {
  const ws = new MieWorkspace()
  const angles = Array.from({ length: 181 }, (_, i) => i)
  const out = newAngularScattering(angles)
  const ns = nsPerEvaluation(() => {
    const eff = sphereEfficiencies(50, 1.53, 0.01, ws)
    angularFromCoefficients(50, ws, eff, out)
  }, 1, 5, 200)
  report('sphere-angles', { x: 50, angles: 181, us_per_eval: Number((ns / 1000).toFixed(2)) })
}

/**
 * The tabulated angular sums the size integration adds at each node: S11 and S12 at the 64 upscatter
 * cosines (32 mirrored pairs), per sphere and per series term and tabulated cosine.
 */
export function benchAngularTable(): void {
  const table = new AngularTable(UPSCATTER_SCATTERING_COSINES.nodes)
  const ws = new MieWorkspace()
  const s11 = new Float64Array(table.mu.length)
  const s12 = new Float64Array(table.mu.length)
  for (const x of [30, 300, 1000]) {
    sphereEfficiencies(x, 1.5, 0.001, ws)
    const ns = nsPerEvaluation(() => table.accumulate(ws, 1, s11, s12), 1, 5, 200)
    report('angular-table', { x, cosines: table.mu.length, us_per_sphere: Number((ns / 1000).toFixed(2)), ns_per_term_and_pair: Number((ns / (ws.terms * table.mu.length / 2)).toFixed(2)) })
  }
  if (!s11.every(Number.isFinite)) throw new Error('angular-table produced a non-finite sum')
}

export function benchCoatedGrid(): void {
  const xs = gridSizes()
  const count = xs.length
  const ws = new CoatedWorkspace()
  let sink = 0
  const ns = nsPerEvaluation(() => {
    for (let i = 0; i < count; i++) sink += coatedSphereEfficiencies(0.4 * xs[i], 1.95, 0.79, xs[i], 1.53, 0.01, ws).qext
  }, count, 5, 200)
  report('coated-grid', { evaluations: count, core: '40 % of the diameter, 1.95+0.79i', shell: '1.53+0.01i', ns_per_eval: Math.round(ns) })
  if (!Number.isFinite(sink)) throw new Error('coated-grid produced a non-finite sum')
}
