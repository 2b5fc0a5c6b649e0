// Running src-core's stepped computations inside a worker without shutting out its messages.
import { phaseFunctionWavelengthNm } from '../../src-core/compute.ts'

/** Resolves on the next turn of the event loop, after any message already waiting. */
export function pause(): Promise<void> {
  return new Promise((resolve) => {
    const channel = new MessageChannel()
    channel.port1.onmessage = () => {
      channel.port1.close()
      resolve()
    }
    channel.port2.postMessage(null)
  })
}

/**
 * How long stepped work runs between looks at the message queue (ms). src-core's computations pause every couple
 * of milliseconds of work; a look costs a turn of the event loop, so it is taken only once this much has passed.
 */
const SLICE_MS = 8

/** Runs stepped work to its end, or returns undefined once `current()` is false (a newer job came in). */
export async function drive<T>(steps: Generator<void, T>, current: () => boolean): Promise<T | undefined> {
  let looked = performance.now()
  for (;;) {
    const r = steps.next()
    if (r.done) return r.value
    if (performance.now() - looked < SLICE_MS) continue
    await pause()
    looked = performance.now()
    if (!current()) {
      // ends the generators (their finally blocks run: the size integration counts the nodes it cached)
      steps.return(undefined as T)
      return undefined
    }
  }
}

/**
 * Shares of the wavelengths for `threads` workers. The cost of a wavelength grows as it shortens (larger size
 * parameters: roughly as λ⁻²), and the wavelength that also carries the phase function and polarisation
 * (`phaseFunctionWavelengthNm`, 91 more angles) costs about twice its neighbours (1.8–2.3 times in the demo's
 * quick passes), so wavelengths go, shortest first, to the share with the least estimated cost. Counting the
 * phase-function wavelength twice brought the slower share of the demo's quick passes from 1.09–1.13 to
 * 1.02–1.05 times the best possible split (Node, per-wavelength times of each demo sample).
 * The same wavelengths always make the same shares, so each worker's node cache keeps serving its own.
 */
export function wavelengthShares(wavelengthsNm: readonly number[], threads: number): number[][] {
  const shares: number[][] = Array.from({ length: Math.max(1, threads) }, () => [])
  const load = shares.map(() => 0)
  const phase = wavelengthsNm.length ? phaseFunctionWavelengthNm(wavelengthsNm) : NaN
  for (const wl of [...wavelengthsNm].sort((a, b) => a - b)) {
    let k = 0
    for (let j = 1; j < load.length; j++) if (load[j] < load[k]) k = j
    shares[k].push(wl)
    load[k] += (wl === phase ? 2 : 1) / (wl * wl)
  }
  return shares
}
