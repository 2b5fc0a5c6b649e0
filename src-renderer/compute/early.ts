// The computing workers, started by a small script of their own (index.html loads it before the page's bundle), so
// that their scripts load and compile while the browser is still fetching and compiling the page's; the page's
// compute client (client.ts) takes them over when it first needs them.
import { COMPUTE_THREADS, type ToWorker } from './messages.ts'

export interface ComputeWorkers {
  optics: Worker
  helpers: Worker[]
}

/**
 * The optics worker and its helpers, all started at once (a helper started by the optics worker itself would
 * begin loading only once that worker had loaded), each helper joined to it by a port.
 */
function startWorkers(): ComputeWorkers {
  const optics = new Worker(new URL('./worker.ts', import.meta.url), { type: 'module', name: 'motebench-compute' })
  const helpers = Array.from({ length: COMPUTE_THREADS - 1 }, (_, i) => new Worker(new URL('./shareWorker.ts', import.meta.url), { type: 'module', name: `motebench-share-${i + 1}` }))
  const ports = helpers.map((helper) => {
    const channel = new MessageChannel()
    helper.postMessage(null, [channel.port1])
    return channel.port2
  })
  optics.postMessage({ type: 'helpers', ports } satisfies ToWorker, ports)
  return { optics, helpers }
}

let early: ComputeWorkers | null = startWorkers()

/** The workers started when this script ran, the first time; fresh ones after (when the first have stopped). */
export function takeWorkers(): ComputeWorkers {
  const w = early ?? startWorkers()
  early = null
  return w
}
