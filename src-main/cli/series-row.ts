// The rows of `motebench series`: figures and CSV text of a block of distributions, shared by the command's worker
// threads and the bench.
import {
  binKernelsInputs,
  binKernelsLength,
  binnedRowEvaluator,
  binnedRowWidth,
  binOpticsKernels,
  packBinKernels,
  InputError,
  type BinKernels,
  type BinLayout,
  type BinnedRowEvaluator,
  type Sample,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import { csvCell } from './common.ts'
import { writeLatin1, writeSevenDigits } from './number-text.ts'
import { keptKernels, type KernelSource } from './kernel-cache.ts'

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

/** A row of a block that gave no figures: its index in the block, where its text would have started, and why. */
export interface RowFailure {
  index: number
  /** Characters of the block's text before this row (what is written when the run stops here). */
  at: number
  where: string
  message: string
  fix: string
  /** Not the input's fault (a bug): the run stops. */
  internal: boolean
}

/** A block's outcome: the CSV lines of its good rows, in order, and its failed rows. */
export interface BlockResult {
  text: string
  written: number
  failures: RowFailure[]
}

/**
 * Computes blocks of rows. The bins are the same on every row, so each bin's cross-sections per unit dN/dlogD are
 * integrated once (binOpticsKernels) and every row is a dot product (binnedRowEvaluator), written straight into
 * its CSV line (numbers to 7 significant digits, csvCell).
 */
export class SeriesBlockComputer {
  private kernels: BinKernels | null = null
  private evaluate: BinnedRowEvaluator | null = null
  private kernelError: unknown = null
  private figures = new Float64Array(0)
  private width = 0
  private bytes = new Uint8Array(1 << 16)
  /** Where the kernels came from (kernel-cache.ts), once useLayout has run. */
  kernelSource: KernelSource | undefined

  constructor(private readonly setup: SeriesSetup) {}

  /**
   * Integrates the layout's kernels (once per series; a few hundred milliseconds), or reads them from the cache of
   * an earlier run with the same inputs (kernel-cache.ts), and keeps them there for the next.
   */
  useLayout(layout: BinLayout): void {
    try {
      const { sample, tolerance, wavelengthsNm } = this.setup
      const study = { wavelengths_nm: wavelengthsNm, user_materials: this.setup.userMaterials }
      const kept = keptKernels(binKernelsInputs(sample, study, layout, tolerance), binKernelsLength(layout, wavelengthsNm.length), (integrated) => binOpticsKernels(sample, study, layout, { tolerance, integrated }), packBinKernels)
      this.kernels = kept.kernels
      this.kernelSource = kept.source
      this.evaluate = binnedRowEvaluator(this.kernels, layout)
      this.width = binnedRowWidth(this.kernels)
      this.figures = new Float64Array(this.width)
    } catch (e) {
      // as before, a layout the optics cannot use is every row's failure (reported per row)
      this.kernelError = e
    }
  }

  /** The figures of one row (all columns but time), for the bench. */
  rowFigures(values: ArrayLike<number>): Float64Array {
    if (!this.evaluate) throw this.kernelError ?? new Error('rows arrived before the bin layout')
    this.evaluate(values, 0, this.figures, 0)
    return this.figures
  }

  /**
   * Rows `values[r·bins .. (r+1)·bins)` with their time stamps. The lines are written as bytes into one reused
   * buffer (numbers by writeSevenDigits) and made a string once per block, as Latin-1; a block with a time stamp
   * beyond Latin-1 is written cell by cell as strings (blockAsStrings), the same text.
   */
  block(times: readonly string[], values: Float64Array, bins: number): BlockResult {
    let bytes = this.bytes
    let at = 0
    let written = 0
    const failures: RowFailure[] = []
    const out = this.figures
    const width = this.width
    for (let r = 0; r < times.length; r++) {
      try {
        if (!this.evaluate) throw this.kernelError ?? new Error('rows arrived before the bin layout')
        this.evaluate(values, r * bins, out, 0)
      } catch (e) {
        failures.push(failureOf(e, r, at))
        continue
      }
      const time = csvCell(times[r])
      // room for the time and every number (at most 26 characters and a comma each)
      const need = at + time.length + 27 * width + 2
      if (need > bytes.length) {
        const grown = new Uint8Array(Math.max(need, 2 * bytes.length))
        grown.set(bytes.subarray(0, at))
        bytes = this.bytes = grown
      }
      at = writeLatin1(time, bytes, at)
      if (at < 0) return this.blockAsStrings(times, values, bins)
      for (let c = 0; c < width; c++) {
        bytes[at++] = 44
        const v = out[c]
        if (Number.isFinite(v)) at = writeSevenDigits(v, bytes, at)
      }
      bytes[at++] = 10
      written++
    }
    return { text: Buffer.from(bytes.buffer, bytes.byteOffset, at).toString('latin1'), written, failures }
  }

  /** What block gives, written as a string per cell (for time stamps beyond Latin-1). */
  blockAsStrings(times: readonly string[], values: Float64Array, bins: number): BlockResult {
    let text = ''
    let written = 0
    const failures: RowFailure[] = []
    const out = this.figures
    for (let r = 0; r < times.length; r++) {
      try {
        if (!this.evaluate) throw this.kernelError ?? new Error('rows arrived before the bin layout')
        this.evaluate(values, r * bins, out, 0)
      } catch (e) {
        failures.push(failureOf(e, r, text.length))
        continue
      }
      let line = csvCell(times[r])
      for (let c = 0; c < this.width; c++) line += ',' + csvCell(out[c])
      text += line + '\n'
      written++
    }
    return { text, written, failures }
  }
}

/** A row's failure: the input's (InputError) or, otherwise, a bug. */
function failureOf(e: unknown, index: number, at: number): RowFailure {
  if (e instanceof InputError) return { index, at, where: e.where, message: e.message, fix: e.fix, internal: false }
  return { index, at, where: '', message: (e as Error)?.stack ?? String(e), fix: '', internal: true }
}
