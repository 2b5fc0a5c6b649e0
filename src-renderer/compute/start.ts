// Starting the optics worker and its helpers. The page's entry (boot.ts) starts them before the page's own bundle
// has loaded, so they load their scripts while the page loads and draws itself. Started from the bundle (as the
// first job was posted), they began to load only once the page's thread was free again: a worker's start needs
// turns of that thread, and its first render and the charts' set-up held it for 0.3-0.6 s.
import { COMPUTE_THREADS, type ToWorker } from './messages.ts'

export interface OpticsWorkers {
  worker: Worker
  /** One per further processor, each joined to the worker by a port. */
  helpers: Worker[]
  /** What stopped one of them before the page listened (a script that failed to load), else null. */
  failed: () => string | null
}

/**
 * The optics worker and its helpers, all started at once (a helper started by the optics worker itself would
 * begin loading only once that worker had loaded), each helper joined to it by a port.
 */
export function startWorkers(): OpticsWorkers {
  const worker = new Worker(new URL('./worker.ts', import.meta.url), { type: 'module', name: 'motebench-compute' })
  const helpers = Array.from({ length: COMPUTE_THREADS - 1 }, (_, i) => new Worker(new URL('./shareWorker.ts', import.meta.url), { type: 'module', name: `motebench-share-${i + 1}` }))
  const ports = helpers.map((helper) => {
    const channel = new MessageChannel()
    helper.postMessage(null, [channel.port1])
    return channel.port2
  })
  worker.postMessage({ type: 'helpers', ports } satisfies ToWorker, ports)
  // until the page sets its own handler, an error is kept to be told then
  let failure: string | null = null
  worker.onerror = (e) => {
    failure ??= e.message || 'the computing worker could not start'
  }
  return { worker, helpers, failed: () => failure }
}

let early: OpticsWorkers | null = null

/** Starts the workers now, for the page's first job to take. */
export function startWorkersEarly(): void {
  early ??= startWorkers()
}

/** The workers started early, once (null after that, or if none were: the page then starts its own). */
export function takeEarlyWorkers(): OpticsWorkers | null {
  const w = early
  early = null
  return w
}
