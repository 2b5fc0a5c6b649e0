// Worker thread of `motebench uncertainty`: computes blocks of draws of one plan, taking them itself.
// Message in: { type: 'plan', study, sampleName, options, nominal, blocks, next, arrived } (the plan is rebuilt here
// from the study, planning being deterministic; `blocks` the run's blocks of draws as [start, end) pairs, `next` a
// shared counter of the blocks taken by any thread). `nominal` is the main thread's optics of the unperturbed
// sample, so that they are not computed again; where it is null they follow in a message { type: 'nominal',
// nominal }, after which the main thread sets `arrived` to 1: meanwhile the worker draws (computeDraws keeps each
// draw's forcing until they come) and looks for them between draws (receiveMessageOnPort). The worker takes
// blocks (Atomics.add on `next`) until none is left, without waiting for the main thread, which computes blocks
// too and reads messages only between its own. Out: { type: 'block', start, count, inputs, outputs } (buffers
// transferred) or { type: 'error', ... }. It may be started before the main thread has read the study
// (workers/early.ts): it loads its modules meanwhile and waits for the plan.
import { parentPort, receiveMessageOnPort } from 'node:worker_threads'
import { computeDraws, drawWorkspace, InputError, planUncertainty, type SampleOptics, type Study, type UncertaintyRunOptions } from '../../../src-core/index.ts'

export type ToUncertaintyWorker =
  | {
      type: 'plan'
      study: Study
      sampleName: string
      options: UncertaintyRunOptions
      /** The unperturbed sample's optics, or null: then they follow in a 'nominal' message. */
      nominal: SampleOptics | null
      /** Blocks of draws: start and end (exclusive) of block b at 2b and 2b + 1. */
      blocks: Int32Array
      /** One Int32 on a SharedArrayBuffer: the next block any thread may take. */
      next: Int32Array
      /** One Int32 on a SharedArrayBuffer: 1 once the 'nominal' message has been sent. */
      arrived: Int32Array
    }
  | { type: 'nominal'; nominal: SampleOptics }

const port = parentPort!

function fail(e: unknown): void {
  if (e instanceof InputError) port.postMessage({ type: 'error', input: true, where: e.where, fix: e.fix, message: e.message })
  else port.postMessage({ type: 'error', input: false, message: (e as Error)?.message ?? String(e) })
}

port.on('message', (m: ToUncertaintyWorker) => {
  if (m.type !== 'plan') return
  try {
    const plan = planUncertainty(m.study, m.sampleName, m.options, m.nominal ?? 'later')
    const arrived = m.arrived
    /** The 'nominal' message if it is here; with `wait`, waits for it (in steps, so that terminate() ends the wait). */
    const nominalFrom = (wait: boolean): SampleOptics | null => {
      for (;;) {
        const got = receiveMessageOnPort(port) as { message: ToUncertaintyWorker } | undefined
        if (got?.message.type === 'nominal') return got.message.nominal
        if (got) continue
        if (!wait) return null
        Atomics.wait(arrived, 0, 0, 50)
      }
    }
    const ws = drawWorkspace()
    const nBlocks = m.blocks.length / 2
    for (let b = Atomics.add(m.next, 0, 1); b < nBlocks; b = Atomics.add(m.next, 0, 1)) {
      const d = computeDraws(plan, m.blocks[2 * b], m.blocks[2 * b + 1], ws, undefined, nominalFrom)
      const inputs = d.inputs.slice()
      const outputs = d.outputs.slice()
      port.postMessage({ type: 'block', start: d.start, count: d.count, inputs, outputs }, [inputs.buffer, outputs.buffer])
    }
  } catch (e) {
    fail(e)
  }
})
