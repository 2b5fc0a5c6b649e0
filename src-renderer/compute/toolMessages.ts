// Messages between the UI and the tools worker (uncertainty, closure, instrument corrections).
import type { ClosureMeasurement, ClosureResult, RebinResult, Sample, Study, TruncationCorrection, UncertaintyResult, UserMaterialSpec } from '../../src-core/index.ts'

/** A bad input, as src-core reports it, and (when it could be told) which uncertain input it belongs to. */
export interface ToolProblem {
  where: string
  message: string
  fix: string
  /** Which list and row of the uncertainty editor the problem is in. */
  list?: 'sample' | 'site'
  row?: number
}

export interface TruncationRow extends TruncationCorrection {
  wavelength_nm: number
  rh_percent: number
  sca_true_mm: number
  sca_measured_mm: number
}

/** The dry index of a sample's composition at one wavelength, and how it was made. */
export interface SampleIndex {
  wavelength_nm: number
  n: number
  k: number
  note: string
}

export type ToTools =
  /** A Monte Carlo run of a sample's uncertain inputs as the study document gives them. */
  | { type: 'uncertainty'; run: number; study: Study; sample: string }
  /** Stop the uncertainty run: the draws made so far are summarised. */
  | { type: 'cancel'; run: number }
  | {
      type: 'closure'
      run: number
      sample: Sample
      userMaterials: UserMaterialSpec[]
      scattering: ClosureMeasurement[]
      absorption: ClosureMeasurement[]
      backscatter: ClosureMeasurement[]
      nRange: [number, number]
      kRange: [number, number]
    }
  | {
      type: 'truncation'
      run: number
      sample: Sample
      userMaterials: UserMaterialSpec[]
      lowDeg: number
      highDeg: number
      response?: { angles_deg: number[]; weight: number[] }
      wavelengths: number[]
      rhPercent?: number
    }
  | { type: 'sample-index'; run: number; sample: Sample; userMaterials: UserMaterialSpec[]; wavelengths: number[] }
  | {
      type: 'rebin'
      run: number
      edges: number[]
      index: { n: number; k: number }
      wavelengthNm: number
      lowDeg: number
      highDeg: number
      calibration: { n: number; k: number }
    }

export type FromTools =
  | { type: 'progress'; run: number; done: number; total: number; warm?: number; standardError?: number }
  | { type: 'uncertainty'; run: number; result: UncertaintyResult }
  | { type: 'closure'; run: number; result: ClosureResult; own: SampleIndex[] }
  | { type: 'truncation'; run: number; rows: TruncationRow[] }
  | { type: 'sample-index'; run: number; indices: SampleIndex[] }
  | { type: 'rebin'; run: number; result: RebinResult }
  | { type: 'failed'; run: number; problem: ToolProblem }
