// Worker thread of `motebench series`: given the series' setup (a message, or workerData), integrates the bins'
// kernels once the layout comes (or reads those an earlier run kept, and says which: kernel-cache.ts), then turns
// each block of rows it is sent into CSV text (see series-row.ts) and posts it back with the block's number. It may
// be started before the main thread has read the study (workers/early.ts): it loads its modules meanwhile and waits
// for the setup.
import { parentPort, workerData } from 'node:worker_threads'
import { SeriesBlockComputer, type BinLayout, type BlockResult, type SeriesSetup } from '../series-row.ts'
import type { KernelSource } from '../kernel-cache.ts'

export type ToWorker =
  | { type: 'setup'; setup: SeriesSetup }
  | { type: 'layout'; layout: BinLayout }
  | { type: 'block'; id: number; times: string[]; values: Float64Array; bins: number }
export type FromWorker = { type: 'ready' } | { type: 'kernels'; source: KernelSource } | ({ type: 'block'; id: number } & BlockResult)

const port = parentPort!
let computer = workerData ? new SeriesBlockComputer(workerData as SeriesSetup) : null

port.on('message', (m: ToWorker) => {
  if (m.type === 'setup') computer = new SeriesBlockComputer(m.setup)
  else if (!computer) throw new Error(`series worker: "${m.type}" before the setup`)
  else if (m.type === 'layout') {
    computer.useLayout(m.layout)
    if (computer.kernelSource) port.postMessage({ type: 'kernels', source: computer.kernelSource } satisfies FromWorker)
  }
  else port.postMessage({ type: 'block', id: m.id, ...computer.block(m.times, m.values, m.bins) } satisfies FromWorker)
})
port.postMessage({ type: 'ready' } satisfies FromWorker)
