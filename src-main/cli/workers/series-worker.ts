// Worker thread of `motebench series`: computes the rows it is sent and posts their cells back, tagged by sequence number.
import { parentPort, workerData } from 'node:worker_threads'
import { InputError } from '../../../src-core/index.ts'
import { SeriesRowComputer, type BinLayout, type SeriesSetup } from '../series-row.ts'

export type ToWorker = { type: 'bins'; bins: BinLayout } | { type: 'rows'; rows: { seq: number; values: number[] }[] }
export type RowResult = { seq: number; ok: true; cells: number[] } | { seq: number; ok: false; where: string; message: string; fix: string; internal: boolean }
export type FromWorker = { type: 'results'; results: RowResult[] }

const port = parentPort!
const computer = new SeriesRowComputer(workerData as SeriesSetup)
let bins: BinLayout | undefined

port.on('message', (m: ToWorker) => {
  if (m.type === 'bins') {
    bins = m.bins
    return
  }
  const results: RowResult[] = []
  for (const row of m.rows) {
    try {
      if (!bins) throw new Error('rows arrived before the bin layout')
      results.push({ seq: row.seq, ok: true, cells: computer.cells(bins, row.values) })
    } catch (e) {
      if (e instanceof InputError) results.push({ seq: row.seq, ok: false, where: e.where, message: e.message, fix: e.fix, internal: false })
      else results.push({ seq: row.seq, ok: false, where: '', message: (e as Error)?.stack ?? String(e), fix: '', internal: true })
    }
  }
  port.postMessage({ type: 'results', results } satisfies FromWorker)
})
