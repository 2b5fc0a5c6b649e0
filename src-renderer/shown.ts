// What the views show for each sample: its last good result, whether it is stale, and its line style.
import type { Sample, SampleResult } from '../src-core/index.ts'
import { affectsOptics, problemsOf, sampleKey } from './compute/client.ts'
import { lineStyle, type LineStyle } from './charts/palette.ts'
import type { AppState } from './state/store.ts'

export interface ShownSample {
  id: string
  index: number
  sample: Sample
  result?: SampleResult
  /** The result shown is from the current inputs (possibly the quick first pass). */
  current: boolean
  /**
   * The result shown is marked as not from the current inputs: a field is bad, the computation failed or
   * stopped, or its new figures have been waited for longer than a short grace (AppState.resultsLate).
   */
  stale: boolean
  /** Why there is no up-to-date result. */
  error?: string
  /** The result is from the current inputs but only the quick first pass (the full one is running). */
  preview: boolean
  style: LineStyle
}

export function sampleState(s: AppState, id: string, position = 0): ShownSample | null {
  const i = s.ids.indexOf(id)
  if (i < 0) return null
  const r = s.results[id]
  const blocked =
    problemsOf(s.problems, i).length > 0 || Object.keys(s.drafts).some((p) => affectsOptics(p) && !p.startsWith('samples[') || p.startsWith(`samples[${i}]`))
  const current = !!r?.result && !blocked && r.key === sampleKey(s.study, i) && !r.error
  const stale = !current && (!r?.result || blocked || !!r.error || s.resultsLate)
  return { id, index: i, sample: s.study.samples[i], result: r?.result, current, stale, error: r?.error, preview: current && !!r?.preview, style: lineStyle(position, s.theme) }
}

/**
 * How the results of the whole study stand, told the same way by the header, the result views, the charts and the
 * sample list: 'stale' as soon as an input needs attention or a sample's computation failed, or when no job runs
 * and a sample's shown results are marked stale (sampleState); 'ok' only when every sample's results are from its
 * current inputs and nothing is computing; else 'pending' (computing).
 */
export interface StudyStatus {
  state: 'ok' | 'stale' | 'pending'
  /** Fields that cannot be read and problems of the document (those that decide results). */
  inputs: number
  /** Names of the samples whose computation failed on their current inputs. */
  failed: string[]
}

export function studyStatus(s: AppState): StudyStatus {
  const inputs = Object.keys(s.drafts).filter(affectsOptics).length + s.problems.filter((p) => affectsOptics(p.path)).length
  const states = s.ids.map((id) => sampleState(s, id)).filter((x): x is ShownSample => x !== null)
  const failed = states.filter((x) => x.error && !x.current).map((x) => x.sample.name)
  // while a job runs, samples still waiting for their figures are pending (the header shows the progress), not stale
  const state = inputs > 0 || failed.length > 0 ? 'stale' : s.job.running ? 'pending' : states.every((x) => x.current) ? 'ok' : states.some((x) => x.stale) ? 'stale' : 'pending'
  return { state, inputs, failed }
}

/** The compared samples when 2 or more are marked, else the selected one. */
export function shownSamples(s: AppState): ShownSample[] {
  const ids = s.compare.length >= 2 ? s.compare : [s.selected]
  return ids.map((id, k) => sampleState(s, id, k)).filter((x): x is ShownSample => x !== null)
}

export const isComparing = (s: AppState): boolean => s.compare.length >= 2
