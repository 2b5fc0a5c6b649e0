// State of the tool views (uncertainty, closure, instrument corrections): what was typed in the forms that are not
// part of the study document, and each run's progress and result. Kept for the session, by sample id.
import { useEffect, useState } from 'preact/hooks'
import type { ClosureResult, RebinResult, UncertaintyResult } from '../../src-core/index.ts'
import type { SampleIndex, ToolProblem, TruncationRow } from '../compute/toolMessages.ts'
import { createStore } from './store.ts'

export interface Run<R> {
  running: boolean
  done: number
  total: number
  /** Running P(warm) and its standard error (uncertainty runs). */
  warm?: number
  standardError?: number
  /** A cancel was asked for and the worker has not answered yet. */
  cancelling?: boolean
  result?: R
  problem?: ToolProblem
  /** The inputs the run was made from (the result is stale when they have changed). */
  key: string
  /** Said when a run was stopped without a result. */
  stopped?: string
}

export interface ClosureRow {
  wavelength: string
  sca: string
  scaSd: string
  abs: string
  absSd: string
  bsf: string
  bsfSd: string
}

export interface ClosureForm {
  rows: ClosureRow[]
  nLo: string
  nHi: string
  kLo: string
  kHi: string
}

export interface NephelometerForm {
  low: string
  high: string
  /** "angle:weight" pairs, blank for an ideal sin θ response. */
  response: string
  wavelengths: string
  /** Humidity inside the instrument, blank for the sample's. */
  rh: string
}

export interface CounterForm {
  edges: string
  wavelength: string
  low: string
  high: string
  indexFrom: 'sample' | 'typed'
  n: string
  k: string
  calN: string
  calK: string
}

export interface ToolsState {
  uncertainty: Record<string, Run<UncertaintyResult>>
  closure: Record<string, Run<{ fit: ClosureResult; own: SampleIndex[] }>>
  closureForms: Record<string, ClosureForm>
  truncation: Record<string, Run<TruncationRow[]>>
  rebin: Record<string, Run<RebinResult>>
  /** The sample's dry index at the counter's wavelength, by sample id. */
  sampleIndex: Record<string, { key: string; index?: SampleIndex; problem?: ToolProblem }>
  nephelometer: NephelometerForm
  counter: CounterForm
}

export const emptyClosureRow = (wavelength = ''): ClosureRow => ({ wavelength, sca: '', scaSd: '', abs: '', absSd: '', bsf: '', bsfSd: '' })

export const freshClosureForm = (): ClosureForm => ({ rows: [emptyClosureRow('550')], nLo: '1.3', nHi: '1.8', kLo: '0', kHi: '1' })

const tools = createStore<ToolsState>({
  uncertainty: {},
  closure: {},
  closureForms: {},
  truncation: {},
  rebin: {},
  sampleIndex: {},
  nephelometer: { low: '7', high: '170', response: '', wavelengths: '450, 550, 700', rh: '' },
  counter: {
    edges: '0.3, 0.4, 0.5, 0.65, 0.8, 1, 1.6, 2, 3, 5',
    wavelength: '633',
    low: '35',
    high: '120',
    indexFrom: 'sample',
    n: '1.53',
    k: '0.005',
    calN: '1.59',
    calK: '0'
  }
})

export const toolStore = () => tools

/** The tools state; the component re-renders on every change. */
export function useTools(): ToolsState {
  const [, setTick] = useState(0)
  useEffect(() => tools.subscribe(() => setTick((t) => t + 1)), [])
  return tools.get()
}

/** Changes one run record of a tool. */
export function setRun<K extends 'uncertainty' | 'closure' | 'truncation' | 'rebin'>(tool: K, id: string, patch: Partial<ToolsState[K][string]>): void {
  const all = tools.get()[tool] as Record<string, Run<unknown>>
  const old = all[id] ?? { running: false, done: 0, total: 0, key: '' }
  tools.set({ [tool]: { ...all, [id]: { ...old, ...patch } } } as Partial<ToolsState>)
}
