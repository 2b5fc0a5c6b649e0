// One output row of `motebench series`: the figures of one distribution, shared by the command, its workers and the bench.
import { binOpticsKernels, InputError, opticsFromBinKernels, OpticsWorkspace, type BinKernels, type BinLayout, type Sample, type UserMaterialSpec } from '../../src-core/index.ts'

/** What every row of a series shares: the sample (composition, humidity, layer), wavelengths and accuracy. */
export interface SeriesSetup {
  sample: Sample
  userMaterials: UserMaterialSpec[]
  wavelengthsNm: number[]
  tolerance: number
}

export type { BinLayout }

/** Column names, units included: time, then per wavelength ext, sca, abs, ssa, g, then number, volume, mass. */
export function seriesColumns(wavelengthsNm: readonly number[]): string[] {
  const cols = ['time']
  for (const w of wavelengthsNm) cols.push(`ext_${w}nm_Mm-1`, `sca_${w}nm_Mm-1`, `abs_${w}nm_Mm-1`, `ssa_${w}nm`, `g_${w}nm`)
  cols.push('dry_number_cm-3', 'dry_volume_um3_cm-3', 'dry_mass_ug_m-3')
  return cols
}

/**
 * Computes rows one after another. The bins are the same on every row, so each bin's cross-sections per
 * unit dN/dlogD are integrated once (binOpticsKernels) and every row is a dot product (opticsFromBinKernels).
 */
export class SeriesRowComputer {
  private readonly study: { wavelengths_nm: number[]; user_materials: UserMaterialSpec[] }
  private readonly ws = new OpticsWorkspace()
  private kernels: BinKernels | null = null
  private kernelLayout: BinLayout | null = null

  constructor(private readonly setup: SeriesSetup) {
    this.study = { wavelengths_nm: setup.wavelengthsNm, user_materials: setup.userMaterials }
  }

  /** The numbers of one output row (all columns but time). Throws InputError for a distribution it cannot use. */
  cells(bins: BinLayout, values: number[]): number[] {
    if (this.kernelLayout !== bins || !this.kernels) {
      this.kernels = binOpticsKernels(this.setup.sample, this.study, bins, { tolerance: this.setup.tolerance, workspace: this.ws })
      this.kernelLayout = bins
    }
    const o = opticsFromBinKernels(this.kernels, bins, values)
    const out: number[] = []
    // ssa and g of an empty distribution are undefined: NaN (an empty cell)
    for (const w of o.wavelengths) out.push(w.ext, w.sca, w.abs, w.ssa, w.g)
    out.push(o.number_cm3, o.volume_um3_cm3, o.mass_ug_m3)
    return out
  }
}

/** One row's outcome, as a worker posts it back (or the main thread records it). */
export type RowResult = { seq: number; ok: true; cells: number[] } | { seq: number; ok: false; where: string; message: string; fix: string; internal: boolean }

/** Computes one row, turning a refusal into a result that says why (internal: not the input's fault). */
export function computeRow(computer: SeriesRowComputer, bins: BinLayout | undefined, seq: number, values: number[]): RowResult {
  try {
    if (!bins) throw new Error('rows arrived before the bin layout')
    return { seq, ok: true, cells: computer.cells(bins, values) }
  } catch (e) {
    if (e instanceof InputError) return { seq, ok: false, where: e.where, message: e.message, fix: e.fix, internal: false }
    return { seq, ok: false, where: '', message: (e as Error)?.stack ?? String(e), fix: '', internal: true }
  }
}
