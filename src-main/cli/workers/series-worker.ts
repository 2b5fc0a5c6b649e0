// Worker thread of `motebench series`: computes the rows it is sent and posts their cells back, tagged by sequence number.
import { parentPort, workerData } from 'node:worker_threads'
import { computeRow, SeriesRowComputer, type BinLayout, type RowResult, type SeriesSetup } from '../series-row.ts'

export type ToWorker = { type: 'bins'; bins: BinLayout } | { type: 'rows'; rows: { seq: number; values: number[] }[] }
export type { RowResult }
export type FromWorker = { type: 'ready' } | { type: 'results'; results: RowResult[] }

const port = parentPort!
const computer = new SeriesRowComputer(workerData as SeriesSetup)
let bins: BinLayout | undefined

port.on('message', (m: ToWorker) => {
  if (m.type === 'bins') {
    bins = m.bins
    return
  }
  const results = m.rows.map((row) => computeRow(computer, bins, row.seq, row.values))
  port.postMessage({ type: 'results', results } satisfies FromWorker)
})
port.postMessage({ type: 'ready' } satisfies FromWorker)
