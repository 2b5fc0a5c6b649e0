// The computing worker: all physics runs here, through src-core's public API only.
//
// One optics workspace lives as long as the worker, so its node cache carries every Mie evaluation from one
// edit to the next. Work goes in steps (a wavelength, a point of the f(RH) curve); between steps the worker
// lets messages in, and a newer job or a cancel stops the running one there.
import {
  humidityCurveSteps,
  OpticsWorkspace,
  sampleResultSteps,
  sizeDistributionCurves,
  type SampleResult,
  type Sample,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import type { SizeCurves } from '../state/store.ts'
import { PREVIEW_TOLERANCE, PREVIEW_WORTH_MS, type FromWorker, type ToWorker } from './messages.ts'

const post = (m: FromWorker): void => (self as unknown as Worker).postMessage(m)
const workspace = new OpticsWorkspace()
/** The newest job asked for; a running job that is not it stops at its next step. */
let newest = -1

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e)
}

/** The dry size distribution for the plot, from src-core. */
function sizeCurves(sample: Sample, users: UserMaterialSpec[]): SizeCurves {
  return sizeDistributionCurves(sample, { user_materials: users, wavelengths_nm: [550] })
}

/** Resolves on the next turn of the event loop, after any message already waiting. */
function pause(): Promise<void> {
  return new Promise((resolve) => {
    const channel = new MessageChannel()
    channel.port1.onmessage = () => {
      channel.port1.close()
      resolve()
    }
    channel.port2.postMessage(null)
  })
}

/** Runs stepped work to its end, or returns undefined once the job is no longer the newest. */
async function drive<T>(steps: Generator<void, T>, job: number): Promise<T | undefined> {
  for (;;) {
    const r = steps.next()
    if (r.done) return r.value
    await pause()
    if (job !== newest) return undefined
  }
}

async function evaluate(m: Extract<ToWorker, { type: 'evaluate' }>): Promise<void> {
  // Two passes: every sample's optics and forcing first (posted as partial results), then the f(RH) curves,
  // which cost one more integration per humidity and would otherwise hold the figures back.
  const total = 2 * m.items.length
  post({ type: 'progress', job: m.job, done: 0, total })
  const partial: (SampleResult | undefined)[] = []
  for (const [i, item] of m.items.entries()) {
    try {
      // a quick pass first; its nodes are kept, so the full pass costs only what it adds
      const started = performance.now()
      const quick = await drive(sampleResultSteps(item.study, 0, { skipHumidityCurve: true, workspace, tolerance: PREVIEW_TOLERANCE }), m.job)
      if (!job(m)) return
      if (quick && performance.now() - started > PREVIEW_WORTH_MS) post({ type: 'result', job: m.job, id: item.id, key: item.key, result: quick, partial: true, preview: true })
      const r = await drive(sampleResultSteps(item.study, 0, { skipHumidityCurve: true, workspace }), m.job)
      if (job(m) && r) post({ type: 'result', job: m.job, id: item.id, key: item.key, result: r, partial: true })
      partial.push(r)
    } catch (err) {
      post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
      partial.push(undefined)
    }
    if (!job(m)) return
    post({ type: 'progress', job: m.job, done: i + 1, total })
  }
  for (const [i, item] of m.items.entries()) {
    const r = partial[i]
    if (r) {
      try {
        const humidity = await drive(humidityCurveSteps(item.study, 0, workspace), m.job)
        if (!job(m) || !humidity) return
        post({ type: 'result', job: m.job, id: item.id, key: item.key, result: { ...r, humidity } })
      } catch (err) {
        post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
      }
    }
    post({ type: 'progress', job: m.job, done: m.items.length + i + 1, total })
  }
  post({ type: 'finished', job: m.job })
}

/** True while `m` is the newest job. */
const job = (m: { job: number }) => m.job === newest

self.onmessage = (e: MessageEvent<ToWorker>) => {
  const m = e.data
  if (m.type === 'sizes') {
    for (const item of m.items) {
      try {
        post({ type: 'sizes', job: m.job, id: item.id, curves: sizeCurves(item.sample, item.userMaterials) })
      } catch (err) {
        post({ type: 'sizes', job: m.job, id: item.id, error: message(err) })
      }
    }
    return
  }
  newest = m.job
  if (m.type === 'evaluate') void evaluate(m)
}
