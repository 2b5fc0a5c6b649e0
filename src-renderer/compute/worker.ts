// The computing worker: all physics runs here, through src-core's public API only.
import {
  evaluateStudy,
  humidityGrowthCurve,
  sizeDistributionCurves,
  type SampleResult,
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
  // Two passes: every sample's optics and forcing first (posted as partial results), then the f(RH) curves,
  // which cost one more integration per humidity and would otherwise hold the figures back.
  const total = 2 * m.items.length
  post({ type: 'progress', job: m.job, done: 0, total })
  const partial = m.items.map((item, i) => {
    let r: SampleResult | undefined
    try {
      r = evaluateStudy(item.study, { skipHumidityCurve: true }).samples[0]
      post({ type: 'result', job: m.job, id: item.id, key: item.key, result: r, partial: true })
    } catch (err) {
      post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
    }
    post({ type: 'progress', job: m.job, done: i + 1, total })
    return r
  })
  m.items.forEach((item, i) => {
    const r = partial[i]
    if (r) {
      try {
        post({ type: 'result', job: m.job, id: item.id, key: item.key, result: { ...r, humidity: humidityGrowthCurve(item.study, 0) } })
      } catch (err) {
        post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
      }
    }
    post({ type: 'progress', job: m.job, done: m.items.length + i + 1, total })
  })
  post({ type: 'finished', job: m.job })
}
