// Worker thread of `motebench series`: integrates the bins' kernels once, then turns each block of rows it is sent
// into CSV text (see series-row.ts) and posts it back with the block's number.
import { parentPort, workerData } from 'node:worker_threads'
import { SeriesBlockComputer, type BinLayout, type BlockResult, type SeriesSetup } from '../series-row.ts'

export type ToWorker = { type: 'layout'; layout: BinLayout } | { type: 'block'; id: number; times: string[]; values: Float64Array; bins: number }
export type FromWorker = { type: 'ready' } | ({ type: 'block'; id: number } & BlockResult)

const port = parentPort!
const computer = new SeriesBlockComputer(workerData as SeriesSetup)

port.on('message', (m: ToWorker) => {
  if (m.type === 'layout') computer.useLayout(m.layout)
  else port.postMessage({ type: 'block', id: m.id, ...computer.block(m.times, m.values, m.bins) } satisfies FromWorker)
})
port.postMessage({ type: 'ready' } satisfies FromWorker)
