// Worker thread of `motebench uncertainty`: computes blocks of draws of one plan on request.
// Messages in: { type: 'draws', start, end }. Out: { type: 'block', start, count, inputs, outputs } (buffers
// transferred) or { type: 'error', ... }. The plan is rebuilt here from the study (planning is deterministic).
import { parentPort, workerData } from 'node:worker_threads'
import { computeDraws, drawWorkspace, InputError, planUncertainty, type Study, type UncertaintyRunOptions } from '../../../src-core/index.ts'

const port = parentPort!
const data = workerData as { study: Study; sampleName: string; options: UncertaintyRunOptions }

function fail(e: unknown): void {
  if (e instanceof InputError) port.postMessage({ type: 'error', input: true, where: e.where, fix: e.fix, message: e.message })
  else port.postMessage({ type: 'error', input: false, message: (e as Error)?.message ?? String(e) })
}

try {
  const plan = planUncertainty(data.study, data.sampleName, data.options)
  const ws = drawWorkspace()
  port.on('message', (m: { type: string; start: number; end: number }) => {
    if (m.type !== 'draws') return
    try {
      const b = computeDraws(plan, m.start, m.end, ws)
      const inputs = b.inputs.slice()
      const outputs = b.outputs.slice()
      port.postMessage({ type: 'block', start: b.start, count: b.count, inputs, outputs }, [inputs.buffer, outputs.buffer])
    } catch (e) {
      fail(e)
    }
  })
  port.postMessage({ type: 'ready' })
} catch (e) {
  fail(e)
}
