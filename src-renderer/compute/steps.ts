// Running src-core's stepped computations inside a worker without shutting out its messages.
import { phaseFunctionWavelengthNm, sampleBulkSteps, type WavelengthBulk } from '../../src-core/compute.ts'

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

/**
 * Shares of the wavelengths for `threads` workers by each wavelength's measured cost (ms, from an earlier pass of the
 * same sample): the dearest first, each to the share with the least cost so far; the first share (the computing
 * worker's) starts with `ownExtra`, the work it does beside its wavelengths (the thermal-infrared bands). A
 * wavelength without a measured cost falls back on the λ⁻² shares.
 */
export function sharesByCost(wavelengthsNm: readonly number[], costs: ReadonlyMap<number, number>, threads: number, ownExtra = 0): number[][] {
  if (!wavelengthsNm.every((wl) => (costs.get(wl) ?? -1) >= 0)) return wavelengthShares(wavelengthsNm, threads)
  const shares: number[][] = Array.from({ length: Math.max(1, threads) }, () => [])
  const load = shares.map((_, k) => (k === 0 ? ownExtra : 0))
  for (const wl of [...wavelengthsNm].sort((a, b) => costs.get(b)! - costs.get(a)! || a - b)) {
    let k = 0
    for (let j = 1; j < load.length; j++) if (load[j] < load[k]) k = j
    shares[k].push(wl)
    load[k] += costs.get(wl)!
  }
  return shares
}

/**
 * sampleBulkSteps one wavelength at a time, each one's cost (ms of wall clock from its start to its end, the
 * worker's pauses between steps included) pushed to `costs` in the order of `options.only`. The figures are the same
 * as sampleBulkSteps's over all of them (each wavelength's integration is on its own).
 */
export function* timedBulkSteps(
  sample: Parameters<typeof sampleBulkSteps>[0],
  study: Parameters<typeof sampleBulkSteps>[1],
  options: Parameters<typeof sampleBulkSteps>[2] & { only: readonly number[] },
  costs: number[]
): Generator<void, WavelengthBulk[]> {
  const out: WavelengthBulk[] = []
  for (const wl of options.only) {
    const started = performance.now()
    out.push(...(yield* sampleBulkSteps(sample, study, { ...options, only: [wl] })))
    costs.push(performance.now() - started)
  }
  return out
}
