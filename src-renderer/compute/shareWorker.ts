// A helper of the computing worker: the size integration of one sample at a share of the study's wavelengths,
// or at a share of the humidities of its f(RH) curve, with its own optics workspace (and node cache) kept across jobs.
import { humidityScatteringSteps, OpticsWorkspace, sampleBulkSteps } from '../../src-core/index.ts'
import { NODE_CACHE_LIMIT, type FromShareWorker, type ToShareWorker } from './messages.ts'
import { drive } from './steps.ts'

const post = (m: FromShareWorker): void => (self as unknown as Worker).postMessage(m)
const workspace = new OpticsWorkspace(NODE_CACHE_LIMIT)
let newest = -1

self.onmessage = async (e: MessageEvent<ToShareWorker>) => {
  const m = e.data
  newest = Math.max(newest, m.job)
  if (m.type === 'newest') return
  const live = () => m.job === newest
  try {
    if (m.type === 'share') {
      const bulk = await drive(sampleBulkSteps(m.study.samples[0], m.study, { only: m.only, tolerance: m.tolerance, coarsestStep: m.coarsestStep, workspace }), live)
      post({ type: 'share', request: m.request, bulk: bulk ?? null })
    } else {
      const sca = await drive(humidityScatteringSteps(m.study, 0, m.humidities, workspace), live)
      post({ type: 'humidity', request: m.request, sca: sca ?? null })
    }
  } catch (err) {
    post({ type: 'share-failed', request: m.request, message: err instanceof Error ? err.message : String(err) })
  }
}
