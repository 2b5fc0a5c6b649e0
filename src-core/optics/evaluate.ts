/**
 * A whole study, start to finish: every sample's bulk optics, forcing, forcing map and f(RH) curve.
 * This is what the app's worker and the CLI's `study` command call.
 */
import type { Study } from '../study/model.ts'
import { sampleForcing, sampleForcingMap } from './forcing.ts'
import { OpticsWorkspace } from './integrate.ts'
import { computeSampleOptics, studyMaterials, type SampleOpticsOptions } from './sample.ts'
import type { HumidityGrowthCurve, SampleResult, StudyResults } from './types.ts'

export const MOTEBENCH_VERSION = '0.1.0'

/** Humidities of the f(RH) curve, %. */
export const HUMIDITY_CURVE_RH: readonly number[] = [0, 20, 40, 50, 60, 70, 75, 80, 85, 90, 95]

export interface EvaluateOptions extends Pick<SampleOpticsOptions, 'tolerance' | 'anglesDeg'> {
  /** Only these samples (by index); default all. */
  sampleIndices?: number[]
  /** Leave out the f(RH) curve (it costs one 550 nm computation per humidity). */
  skipHumidityCurve?: boolean
  /** Called after each sample with (done, total); return false to stop early. */
  progress?: (done: number, total: number) => boolean | void
}

/** The f(RH) curve is drawn, not tabulated: its points are integrated to 1e-3 unless a tighter tolerance is asked for. */
export const HUMIDITY_CURVE_TOLERANCE = 1e-3

/** f(RH) at 550 nm: σsca at each humidity over σsca dry, on the sample's humidity branch. */
export function humidityGrowthCurve(study: Study, index: number, ws = new OpticsWorkspace(), tolerance = HUMIDITY_CURVE_TOLERANCE): HumidityGrowthCurve {
  const sample = study.samples[index]
  const own = studyMaterials(study)
  const tol = Math.min(tolerance, HUMIDITY_CURVE_TOLERANCE)
  const at = (rh: number) =>
    computeSampleOptics(sample, { ...study, wavelengths_nm: [550] }, { rhPercent: rh, angularWavelengthsNm: [], workspace: ws, tolerance: tol }, own).wavelengths[0].sca
  const dry = at(0)
  return { wavelength_nm: 550, rh_percent: [...HUMIDITY_CURVE_RH], f: HUMIDITY_CURVE_RH.map((rh) => (rh === 0 ? 1 : at(rh) / dry)) }
}

/** Evaluates every sample of a study (or those chosen). */
export function evaluateStudy(study: Study, options: EvaluateOptions = {}): StudyResults {
  const own = studyMaterials(study)
  const ws = new OpticsWorkspace()
  const indices = options.sampleIndices ?? study.samples.map((_, i) => i)
  const samples: SampleResult[] = []
  for (const i of indices) {
    const optics = computeSampleOptics(study.samples[i], study, { tolerance: options.tolerance, anglesDeg: options.anglesDeg, workspace: ws }, own)
    const forcing = sampleForcing(optics, study.site, study.verdict_margin_w_m2)
    const map = sampleForcingMap(forcing, study.site)
    const humidity = options.skipHumidityCurve ? { wavelength_nm: 550, rh_percent: [], f: [] } : humidityGrowthCurve(study, i, ws, options.tolerance ?? HUMIDITY_CURVE_TOLERANCE)
    samples.push({ optics, forcing, map, humidity })
    if (options.progress && options.progress(samples.length, indices.length) === false) break
  }
  return { samples, version: MOTEBENCH_VERSION }
}
