/**
 * What an uncertainty run says: each figure's summary beside the unperturbed calculation, P(warm), the inputs'
 * Spearman ranking; and runUncertainty, the whole run in one thread (plan, draws, early stop, summary).
 */
import { InputError } from '../errors.ts'
import { sampleForcingFigures } from '../optics/index.ts'
import type { Study } from '../study/model.ts'
import { probabilityPositive, spearmanRankCorrelation, summarizeValues, type FigureSummary, type ProbabilityEstimate } from './stats.ts'
import { UNCERTAINTY_WAVELENGTH_NM, type UncertainInput } from './settings.ts'
import {
  completePlan,
  computeDraws,
  drawColumn,
  drawOptics,
  drawWorkspace,
  earlyStopPoint,
  FORCING_INDEX,
  mergeDrawBlocks,
  N_OUT,
  planUncertainty,
  recordFigures,
  UNCERTAINTY_CHECK_EVERY,
  UNCERTAINTY_FIGURES,
  UNCERTAINTY_TOLERANCE,
  type DrawBlock,
  type UncertaintyFigureKey,
  type UncertaintyPlan,
  type UncertaintyRunOptions
} from './propagate.ts'

// ---------------------------------------------------------------------------------------------------------------
// Results

export type UncertaintyStatus = 'completed' | 'precision reached' | 'cancelled'

export interface UncertaintyFigureResult extends FigureSummary {
  key: UncertaintyFigureKey
  label: string
  unit: string
  /** The figure without any perturbation (the plain calculation at the same settings). */
  central: number
}

export interface UncertaintyInputResult {
  label: string
  input: UncertainInput
  /** Summary of the drawn variate (the factor, offset or value). */
  variate: FigureSummary
}

export interface SensitivityEntry {
  label: string
  /** Spearman rank correlation of the input's variate with the thin-layer forcing; null if the input did not vary. */
  rho: number | null
}

export interface UncertaintyResult {
  sample: string
  status: UncertaintyStatus
  draws: number
  requested_draws: number
  seed: number
  sampling: 'random' | 'latin-hypercube'
  precision: number
  min_draws: number
  wavelength_nm: number
  figures: UncertaintyFigureResult[]
  /** P(net forcing > 0) over the draws (sunlight + infrared), with its binomial standard error √(p(1−p)/n). */
  warming: ProbabilityEstimate
  sensitivity: { method: string; ranking: SensitivityEntry[] }
  inputs: UncertaintyInputResult[]
  notes: string[]
}

/** The plain calculation of the plan's sample (no perturbation) at the run's settings. */
export function centralFigures(plan: UncertaintyPlan, workspace = drawWorkspace()): Float64Array {
  completePlan(plan)
  const optics = plan.fixedOptics ?? drawOptics(plan, plan.sample, new Map(), workspace)
  const out = new Float64Array(N_OUT)
  recordFigures(optics, sampleForcingFigures(optics, plan.site), out, 0)
  return out
}

/** Summarises draws 0..n−1 (all of `block`, which must start at draw 0). */
export function summarizeDraws(plan: UncertaintyPlan, block: DrawBlock, status: UncertaintyStatus, central = centralFigures(plan)): UncertaintyResult {
  if (block.start !== 0) throw new InputError('uncertainty: summary', `the draws start at ${block.start}, not 0`, 'Summarise the merged draws from draw 0.')
  if (block.count < 1) throw new InputError('uncertainty: summary', 'no draws were made', 'Run at least one draw (the run may have been cancelled at once).')
  const nIn = plan.inputs.length
  const forcing = drawColumn(block, FORCING_INDEX, 'outputs', N_OUT)
  const figures = UNCERTAINTY_FIGURES.map((f, j) => ({ key: f.key, label: f.label, unit: f.unit, central: central[j], ...summarizeValues(drawColumn(block, j, 'outputs', N_OUT), `uncertainty: ${f.label}`) }))
  const inputs = plan.inputs.map((r, j) => ({ label: r.label, input: r.spec, variate: summarizeValues(drawColumn(block, j, 'inputs', nIn), `uncertainty: ${r.label}`) }))
  const ranking = plan.inputs
    .map((r, j) => ({ label: r.label, rho: spearmanRankCorrelation(drawColumn(block, j, 'inputs', nIn), forcing) }))
    .sort((a, b) => Math.abs(b.rho ?? -1) - Math.abs(a.rho ?? -1))
  const notes = [
    `Each draw: the sample's optics at ${UNCERTAINTY_WAVELENGTH_NM} nm (size integration to ${UNCERTAINTY_TOLERANCE} relative) and its forcing at the site, with the infrared part from the sample's band optics (4–40 µm); "net_toa", the thin-layer sunlight figure plus the infrared one, is the forcing the verdict, P(warm) and the ranking use.`,
    `Percentiles by linear interpolation between order statistics (Hyndman & Fan definition 7); sd with n − 1.`,
    plan.sampling === 'latin-hypercube'
      ? `Latin hypercube sampling: each input's range is cut into ${plan.draws} equally probable strata, each drawn exactly once (the run is not stopped early).`
      : `Simple random sampling; stops early once the standard error of P(warm) is below ${plan.precision} (checked after ${plan.minDraws} draws and then every ${UNCERTAINTY_CHECK_EVERY}).`
  ]
  if (status === 'cancelled') notes.push(`Cancelled after ${block.count} of ${plan.draws} draws: the figures are from those draws only.`)
  return {
    sample: plan.sample.name,
    status,
    draws: block.count,
    requested_draws: plan.draws,
    seed: plan.seed,
    sampling: plan.sampling,
    precision: plan.precision,
    min_draws: plan.minDraws,
    wavelength_nm: UNCERTAINTY_WAVELENGTH_NM,
    figures,
    warming: probabilityPositive(forcing),
    sensitivity: { method: 'Spearman rank correlation of each input with the net forcing (sunlight + infrared), sorted by |ρ|', ranking },
    inputs,
    notes
  }
}

/** Progress of a run: draws done so far, of at most `total`; return false to cancel. */
export type UncertaintyProgress = (p: { done: number; total: number }) => boolean | void

/**
 * Runs a whole uncertainty analysis in this thread, in chunks of CHECK_EVERY draws, calling `onProgress`
 * after each chunk (false cancels: the result then summarises the draws made, status "cancelled").
 */
export function runUncertainty(study: Study, sampleName: string, options: UncertaintyRunOptions = {}, onProgress?: UncertaintyProgress): UncertaintyResult {
  const plan = planUncertainty(study, sampleName, options)
  const ws = drawWorkspace()
  const blocks: DrawBlock[] = []
  let done = 0
  let status: UncertaintyStatus = 'completed'
  let merged: DrawBlock | null = null
  while (done < plan.draws) {
    const end = Math.min(plan.draws, done + UNCERTAINTY_CHECK_EVERY)
    blocks.push(computeDraws(plan, done, end, ws))
    done = end
    merged = mergeDrawBlocks(blocks, plan.inputs.length)
    const stop = earlyStopPoint(plan, merged)
    if (stop !== null) {
      merged = truncateBlock(merged, stop, plan.inputs.length)
      status = 'precision reached'
      break
    }
    if (onProgress && onProgress({ done, total: plan.draws }) === false) {
      status = done < plan.draws ? 'cancelled' : 'completed'
      break
    }
  }
  return summarizeDraws(plan, merged ?? mergeDrawBlocks(blocks, plan.inputs.length), status, centralFigures(plan, ws))
}

/** The first `count` draws of a block. */
export function truncateBlock(block: DrawBlock, count: number, nInputs: number): DrawBlock {
  const c = Math.min(count, block.count)
  return { start: block.start, count: c, inputs: block.inputs.subarray(0, c * nInputs), outputs: block.outputs.subarray(0, c * N_OUT) }
}
