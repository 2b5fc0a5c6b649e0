// Worker thread of `motebench series`: given the series' setup (a message), integrates the bins' kernels once the
// layout comes, then turns each block of rows it is sent into CSV text (see series-row.ts) and posts it back with
// the block's number. It may be started before the main thread has read the study (workers/early.ts), with the
// command's arguments: it then reads the study and the file's first lines itself and integrates the kernels at once
// (series-guess.ts), and uses them only if the setup and layout it is sent are equal to what it guessed.
import { isDeepStrictEqual } from 'node:util'
import { parentPort, workerData } from 'node:worker_threads'
import { integrateGuess, type SeriesGuess } from '../series-guess.ts'
import { SeriesBlockComputer, type BinLayout, type BlockResult, type SeriesSetup } from '../series-row.ts'

export type ToWorker =
  | { type: 'setup'; setup: SeriesSetup }
  | { type: 'layout'; layout: BinLayout }
  | { type: 'block'; id: number; times: string[]; values: Float64Array; bins: number }
export type FromWorker = { type: 'ready' } | ({ type: 'block'; id: number } & BlockResult)
/** What a worker started early is given: the command's arguments, to guess its setup and layout from. */
export interface SeriesWorkerData {
  argv: string[]
}

const port = parentPort!
let guess: SeriesGuess | null = null
const data = workerData as SeriesWorkerData | undefined
// before any message is handled: the messages wait until the kernels are integrated
if (data?.argv) guess = integrateGuess(data.argv)
let computer: SeriesBlockComputer | null = null

port.on('message', (m: ToWorker) => {
  if (m.type === 'setup') {
    computer = new SeriesBlockComputer(m.setup)
    if (guess && !isDeepStrictEqual(m.setup, guess.setup)) guess = null
  } else if (!computer) throw new Error(`series worker: "${m.type}" before the setup`)
  else if (m.type === 'layout') {
    if (guess && isDeepStrictEqual(m.layout, guess.layout)) computer = guess.computer
    else computer.useLayout(m.layout)
    guess = null
  } else port.postMessage({ type: 'block', id: m.id, ...computer.block(m.times, m.values, m.bins) } satisfies FromWorker)
})
port.postMessage({ type: 'ready' } satisfies FromWorker)
