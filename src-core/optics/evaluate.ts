/**
 * A whole study, start to finish: every sample's bulk optics, forcing, forcing map and f(RH) curve.
 * This is what the app's worker and the CLI's `study` command call.
 */
import type { Study } from '../study/model.ts'
import { sampleForcing, sampleForcingMap } from './forcing.ts'
import { OpticsWorkspace } from './workspace.ts'
import { finish, sampleOpticsSteps, studyMaterials, type SampleOpticsOptions } from './sample.ts'
import type { HumidityGrowthCurve, SampleOptics, SampleResult, StudyResults } from './types.ts'

export const MOTEBENCH_VERSION = '0.1.0'

/** Humidities of the f(RH) curve, %. */
export const HUMIDITY_CURVE_RH: readonly number[] = [0, 20, 40, 50, 60, 70, 75, 80, 85, 90, 95]

export interface EvaluateOptions extends Pick<SampleOpticsOptions, 'tolerance' | 'anglesDeg'> {
  /** Only these samples (by index); default all. */
  sampleIndices?: number[]
  /** Leave out the f(RH) curve (it costs one 550 nm computation per humidity). */
  skipHumidityCurve?: boolean
  /**
   * Workspace to reuse (Mie buffers and the node cache): pass the same one across evaluations of an edited
   * study and nodes whose particles did not change are not computed again.
   */
  workspace?: OpticsWorkspace
  /** Called after each sample with (done, total); return false to stop early. */
  progress?: (done: number, total: number) => boolean | void
}

/** The f(RH) curve is drawn, not tabulated: its points are integrated to 1e-3 unless a tighter tolerance is asked for. */
export const HUMIDITY_CURVE_TOLERANCE = 1e-3

/** f(RH) at 550 nm: σsca at each humidity over σsca dry, on the sample's humidity branch. */
export function humidityGrowthCurve(study: Study, index: number, ws = new OpticsWorkspace(), tolerance = HUMIDITY_CURVE_TOLERANCE): HumidityGrowthCurve {
  return finish(humidityCurveSteps(study, index, ws, tolerance))
}

/** humidityGrowthCurve in steps: pauses every few milliseconds of work (see bulkOpticsSteps). */
export function* humidityCurveSteps(study: Study, index: number, ws = new OpticsWorkspace(), tolerance = HUMIDITY_CURVE_TOLERANCE): Generator<void, HumidityGrowthCurve> {
  return humidityCurveFrom(yield* humidityScatteringSteps(study, index, HUMIDITY_CURVE_RH, ws, tolerance))
}

/**
 * What the f(RH) curve of sample `index` depends on, as a string: the sample's size distribution, composition,
 * humidity branch and temperature, and the study's own materials. Not its humidity (the curve covers
 * HUMIDITY_CURVE_RH whatever it is), layer or name, nor the site or the study's wavelengths (the curve is at
 * 550 nm): equal keys give equal curves, so a humidity or layer edit can keep the curve it has.
 */
export function humidityCurveKey(study: Study, index: number): string {
  const s = study.samples[index]
  return JSON.stringify([s.size, s.composition, s.rh_history, s.temperature_k ?? null, study.user_materials ?? []])
}

/**
 * σsca at 550 nm at each of `humidities` (%) on the sample's humidity branch, the points of its f(RH) curve (a
 * computation split across workers asks each for some of them), pausing every few milliseconds of work.
 */
export function* humidityScatteringSteps(study: Study, index: number, humidities: readonly number[], ws = new OpticsWorkspace(), tolerance = HUMIDITY_CURVE_TOLERANCE): Generator<void, number[]> {
  const sample = study.samples[index]
  const own = studyMaterials(study)
  const at550 = { ...study, wavelengths_nm: [550] }
  const out: number[] = []
  for (const rh of humidities) {
    // only σsca is needed: no angular sums
    const optics = yield* sampleOpticsSteps(sample, at550, { rhPercent: rh, angularWavelengthsNm: [], upscatter: false, longwave: false, workspace: ws, tolerance: Math.min(tolerance, HUMIDITY_CURVE_TOLERANCE) }, own)
    out.push(optics.wavelengths[0].sca)
  }
  return out
}

/** The f(RH) curve from σsca at each humidity of HUMIDITY_CURVE_RH, in its order (the first is the dry one, 0 %). */
export function humidityCurveFrom(sca: readonly number[]): HumidityGrowthCurve {
  return { wavelength_nm: 550, rh_percent: [...HUMIDITY_CURVE_RH], f: sca.map((v, i) => (i === 0 ? 1 : v / sca[0])) }
}

/**
 * One sample's results in steps (pausing every few milliseconds of work and after each wavelength):
 * optics, forcing, forcing map and, unless skipped, the f(RH) curve.
 */
export function* sampleResultSteps(study: Study, index: number, options: Omit<EvaluateOptions, 'sampleIndices' | 'progress'> = {}): Generator<void, SampleResult> {
  const ws = options.workspace ?? new OpticsWorkspace()
  const optics = yield* sampleOpticsSteps(study.samples[index], study, { tolerance: options.tolerance, anglesDeg: options.anglesDeg, workspace: ws }, studyMaterials(study))
  const result = sampleResultFromOptics(study, optics)
  if (!options.skipHumidityCurve) result.humidity = yield* humidityCurveSteps(study, index, ws, options.tolerance ?? HUMIDITY_CURVE_TOLERANCE)
  return result
}

/** A sample's forcing and forcing map from its optics; the f(RH) curve is left empty (humidityCurveSteps fills it). */
export function sampleResultFromOptics(study: Study, optics: SampleOptics): SampleResult {
  const forcing = sampleForcing(optics, study.site, study.verdict_margin_w_m2)
  return { optics, forcing, map: sampleForcingMap(forcing, study.site), humidity: { wavelength_nm: 550, rh_percent: [], f: [] } }
}

/** Evaluates every sample of a study (or those chosen). */
export function evaluateStudy(study: Study, options: EvaluateOptions = {}): StudyResults {
  const ws = options.workspace ?? new OpticsWorkspace()
  const indices = options.sampleIndices ?? study.samples.map((_, i) => i)
  const samples: SampleResult[] = []
  for (const i of indices) {
    samples.push(finish(sampleResultSteps(study, i, { ...options, workspace: ws })))
    if (options.progress && options.progress(samples.length, indices.length) === false) break
  }
  return { samples, version: MOTEBENCH_VERSION }
}
