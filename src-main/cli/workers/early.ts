// Worker threads started by main.ts before a command's own code has loaded, so that a worker loads its modules
// (a few hundred milliseconds) while this thread loads the command's and reads its input. They are unreferenced
// (they do not keep the process alive) until the command takes them; main.ts ends those it did not take.
import type { Worker } from 'node:worker_threads'
import { startCliWorker, type CliWorker } from './start.ts'

interface Early {
  name: CliWorker
  worker: Worker
  /** An error or exit before the command took the worker (no listener of its own yet). */
  failure: Error | null
}

const started: Early[] = []

/** Starts `count` workers of `name` (without data: the command sends what they need when it takes them). */
export function startEarly(name: CliWorker, count: number): void {
  for (let k = 0; k < count; k++) {
    const e: Early = { name, worker: startCliWorker(name, undefined), failure: null }
    e.worker.unref()
    e.worker.on('error', (err) => (e.failure ??= err))
    e.worker.on('exit', (code) => (e.failure ??= new Error(`${name} stopped with exit code ${code} before it was used`)))
    started.push(e)
  }
}

/**
 * Up to `count` of the workers of `name` started early, referenced again (they keep the process alive while in
 * use); a failure before now is thrown. The command attaches its own listeners.
 */
export function takeEarly(name: CliWorker, count: number): Worker[] {
  const out: Worker[] = []
  for (let i = 0; i < started.length && out.length < count; ) {
    const e = started[i]
    if (e.name !== name) {
      i++
      continue
    }
    started.splice(i, 1)
    if (e.failure) {
      void e.worker.terminate()
      throw e.failure
    }
    e.worker.removeAllListeners('error')
    e.worker.removeAllListeners('exit')
    e.worker.ref()
    out.push(e.worker)
  }
  return out
}

/** Ends the workers started early that no command took. */
export function dropEarly(): void {
  for (const e of started.splice(0)) void e.worker.terminate()
}
