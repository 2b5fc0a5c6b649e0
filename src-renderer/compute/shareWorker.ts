// A helper of the computing worker: the size integration of one sample at a share of the study's wavelengths,
// or at a share of the humidities of its f(RH) curve, with its own optics workspace (and node cache) kept across jobs.
// The page starts it and sends it a port to the computing worker, which is where its work comes from.
import { humidityScatteringSteps, loadExpressionCompiler, needsExpressionCompiler, OpticsWorkspace, sampleBulkSteps } from '../../src-core/compute.ts'
import { NODE_CACHE_LIMIT, type FromShareWorker, type ToShareWorker } from './messages.ts'
import { drive } from './steps.ts'

const workspace = new OpticsWorkspace(NODE_CACHE_LIMIT)
let newest = -1

self.onmessage = (e: MessageEvent) => {
  const port = e.ports[0]
  if (!port) return
  const post = (m: FromShareWorker): void => port.postMessage(m)
  port.onmessage = (e: MessageEvent<ToShareWorker>) => void work(e.data, post)
}

async function work(m: ToShareWorker, post: (m: FromShareWorker) => void): Promise<void> {
  newest = Math.max(newest, m.job)
  if (m.type === 'newest') return
  const live = () => m.job === newest
  try {
    if (needsExpressionCompiler(m.study)) await loadExpressionCompiler()
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
