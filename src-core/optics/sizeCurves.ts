// A sample's dry size distribution as the app plots it (dN/dlogD, dS/dlogD, dV/dlogD against diameter).
import { binValues, dNdlogD } from '../sizes/index.ts'
import type { Sample, Study } from '../study/model.ts'
import { samplePopulations, studyMaterials } from './sample.ts'

/** A sample's dry size distribution for plotting: dN/dlogD, dS/dlogD and dV/dlogD against diameter (µm). */
export interface SizeDistributionCurves {
  diameter_um: number[]
  /** cm⁻³, µm² cm⁻³ and µm³ cm⁻³ per unit log₁₀ D. */
  number: number[]
  surface: number[]
  volume: number[]
  /** true for measured bins: the values are steps, each bin's value from its left edge. */
  measured: boolean
}

/**
 * Dry size distribution curves of a sample: modes on 241 diameters from 1 nm to 100 µm; measured bins as
 * steps at their edges (the last value repeated at the last edge). Surface and volume of spheres, πD² and
 * (π/6)D³ times dN/dlogD.
 */
export function sizeDistributionCurves(sample: Sample, study: Pick<Study, 'user_materials' | 'wavelengths_nm'>): SizeDistributionCurves {
  const pops = samplePopulations(sample, studyMaterials(study), Math.max(...study.wavelengths_nm, 550) / 1000)
  const bins = pops.length === 1 ? pops[0].bins : undefined
  if (bins) {
    const n = bins.dNdlogD.length
    const S = binValues(bins, 'dS/dlogDp')
    const V = binValues(bins, 'dV/dlogDp')
    const steps = (a: ArrayLike<number>) => [...Array.from(a), a[n - 1]]
    return { diameter_um: Array.from(bins.edges), number: steps(bins.dNdlogD), surface: steps(S), volume: steps(V), measured: true }
  }
  const modes = pops.map((p) => p.mode!)
  const diameter_um: number[] = []
  const number: number[] = []
  for (let i = 0; i <= 240; i++) {
    const d = 10 ** (-3 + (5 * i) / 240)
    diameter_um.push(d)
    number.push(modes.reduce((sum, m) => sum + dNdlogD(m, d), 0))
  }
  return {
    diameter_um,
    number,
    surface: number.map((v, i) => Math.PI * diameter_um[i] ** 2 * v),
    volume: number.map((v, i) => (Math.PI / 6) * diameter_um[i] ** 3 * v),
    measured: false
  }
}
