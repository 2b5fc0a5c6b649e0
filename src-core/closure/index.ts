/**
 * Optical closure: the effective complex refractive index m = n + ik (the same at every wavelength) that makes
 * a measured size distribution reproduce measured scattering and absorption coefficients (and, optionally,
 * the hemispheric backscatter fraction).
 *
 * Method (common practice for closure retrievals):
 * - χ² = Σ ((model − measured)/sd)² over every measurement;
 * - parameters (n, s) with s = log10(k + K_FLOOR), so that k = 0 is an ordinary point and k is resolved in
 *   ratio over decades; the domain is bounded (n 1.3–1.8 and k 0–1 by default);
 * - a grid scan over (n, s); every grid point whose χ² is no larger than its (up to 8) neighbours' is a local
 *   minimum; those within a margin of the best are refined by Levenberg–Marquardt (Levenberg 1944, Marquardt
 *   1963; forward-difference Jacobian, bounds by projection);
 * - uncertainties of n and k from the curvature of χ²: covariance (JᵀJ)⁻¹ of the weighted residuals
 *   (the Gauss–Newton approximation to 2·(∂²χ²)⁻¹), carried from s to k by dk/ds = ln 10 (k + K_FLOOR);
 * - refined minima whose χ² is within Δχ² (default 2.3, the 68 % joint region for two parameters) of the best
 *   are all reported, and the answer is flagged as not unique; so is a minimum whose curvature leaves n or k
 *   unconstrained over the domain (a valley of equally good solutions).
 *
 * The forward model is the library's size integration (bulkOpticsAt) of the dry particles (no water: the
 * measured distribution is taken to be the particles as measured) at a fixed refinement level, so that the
 * model is a smooth function of (n, k) and finite differences are clean.
 */
import { InputError } from '../errors.ts'
import type { Material } from '../materials/index.ts'
import { bulkOpticsAt, OpticsWorkspace, samplePopulations, type Conditions } from '../optics/index.ts'
import type { Sample, SizeSpec } from '../study/model.ts'

/** Smallest k resolved: s = log10(k + K_FLOOR). */
export const K_FLOOR = 1e-4

export interface ClosureMeasurement {
  wavelength_nm: number
  value: number
  /** One standard deviation, same unit as the value. */
  sd: number
}

export interface ClosureInput {
  /** The measured size distribution (dry particles as measured): lognormal modes or bins. */
  size: SizeSpec
  /** Particle density, g cm⁻³: only needed for modes given by mass (default none). */
  density_g_cm3?: number
  /** Scattering and absorption coefficients, Mm⁻¹. */
  scattering?: ClosureMeasurement[]
  absorption?: ClosureMeasurement[]
  /** Hemispheric backscatter fraction σ_bsp/σ_sp. */
  backscatter_fraction?: ClosureMeasurement[]
}

export interface ClosureOptions {
  nRange?: [number, number]
  kRange?: [number, number]
  /** Grid points in n (default 21) and per decade of k + K_FLOOR (default 4). */
  gridN?: number
  kPerDecade?: number
  /** Δχ² within which other minima count as equally good (default 2.3). */
  deltaChi2?: number
  /** Refinement level of the size integration (default 3; see bulkOpticsAt). */
  level?: number
}

export interface ClosureFit {
  quantity: 'scattering' | 'absorption' | 'backscatter_fraction'
  wavelength_nm: number
  measured: number
  sd: number
  model: number
  /** (model − measured)/sd. */
  residual: number
}

export interface ClosureSolution {
  n: number
  k: number
  chi2: number
  /** One-sigma uncertainties from the curvature of χ² (null where the curvature does not constrain them). */
  sd_n: number | null
  sd_k: number | null
  /** Correlation of n and k at the minimum (null when unconstrained). */
  correlation: number | null
  /** Domain bounds the solution sits on ("n low", "k high", …). */
  on_bounds: string[]
  fits: ClosureFit[]
}

export interface ClosureResult {
  best: ClosureSolution
  /** Other separate minima with χ² − χ²_best < Δχ². */
  alternatives: ClosureSolution[]
  unique: boolean
  warnings: string[]
  /** Degrees of freedom: measurements − 2. */
  dof: number
  delta_chi2: number
  /** The grid scan: χ²[i][j] at n[i], k[j]. */
  grid: { n: number[]; k: number[]; chi2: number[][] }
  evaluations: number
  notes: string[]
}

interface Row {
  quantity: ClosureFit['quantity']
  wl: number
  value: number
  sd: number
}

/** The forward model: bulk optics of the measured distribution for a given (n, k). */
class ClosureModel {
  private current = { n: 1.5, k: 0 }
  private readonly pops: ReturnType<typeof samplePopulations>
  private readonly ws = new OpticsWorkspace()
  private readonly cond: Conditions = { rhPercent: 0, history: 'rising', temperatureK: 298.15 }
  readonly wavelengths: number[]
  evaluations = 0

  constructor(input: ClosureInput, private readonly rows: Row[], private readonly level: number) {
    const cur = this.current
    const material: Material = {
      id: 'closure-effective-index',
      name: 'effective index (closure)',
      densityGcm3: input.density_g_cm3 ?? 1,
      kappa: 0,
      index: { kind: 'expression', nExpression: 'n (closure)', kExpression: 'k (closure)', evaluateN: () => cur.n, evaluateK: () => cur.k },
      rangeUm: [0, Infinity],
      sources: { index: 'fitted by closure', density: input.density_g_cm3 === undefined ? 'not given' : 'given', kappa: 'dry particles' }
    }
    if (input.size.kind === 'modes' && input.size.modes.some((m) => m.by === 'mass') && input.density_g_cm3 === undefined) {
      throw new InputError('closure: density', 'a mode is given by mass, which needs the particle density to give numbers', 'Give the density in g cm⁻³, or the modes by number or volume.')
    }
    const sample: Sample = {
      name: 'closure',
      size: input.size,
      composition: { components: [{ material: material.id, volume_fraction: 1 }], mixing: 'volume-average', density_g_cm3: material.densityGcm3, kappa: 0 },
      rh_percent: 0,
      rh_history: 'rising',
      layer: { kind: 'depth', depth_m: 1 }
    }
    this.wavelengths = [...new Set(rows.map((r) => r.wl))].sort((a, b) => a - b)
    this.pops = samplePopulations(sample, [material], Math.max(...this.wavelengths) / 1000)
  }

  /** Model values for each measurement row at (n, k). */
  values(n: number, k: number, out: Float64Array): Float64Array {
    this.current.n = n
    this.current.k = k
    this.evaluations++
    const byWl = new Map<number, { sca: number; abs: number; b: number }>()
    for (const wl of this.wavelengths) {
      const r = bulkOpticsAt(this.pops, wl / 1000, this.cond, { tolerance: 0, maxLevel: this.level }, this.ws)
      byWl.set(wl, { sca: r.sca, abs: r.abs, b: r.backscatter })
    }
    this.rows.forEach((row, i) => {
      const o = byWl.get(row.wl)!
      out[i] = row.quantity === 'scattering' ? o.sca : row.quantity === 'absorption' ? o.abs : o.b
    })
    return out
  }
}

function rowsOf(input: ClosureInput): Row[] {
  const rows: Row[] = []
  const add = (list: ClosureMeasurement[] | undefined, quantity: Row['quantity'], what: string) => {
    ;(list ?? []).forEach((m, i) => {
      const where = `closure: ${what} ${i + 1}`
      if (!(m.wavelength_nm >= 200 && m.wavelength_nm <= 40000)) throw new InputError(where, `wavelength ${m.wavelength_nm} nm is outside 200 to 40000 nm`, 'Give the wavelength in nm, e.g. 550.')
      if (!Number.isFinite(m.value) || (quantity !== 'backscatter_fraction' && m.value < 0) || (quantity === 'backscatter_fraction' && !(m.value >= 0 && m.value <= 1))) {
        throw new InputError(where, `${m.value} is not a valid ${what}`, quantity === 'backscatter_fraction' ? 'Give the backscatter fraction from 0 to 1.' : 'Give the coefficient in Mm⁻¹, 0 or more.')
      }
      if (!(m.sd > 0 && Number.isFinite(m.sd))) throw new InputError(where, `the uncertainty ${m.sd} is not greater than 0`, 'Give each measurement a standard deviation greater than 0 (e.g. 21.3±1.0).')
      rows.push({ quantity, wl: m.wavelength_nm, value: m.value, sd: m.sd })
    })
  }
  add(input.scattering, 'scattering', 'scattering')
  add(input.absorption, 'absorption', 'absorption')
  add(input.backscatter_fraction, 'backscatter_fraction', 'backscatter fraction')
  if (!rows.length) throw new InputError('closure: measurements', 'no measurements are given', 'Give at least one scattering or absorption coefficient.')
  return rows
}

/** Solves the 2×2 system [a b; b d] x = r. Returns null when singular. */
function solve2(a: number, b: number, d: number, r0: number, r1: number): [number, number] | null {
  const det = a * d - b * b
  if (!(Math.abs(det) > 1e-300) || !Number.isFinite(det)) return null
  return [(d * r0 - b * r1) / det, (a * r1 - b * r0) / det]
}

/** Retrieves the effective index. See the module comment for the method. */
export function retrieveRefractiveIndex(input: ClosureInput, options: ClosureOptions = {}): ClosureResult {
  const rows = rowsOf(input)
  const [nLo, nHi] = options.nRange ?? [1.3, 1.8]
  const [kLo, kHi] = options.kRange ?? [0, 1]
  if (!(nLo > 0.05 && nHi > nLo && nHi <= 10)) throw new InputError('closure: n range', `${nLo} to ${nHi} is not a range of real indices`, 'Give e.g. 1.3 to 1.8.')
  if (!(kLo >= 0 && kHi > kLo && kHi <= 10)) throw new InputError('closure: k range', `${kLo} to ${kHi} is not a range of imaginary indices`, 'Give e.g. 0 to 1.')
  const gridN = options.gridN ?? 21
  const perDecade = options.kPerDecade ?? 4
  const delta = options.deltaChi2 ?? 2.3
  const level = options.level ?? 3
  if (!(Number.isInteger(gridN) && gridN >= 3)) throw new InputError('closure: grid', `${gridN} grid points in n`, 'Give at least 3.')
  if (!(perDecade > 0)) throw new InputError('closure: grid', `${perDecade} points per decade of k`, 'Give a positive number, e.g. 4.')
  const sLo = Math.log10(kLo + K_FLOOR)
  const sHi = Math.log10(kHi + K_FLOOR)
  const kOf = (s: number) => Math.max(0, Math.pow(10, s) - K_FLOOR)
  const model = new ClosureModel(input, rows, level)
  const m = rows.length
  const buf = new Float64Array(m)
  const chi2At = (n: number, s: number): number => {
    model.values(n, kOf(s), buf)
    let c = 0
    for (let i = 0; i < m; i++) {
      const r = (buf[i] - rows[i].value) / rows[i].sd
      c += r * r
    }
    return c
  }

  // Grid scan.
  const nGrid = Array.from({ length: gridN }, (_, i) => nLo + ((nHi - nLo) * i) / (gridN - 1))
  const sCount = Math.max(3, Math.ceil((sHi - sLo) * perDecade) + 1)
  const sGrid = Array.from({ length: sCount }, (_, j) => sLo + ((sHi - sLo) * j) / (sCount - 1))
  const chi = nGrid.map((n) => sGrid.map((s) => chi2At(n, s)))
  let gridBest = Infinity
  for (const row of chi) for (const c of row) gridBest = Math.min(gridBest, c)
  const minima: [number, number][] = []
  for (let i = 0; i < gridN; i++) {
    for (let j = 0; j < sCount; j++) {
      let isMin = true
      for (let di = -1; di <= 1 && isMin; di++) {
        for (let dj = -1; dj <= 1; dj++) {
          const a = i + di
          const b = j + dj
          if ((di || dj) && a >= 0 && a < gridN && b >= 0 && b < sCount && chi[a][b] < chi[i][j]) {
            isMin = false
            break
          }
        }
      }
      if (isMin && chi[i][j] <= gridBest + Math.max(10, 5 * delta)) minima.push([i, j])
    }
  }
  minima.sort((p, q) => chi[p[0]][p[1]] - chi[q[0]][q[1]])
  const starts = minima.slice(0, 8)

  // Levenberg–Marquardt from each start, on residuals r_i = (model_i − measured_i)/sd_i.
  const resid = (n: number, s: number, out: Float64Array) => {
    model.values(n, kOf(s), out)
    for (let i = 0; i < m; i++) out[i] = (out[i] - rows[i].value) / rows[i].sd
    return out
  }
  const clampN = (n: number) => Math.min(nHi, Math.max(nLo, n))
  const clampS = (s: number) => Math.min(sHi, Math.max(sLo, s))
  const hN = 1e-3
  const hS = 5e-3
  const jac = (n: number, s: number, r0: Float64Array, jn: Float64Array, js: Float64Array) => {
    const tmp = new Float64Array(m)
    const dn = n + hN <= nHi ? hN : -hN
    const ds = s + hS <= sHi ? hS : -hS
    resid(n + dn, s, tmp)
    for (let i = 0; i < m; i++) jn[i] = (tmp[i] - r0[i]) / dn
    resid(n, s + ds, tmp)
    for (let i = 0; i < m; i++) js[i] = (tmp[i] - r0[i]) / ds
  }
  const sumSq = (r: Float64Array) => r.reduce((a, v) => a + v * v, 0)
  const refine = (n0: number, s0: number) => {
    let n = n0
    let s = s0
    const r = resid(n, s, new Float64Array(m))
    let c = sumSq(r)
    let lambda = 1e-2
    const jn = new Float64Array(m)
    const js = new Float64Array(m)
    const trial = new Float64Array(m)
    for (let it = 0; it < 60; it++) {
      jac(n, s, r, jn, js)
      let a = 0, b = 0, d = 0, g0 = 0, g1 = 0
      for (let i = 0; i < m; i++) {
        a += jn[i] * jn[i]
        b += jn[i] * js[i]
        d += js[i] * js[i]
        g0 += jn[i] * r[i]
        g1 += js[i] * r[i]
      }
      let improved = false
      for (let tries = 0; tries < 12; tries++) {
        // Marquardt's scaling: damp by λ·diag(JᵀJ) (with a floor for a flat direction)
        const step = solve2(a + lambda * Math.max(a, 1e-12), b, d + lambda * Math.max(d, 1e-12), -g0, -g1)
        if (!step) {
          lambda *= 10
          continue
        }
        const n1 = clampN(n + step[0])
        const s1 = clampS(s + step[1])
        resid(n1, s1, trial)
        const c1 = sumSq(trial)
        if (c1 < c) {
          const small = Math.abs(n1 - n) < 1e-6 && Math.abs(s1 - s) < 1e-5
          n = n1
          s = s1
          r.set(trial)
          const gain = c - c1
          c = c1
          lambda = Math.max(lambda / 3, 1e-9)
          improved = true
          if (small || gain < 1e-10 * (1 + c)) it = 1e9
          break
        }
        lambda *= 4
      }
      if (!improved) break
    }
    return { n, s, chi2: c }
  }

  const solutions: ClosureSolution[] = []
  const found: { n: number; s: number; chi2: number }[] = []
  for (const [i, j] of starts) {
    const f = refine(nGrid[i], sGrid[j])
    if (found.some((g) => Math.abs(g.n - f.n) < 0.01 && Math.abs(g.s - f.s) < 0.05)) continue
    found.push(f)
  }
  found.sort((p, q) => p.chi2 - q.chi2)
  const best = found[0]
  const spanN = nHi - nLo
  const spanS = sHi - sLo
  const warnings: string[] = []
  const describe = (f: { n: number; s: number; chi2: number }): ClosureSolution => {
    const r0 = resid(f.n, f.s, new Float64Array(m))
    const jn = new Float64Array(m)
    const js = new Float64Array(m)
    jac(f.n, f.s, r0, jn, js)
    let a = 0, b = 0, d = 0
    for (let i = 0; i < m; i++) {
      a += jn[i] * jn[i]
      b += jn[i] * js[i]
      d += js[i] * js[i]
    }
    const det = a * d - b * b
    let sdN: number | null = null
    let sdS: number | null = null
    let corr: number | null = null
    if (det > 1e-12 * Math.max(a * d, 1e-300)) {
      const vn = d / det
      const vs = a / det
      sdN = Math.sqrt(vn)
      sdS = Math.sqrt(vs)
      corr = -b / det / (sdN * sdS)
    }
    const k = kOf(f.s)
    const sdK = sdS === null ? null : Math.LN10 * (k + K_FLOOR) * sdS
    const constrainedN = sdN !== null && sdN < spanN / 2
    const constrainedS = sdS !== null && sdS < spanS / 2
    const on: string[] = []
    if (f.n <= nLo + 1e-9) on.push('n low')
    if (f.n >= nHi - 1e-9) on.push('n high')
    if (f.s <= sLo + 1e-9) on.push('k low')
    if (f.s >= sHi - 1e-9) on.push('k high')
    const modelVals = model.values(f.n, k, new Float64Array(m))
    return {
      n: f.n,
      k,
      chi2: f.chi2,
      sd_n: constrainedN ? sdN : null,
      sd_k: constrainedS ? sdK : null,
      correlation: constrainedN && constrainedS ? corr : null,
      on_bounds: on,
      fits: rows.map((row, i) => ({ quantity: row.quantity, wavelength_nm: row.wl, measured: row.value, sd: row.sd, model: modelVals[i], residual: (modelVals[i] - row.value) / row.sd }))
    }
  }
  const bestSol = describe(best)
  solutions.push(bestSol)
  const alternatives = found.slice(1).filter((f) => f.chi2 - best.chi2 < delta).map(describe)
  if (alternatives.length) warnings.push(`not unique: ${alternatives.length + 1} separate minima have χ² within ${delta} of the best (all are listed)`)
  if (bestSol.sd_n === null || bestSol.sd_k === null) {
    warnings.push(`not unique: the measurements do not constrain ${bestSol.sd_n === null && bestSol.sd_k === null ? 'n or k' : bestSol.sd_n === null ? 'n' : 'k'} (χ² has a flat valley through the best fit; add measurements, e.g. absorption or more wavelengths)`)
  }
  if (bestSol.on_bounds.length) warnings.push(`the best fit sits on the edge of the domain (${bestSol.on_bounds.join(', ')}): its uncertainty is one-sided`)
  const dof = m - 2
  if (dof > 0 && best.chi2 > dof + 3 * Math.sqrt(2 * dof) + 4) warnings.push(`χ² = ${best.chi2.toPrecision(3)} for ${dof} degrees of freedom: no index reproduces the measurements within their uncertainties (check the size distribution and the units)`)
  return {
    best: bestSol,
    alternatives,
    unique: warnings.every((w) => !w.startsWith('not unique')),
    warnings,
    dof,
    delta_chi2: delta,
    grid: { n: nGrid, k: sGrid.map(kOf), chi2: chi },
    evaluations: model.evaluations,
    notes: [
      'Effective index of homogeneous spheres, the same at every wavelength; dry particles as measured.',
      `Grid over n ${nLo}–${nHi} and log10(k + ${K_FLOOR}) for k ${kLo}–${kHi}, then Levenberg–Marquardt; uncertainties from the curvature of χ² (inverse of JᵀJ), one standard deviation.`
    ]
  }
}
