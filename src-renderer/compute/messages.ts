// Messages between the UI and the computing worker.
import type { Sample, SampleResult, Study, UserMaterialSpec, WavelengthBulk } from '../../src-core/index.ts'
import type { SizeCurves } from '../state/store.ts'

export type ToWorker =
  /**
   * Evaluate each item's one-sample study in turn, reporting each result as it is done. `quick: false`: no quick
   * pass for this item (a sample not on screen; see EvaluateItem).
   */
  | { type: 'evaluate'; job: number; items: EvaluateItem[] }
  /** Size-distribution curves of samples (fast). */
  | { type: 'sizes'; job: number; items: { id: string; sample: Sample; userMaterials: UserMaterialSpec[] }[] }
  /** Stop the running evaluation at its next step (`job` is a new number that no evaluation carries). */
  | { type: 'cancel'; job: number }
  /**
   * Fill the node caches with a one-sample study's full pass and post nothing (a `warmed` message at the end):
   * sent when nothing else runs, dropped like any job when a newer one comes.
   */
  | { type: 'warm'; job: number; study: Study }
  /** Ports to the helpers the page started (sent once, before any job). */
  | { type: 'helpers'; ports: MessagePort[] }

/**
 * One sample of an evaluation. `quick` false leaves out the quick first pass: the page asks it for the samples of a
 * job of several that are not on screen (neither selected nor compared), whose quick figures nobody would see; their
 * full figures then come sooner (the quick pass costs the coastal demo sample about a sixth of its full pass, and
 * the figures' forcing and the page's drawing of them more).
 */
export interface EvaluateItem {
  id: string
  key: string
  study: Study
  quick?: boolean
}

export type FromWorker =
  /**
   * `partial`: the f(RH) curve is still to come (a second result for the same key follows). `preview`: figures
   * from a quick pass at PREVIEW_TOLERANCE, posted when the full computation will take a while.
   */
  | { type: 'result'; job: number; id: string; key: string; result: SampleResult; partial?: boolean; preview?: boolean }
  | { type: 'failed'; job: number; id: string; key: string; message: string }
  | { type: 'progress'; job: number; done: number; total: number }
  | { type: 'finished'; job: number }
  | { type: 'warmed'; job: number; ms: number }
  /** The curves of every sample of one `sizes` request, in one message (one update of the screen). */
  | { type: 'sizes'; job: number; curves: Record<string, SizeCurves | { error: string }> }

/**
 * The steps an evaluation of `items` samples reports progress in: each sample's optics, then each one's f(RH)
 * curve. The page shows the job's start with this total at once, so the worker's first report changes nothing.
 */
export const jobSteps = (items: number): number => 2 * items

/** Relative accuracy of the quick first pass whose figures are shown while the full one (1e-4) runs. */
export const PREVIEW_TOLERANCE = 1e-2
/**
 * The quick pass starts its size grid twice as coarse as the full one (whose nodes include all of its): on the
 * demo samples that halves its time and its figures stay within 2e-3 of the full ones.
 */
export const PREVIEW_COARSEST_STEP = 2
/**
 * The quick pass's figures are shown once this long (ms) has passed since the sample's computation began and the
 * full figures are not there yet: at once if the quick pass itself took longer, else when this time is up.
 */
export const PREVIEW_WORTH_MS = 40

/**
 * From the computing worker to its helpers, through the port the page gave each helper (its first message, with the
 * port and no data): compute a one-sample study at `only` (a share of its wavelengths).
 */
export type ToShareWorker =
  | { type: 'share'; job: number; request: number; study: Study; only: number[]; tolerance?: number; coarsestStep?: number }
  /** σsca at 550 nm at these humidities (points of the f(RH) curve). */
  | { type: 'humidity'; job: number; request: number; study: Study; humidities: number[] }
  /** A newer job: drop anything older at its next step. */
  | { type: 'newest'; job: number }

/** `bulk` and `sca` are null when the job was dropped for a newer one. */
export type FromShareWorker =
  | { type: 'share'; request: number; bulk: WavelengthBulk[] | null }
  | { type: 'humidity'; request: number; sca: number[] | null }
  | { type: 'share-failed'; request: number; message: string }

/** The computing workers: the optics worker and one helper per further processor, at most three. */
export const COMPUTE_THREADS = 1 + Math.max(0, Math.min(3, ((typeof navigator === 'undefined' ? 1 : navigator.hardwareConcurrency) || 1) - 1))

/**
 * Nodes the computing workers keep in all (src-core's node cache), shared equally among them: each worker
 * computes a fixed share of the wavelengths, so each needs its share of the nodes. The demo study with its f(RH)
 * curves makes 263 000 nodes; after a humidity edit the coastal sample alone makes 130 000 more, so with room for
 * 150 000 a worker (two workers, as before) the nodes of the samples not being edited were soon dropped and a
 * later edit of their amounts had to compute them again. Measured in Node 20: 150 bytes of typed arrays a node
 * (263 000 nodes in 39 MB), so this is about 90 MB in all.
 */
const NODE_CACHE_TOTAL = 600_000
export const NODE_CACHE_LIMIT = Math.round(NODE_CACHE_TOTAL / COMPUTE_THREADS)
