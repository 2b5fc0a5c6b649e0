// Runs the tools in their own workers: one worker per tool, one run per tool at a time (a new run supersedes the
// running one). Uncertainty runs stop on request and report the draws made; the others are stopped by ending
// their worker.
import type { Study } from '../../src-core/index.ts'
import { setRun, toolStore } from '../state/tools.ts'
import type { FromTools, ToTools } from './toolMessages.ts'

type ToolName = 'uncertainty' | 'closure' | 'truncation' | 'rebin' | 'index'

interface Slot {
  worker: Worker | null
  /** The run in progress and the sample it is for. */
  run: number
  id: string
}

const slots: Record<ToolName, Slot> = {
  uncertainty: { worker: null, run: 0, id: '' },
  closure: { worker: null, run: 0, id: '' },
  truncation: { worker: null, run: 0, id: '' },
  rebin: { worker: null, run: 0, id: '' },
  index: { worker: null, run: 0, id: '' }
}
let runCounter = 0
let cancelTimer: ReturnType<typeof setTimeout> | undefined

/** How long an uncertainty run may take to answer a cancel before its worker is ended. */
const CANCEL_GRACE_MS = 4000

function workerFor(tool: ToolName): Worker {
  const slot = slots[tool]
  if (slot.worker) return slot.worker
  const w = new Worker(new URL('./toolsWorker.ts', import.meta.url), { type: 'module', name: `motebench-${tool}` })
  w.onmessage = (e: MessageEvent<FromTools>) => onMessage(tool, e.data)
  w.onerror = (e) => {
    e.preventDefault()
    const id = slot.id
    slot.worker = null
    w.terminate()
    if (tool !== 'index') setRun(tool, id, { running: false, problem: { where: 'computation', message: e.message || 'the worker stopped', fix: 'Run it again; if it fails again, check the inputs.' } })
  }
  slot.worker = w
  return w
}

function stopWorker(tool: ToolName): void {
  const slot = slots[tool]
  slot.worker?.terminate()
  slot.worker = null
}

function onMessage(tool: ToolName, m: FromTools): void {
  const slot = slots[tool]
  if (m.run !== slot.run) return
  const id = slot.id
  if (tool === 'index') {
    const all = toolStore().get().sampleIndex
    const key = all[id]?.key ?? ''
    if (m.type === 'sample-index') toolStore().set({ sampleIndex: { ...all, [id]: { key, index: m.indices[0] } } })
    else if (m.type === 'failed') toolStore().set({ sampleIndex: { ...all, [id]: { key, problem: m.problem } } })
    return
  }
  if (m.type === 'progress') {
    setRun(tool, id, { done: m.done, total: m.total, warm: m.warm, standardError: m.standardError })
    return
  }
  if (tool === 'uncertainty') clearTimeout(cancelTimer)
  if (m.type === 'failed') setRun(tool, id, { running: false, cancelling: false, problem: m.problem })
  else if (m.type === 'uncertainty') setRun('uncertainty', id, { running: false, cancelling: false, result: m.result, problem: undefined })
  else if (m.type === 'closure') setRun('closure', id, { running: false, result: { fit: m.result, own: m.own }, problem: undefined })
  else if (m.type === 'truncation') setRun('truncation', id, { running: false, result: m.rows, problem: undefined })
  else if (m.type === 'rebin') setRun('rebin', id, { running: false, result: m.result, problem: undefined })
}

/** Starts a run of a tool for sample `id`; a run of the same tool still going is stopped first. */
function start(tool: Exclude<ToolName, 'index'>, id: string, key: string, message: (run: number) => ToTools): void {
  const slot = slots[tool]
  const previous = toolStore().get()[tool][slot.id]
  if (previous?.running) {
    stopWorker(tool)
    if (slot.id !== id) setRun(tool, slot.id, { running: false, cancelling: false, stopped: 'Stopped: a run for another sample took its place.' })
  }
  const run = ++runCounter
  slot.run = run
  slot.id = id
  setRun(tool, id, { running: true, cancelling: false, done: 0, total: 0, warm: undefined, standardError: undefined, key, problem: undefined, stopped: undefined })
  workerFor(tool).postMessage(message(run))
}

/** Stops a tool's run (uncertainty: keeps the draws made so far). */
export function stopRun(tool: Exclude<ToolName, 'index'>): void {
  const slot = slots[tool]
  const id = slot.id
  const current = toolStore().get()[tool][id]
  if (!current?.running) return
  if (tool === 'uncertainty' && slot.worker) {
    setRun('uncertainty', id, { cancelling: true })
    slot.worker.postMessage({ type: 'cancel', run: slot.run } satisfies ToTools)
    clearTimeout(cancelTimer)
    cancelTimer = setTimeout(() => {
      if (toolStore().get().uncertainty[id]?.running) {
        stopWorker('uncertainty')
        slot.run = ++runCounter
        setRun('uncertainty', id, { running: false, cancelling: false, stopped: 'Stopped before the worker could report its draws.' })
      }
    }, CANCEL_GRACE_MS)
    return
  }
  stopWorker(tool)
  slot.run = ++runCounter
  setRun(tool, id, { running: false, stopped: 'Stopped before it finished; no result.' })
}

export function runUncertaintyFor(id: string, study: Study, sample: string, key: string): void {
  start('uncertainty', id, key, (run) => ({ type: 'uncertainty', run, study, sample }))
}

export function runClosureFor(id: string, key: string, m: Omit<Extract<ToTools, { type: 'closure' }>, 'run' | 'type'>): void {
  start('closure', id, key, (run) => ({ type: 'closure', run, ...m }))
}

export function runTruncationFor(id: string, key: string, m: Omit<Extract<ToTools, { type: 'truncation' }>, 'run' | 'type'>): void {
  start('truncation', id, key, (run) => ({ type: 'truncation', run, ...m }))
}

export function runRebinFor(id: string, key: string, m: Omit<Extract<ToTools, { type: 'rebin' }>, 'run' | 'type'>): void {
  start('rebin', id, key, (run) => ({ type: 'rebin', run, ...m }))
}

/** Asks for a sample's dry index at one wavelength (quick), unless it is known for these inputs. */
export function askSampleIndex(id: string, key: string, m: Omit<Extract<ToTools, { type: 'sample-index' }>, 'run' | 'type'>): void {
  const all = toolStore().get().sampleIndex
  const slot = slots.index
  const known = all[id]
  if (known?.key === key && (known.index || known.problem || slot.id === id)) return
  const run = ++runCounter
  slot.run = run
  slot.id = id
  toolStore().set({ sampleIndex: { ...all, [id]: { key } } })
  workerFor('index').postMessage({ type: 'sample-index', run, ...m } satisfies ToTools)
}
