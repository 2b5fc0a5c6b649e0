// Worker thread of `motebench uncertainty`: computes blocks of draws of one plan on request.
// Messages in: first { type: 'plan', study, sampleName, options, nominal } (the plan is rebuilt here from the study,
// planning being deterministic, with the main thread's optics of the unperturbed sample instead of computing them
// again), then { type: 'draws', start, end }. Out: { type: 'ready' } once planned, { type: 'block', start, count,
// inputs, outputs } (buffers transferred) or { type: 'error', ... }. It may be started before the main thread has
// read the study (workers/early.ts): it loads its modules meanwhile and waits for the plan.
import { parentPort } from 'node:worker_threads'
import { computeDraws, drawWorkspace, InputError, planUncertainty, type OpticsWorkspace, type SampleOptics, type Study, type UncertaintyPlan, type UncertaintyRunOptions } from '../../../src-core/index.ts'

export type ToUncertaintyWorker =
  | { type: 'plan'; study: Study; sampleName: string; options: UncertaintyRunOptions; nominal: SampleOptics }
  | { type: 'draws'; start: number; end: number }

const port = parentPort!
let plan: UncertaintyPlan | null = null
let ws: OpticsWorkspace | null = null

function fail(e: unknown): void {
  if (e instanceof InputError) port.postMessage({ type: 'error', input: true, where: e.where, fix: e.fix, message: e.message })
  else port.postMessage({ type: 'error', input: false, message: (e as Error)?.message ?? String(e) })
}

port.on('message', (m: ToUncertaintyWorker) => {
  try {
    if (m.type === 'plan') {
      plan = planUncertainty(m.study, m.sampleName, m.options, m.nominal)
      ws = drawWorkspace()
      port.postMessage({ type: 'ready' })
      return
    }
    if (m.type !== 'draws' || !plan || !ws) return
    const b = computeDraws(plan, m.start, m.end, ws)
    const inputs = b.inputs.slice()
    const outputs = b.outputs.slice()
    port.postMessage({ type: 'block', start: b.start, count: b.count, inputs, outputs }, [inputs.buffer, outputs.buffer])
  } catch (e) {
    fail(e)
  }
})
