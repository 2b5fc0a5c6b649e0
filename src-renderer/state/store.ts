// The application state: the open study (the document), its undo history, what is shown, and the results.
// One small store with subscribe/get/set; components read it with useApp().
import { useEffect, useState } from 'preact/hooks'
import type { SampleResult, Study, StudyProblem } from '../../src-core/index.ts'
import type { Theme } from '../charts/palette.ts'

/** The views of the results area, by what they show. */
export type ViewName = 'optics' | 'angles' | 'humidity' | 'climate' | 'compare' | 'record' | 'uncertainty' | 'closure' | 'instruments'

export interface Snapshot {
  study: Study
  /** Stable ids of the samples, parallel to study.samples (selection and results follow samples when they move). */
  ids: string[]
}

/** What is on screen for a sample: the last good result and the inputs it was computed from. */
export interface ShownResult {
  key: string
  result?: SampleResult
  /** Why the newest inputs gave no result (the older result, if any, stays and is marked stale). */
  error?: string
  /** The figures are from the quick first pass; the full computation is still running (or was stopped). */
  preview?: boolean
  /** The full figures, their f(RH) curve still to come (or stopped before it came). */
  partial?: boolean
}

/** Size-distribution curves of one sample, for the plot. */
export interface SizeCurves {
  diameter_um: number[]
  number: number[]
  surface: number[]
  volume: number[]
  /** Measured bins are drawn as steps. */
  measured: boolean
}

export interface AppState extends Snapshot {
  file: { name: string; path?: string } | null
  dirty: boolean
  /** Nothing has been done in this window yet (the desktop may open a file into it). */
  pristine: boolean
  past: Snapshot[]
  future: Snapshot[]
  selected: string
  /** Samples marked for comparison (2–6 to compare). */
  compare: string[]
  view: ViewName
  theme: Theme
  /** Fields whose text could not be read, by field path: the reason. */
  drafts: Record<string, string>
  /** Problems of the study document as it stands. */
  problems: StudyProblem[]
  results: Record<string, ShownResult>
  sizes: Record<string, SizeCurves | { error: string }>
  job: { running: boolean; done: number; total: number }
  /**
   * Results not yet brought up to date by the computation are marked stale (false for a short grace after each
   * change of the inputs, see STALE_GRACE_MS; bad inputs and failures are marked at once).
   */
  resultsLate: boolean
  toast: { text: string; undo: boolean } | null
  notice: { kind: 'error' | 'info'; title: string; lines: string[] } | null
  cautionsOpen: boolean
  reportOpen: boolean
  /** Which size moment the distribution plot shows. */
  sizeMoment: 'number' | 'surface' | 'volume'
}

type Listener = () => void

export function createStore<T extends object>(initial: T) {
  let state = initial
  const listeners = new Set<Listener>()
  return {
    get: (): T => state,
    set(patch: Partial<T> | ((s: T) => Partial<T>)): void {
      const p = typeof patch === 'function' ? patch(state) : patch
      state = { ...state, ...p }
      for (const l of [...listeners]) l()
    },
    subscribe(l: Listener): () => void {
      listeners.add(l)
      return () => listeners.delete(l)
    }
  }
}

export type Store = ReturnType<typeof createStore<AppState>>

let theStore: Store | null = null

export function setStore(s: Store): void {
  theStore = s
}

export function store(): Store {
  if (!theStore) throw new Error('the store is not set up')
  return theStore
}

/** The app state; the component re-renders on every change. */
export function useApp(): AppState {
  const s = store()
  const [, setTick] = useState(0)
  useEffect(() => s.subscribe(() => setTick((t) => t + 1)), [s])
  return s.get()
}

let idCounter = 0
export const newId = (): string => `s${Date.now().toString(36)}${(++idCounter).toString(36)}`
