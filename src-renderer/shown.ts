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
  /** The result shown is not from the current inputs (an edit is pending, running, or a field is bad). */
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
  const stale = !r?.result || blocked || r.key !== sampleKey(s.study, i) || !!r.error
  return { id, index: i, sample: s.study.samples[i], result: r?.result, stale, error: r?.error, preview: !stale && !!r?.preview, style: lineStyle(position, s.theme) }
}

/** The compared samples when 2 or more are marked, else the selected one. */
export function shownSamples(s: AppState): ShownSample[] {
  const ids = s.compare.length >= 2 ? s.compare : [s.selected]
  return ids.map((id, k) => sampleState(s, id, k)).filter((x): x is ShownSample => x !== null)
}

export const isComparing = (s: AppState): boolean => s.compare.length >= 2
