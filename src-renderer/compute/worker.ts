// The computing worker: all physics runs here, through src-core's public API only.
import {
  evaluateStudy,
  sizeDistributionCurves,
  type Sample,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import type { SizeCurves } from '../state/store.ts'
import type { FromWorker, ToWorker } from './messages.ts'

const post = (m: FromWorker): void => (self as unknown as Worker).postMessage(m)

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e)
}

/** The dry size distribution for the plot, from src-core. */
function sizeCurves(sample: Sample, users: UserMaterialSpec[]): SizeCurves {
  return sizeDistributionCurves(sample, { user_materials: users, wavelengths_nm: [550] })
}

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
  const total = m.items.length
  post({ type: 'progress', job: m.job, done: 0, total })
  m.items.forEach((item, i) => {
    try {
      const r = evaluateStudy(item.study)
      post({ type: 'result', job: m.job, id: item.id, key: item.key, result: r.samples[0] })
    } catch (err) {
      post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
    }
    post({ type: 'progress', job: m.job, done: i + 1, total })
  })
  post({ type: 'finished', job: m.job })
}
