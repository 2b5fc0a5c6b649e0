// The computing worker: all physics runs here and in its helpers, through src-core's public API only (its
// computing entry, compute.ts; the build leaves mathjs out of these two workers, vite.shared.ts: their scripts are a
// sixth of the size, so they start sooner).
//
// Each optics workspace lives as long as its worker, so its node cache carries every Mie evaluation from one
// edit to the next. A sample's wavelengths are shared between this worker and its helpers (one per further
// processor, at most three; the page starts them beside this one and hands over a port to each, so that all
// start at once), always the same wavelengths to the same worker. Work goes in steps (a wavelength, a
// point of the f(RH) curve); between steps the workers let messages in, and a newer job or a cancel stops the
// running one there.
import {
  assembleSampleOptics,
  HUMIDITY_CURVE_RH,
  humidityCurveFrom,
  humidityCurveKey,
  humidityScatteringSteps,
  loadExpressionCompiler,
  needsExpressionCompiler,
  OpticsWorkspace,
  sampleBulkSteps,
  sampleLongwaveSteps,
  sampleResultFromOptics,
  sizeDistributionCurves,
  type HumidityGrowthCurve,
  type SampleOptics,
  type SampleResult,
  type Sample,
  type Study,
  type UserMaterialSpec,
  type WavelengthBulk
} from '../../src-core/compute.ts'
import type { SizeCurves } from '../state/store.ts'
import { jobSteps, NODE_CACHE_LIMIT, PREVIEW_COARSEST_STEP, PREVIEW_TOLERANCE, PREVIEW_WORTH_MS, type EvaluateItem, type FromShareWorker, type FromWorker, type ToShareWorker, type ToWorker } from './messages.ts'
import { drive, wavelengthShares } from './steps.ts'

const post = (m: FromWorker): void => (self as unknown as Worker).postMessage(m)
const workspace = new OpticsWorkspace(NODE_CACHE_LIMIT)
/** The newest job asked for; a running job that is not it stops at its next step. */
let newest = -1

/** Ports to the helpers, handed over by the page before the first job (none on a one-processor machine). */
let helpers: MessagePort[] = []
let request = 0
const waiting = new Map<number, { resolve: (answer: unknown) => void; reject: (e: Error) => void }>()

function takeHelpers(ports: readonly MessagePort[]): void {
  helpers = ports.map((port) => {
    port.onmessage = (e: MessageEvent<FromShareWorker>) => {
      const m = e.data
      const p = waiting.get(m.request)
      if (!p) return
      waiting.delete(m.request)
      if (m.type === 'share') p.resolve(m.bulk)
      else if (m.type === 'humidity') p.resolve(m.sca)
      else p.reject(new Error(m.message))
    }
    return port
  })
}

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e)
}

/** The dry size distribution for the plot, from src-core. */
function sizeCurves(sample: Sample, users: UserMaterialSpec[]): SizeCurves {
  return sizeDistributionCurves(sample, { user_materials: users, wavelengths_nm: [550] })
}

/**
 * After posting quick figures this worker starts its own share of the full pass this much later (ms), leaving a
 * processor to the page to draw them (the helpers start theirs at once).
 */
const DISPLAY_HOLD_MS = 20

/** True while `job` is the newest. */
const current = (job: number) => () => job === newest

/** A request to a helper before it is numbered. */
type Unsent<T> = T extends unknown ? Omit<T, 'request'> : never

/** Sends a request to a helper; its answer (null if the job was dropped) or its failure. */
function ask<T>(w: MessagePort, m: Unsent<Extract<ToShareWorker, { request: number }>>): Promise<T | null> {
  const id = ++request
  const answer = new Promise<T | null>((resolve, reject) => waiting.set(id, { resolve: resolve as (a: unknown) => void, reject }))
  // a failure of this worker's own share leaves the helpers' answers unread: they must not count as unhandled
  answer.catch(() => {})
  w.postMessage({ ...m, request: id } as ToShareWorker)
  return answer
}

/** This worker's share of stepped work and the helpers' shares (from `theirs`), or undefined if the job was dropped. */
async function together<M, T>(mine: Generator<void, M>, theirs: Promise<T | null>[], job: number): Promise<{ mine: M; theirs: T[] } | undefined> {
  const own = await drive(mine, current(job))
  const settled = await Promise.allSettled(theirs)
  const failed = settled.find((s) => s.status === 'rejected')
  if (failed) throw failed.reason
  const rest = settled.map((s) => (s.status === 'fulfilled' ? s.value : null))
  if (own === undefined || job !== newest || rest.some((r) => r === null)) return undefined
  return { mine: own, theirs: rest as T[] }
}

/** A one-sample study's optics, full or quick, its wavelengths shared with the helpers. */
async function sampleOptics(study: Study, quick: boolean, job: number, holdMs = 0): Promise<SampleOptics | undefined> {
  const shares = wavelengthShares(study.wavelengths_nm, helpers.length + 1)
  const grid = quick ? { tolerance: PREVIEW_TOLERANCE, coarsestStep: PREVIEW_COARSEST_STEP } : {}
  const theirs = helpers.map((w, k) => (shares[k + 1].length ? ask<WavelengthBulk[]>(w, { type: 'share', job, study, only: shares[k + 1], ...grid }) : Promise.resolve([])))
  if (holdMs > 0) await new Promise((resolve) => setTimeout(resolve, holdMs))
  const parts = await together(ownShare(study, shares[0], grid), theirs, job)
  if (!parts) return undefined
  return assembleSampleOptics(study.samples[0], study, [...parts.mine.bulk, ...parts.theirs.flat()], { longwave: parts.mine.longwave })
}

/** This worker's share of a sample's wavelengths, then the sample's thermal-infrared band optics (cheap: small size parameters). */
function* ownShare(study: Study, only: number[], grid: { tolerance?: number; coarsestStep?: number }) {
  const bulk = yield* sampleBulkSteps(study.samples[0], study, { only, ...grid, workspace })
  const longwave = yield* sampleLongwaveSteps(study.samples[0], study, { workspace, ...grid })
  return { bulk, longwave }
}

/**
 * What decides which size nodes a sample's full pass evaluates, and so the nodes it leaves in the caches: the sample
 * but for its modes' amounts, name, notes and layer, and the study's wavelengths and own materials (not the site).
 */
function nodesKey(study: Study): string {
  const s = study.samples[0]
  const size = s.size.kind === 'modes' ? s.size.modes.map((m) => [m.by, m.median_um, m.gsd, m.composition ?? null]) : s.size
  return JSON.stringify([size, s.composition, s.rh_percent, s.rh_history, s.temperature_k ?? null, study.wavelengths_nm, study.user_materials ?? []])
}

/**
 * For each sample (by its id in the page), the nodesKey of its last full pass here. An edit that changes only a
 * mode's amount makes a full pass from the caches alone (no Mie evaluation), which costs about what the quick pass
 * itself costs (the angular sums): it is computed without the quick pass. (With it, a dust amount edit showed the
 * quick figures and then the full ones: two sets of forcing, two renders and a hold of DISPLAY_HOLD_MS between them,
 * 95–126 ms in the page to the full figures.)
 */
const lastFull = new Map<string, string>()
const LAST_FULL_KEPT = 256

function quickFirst(item: EvaluateItem): boolean {
  return item.quick !== false && lastFull.get(item.id) !== nodesKey(item.study)
}

function keepLastFull(item: EvaluateItem): void {
  lastFull.delete(item.id)
  lastFull.set(item.id, nodesKey(item.study))
  if (lastFull.size > LAST_FULL_KEPT) lastFull.delete(lastFull.keys().next().value!)
}

/** A one-sample study's f(RH) curve, its humidities shared with the helpers (the same ones to the same worker). */
async function humidityCurve(study: Study, job: number): Promise<HumidityGrowthCurve | undefined> {
  const threads = helpers.length + 1
  const mineAt = HUMIDITY_CURVE_RH.filter((_, i) => i % threads === 0)
  const theirs = helpers.map((w, k) => {
    const humidities = HUMIDITY_CURVE_RH.filter((_, i) => i % threads === k + 1)
    return humidities.length ? ask<number[]>(w, { type: 'humidity', job, study, humidities }) : Promise.resolve([])
  })
  const parts = await together(humidityScatteringSteps(study, 0, mineAt, workspace), theirs, job)
  if (!parts) return undefined
  // back into the curve's order: point i was computed by thread i mod threads, as its (i div threads)-th
  const all = [parts.mine, ...parts.theirs]
  return humidityCurveFrom(HUMIDITY_CURVE_RH.map((_, i) => all[i % threads][Math.floor(i / threads)]))
}

/** f(RH) curves by the inputs they depend on (humidityCurveKey), the most recently used last. */
const curves = new Map<string, HumidityGrowthCurve>()
/** Curves kept: each is a dozen numbers, and one costs one 550 nm integration per humidity to work out again. */
const CURVES_KEPT = 64

function keepCurve(key: string, curve: HumidityGrowthCurve): void {
  curves.delete(key)
  curves.set(key, curve)
  if (curves.size > CURVES_KEPT) curves.delete(curves.keys().next().value!)
}

async function evaluate(m: Extract<ToWorker, { type: 'evaluate' }>): Promise<void> {
  // Two passes: every sample's optics and forcing first (posted as partial results), then the f(RH) curves,
  // which cost one more integration per humidity and would otherwise hold the figures back. A curve already
  // worked out for the same inputs (a humidity, layer or site edit leaves it as it is) goes with the figures.
  const total = jobSteps(m.items.length)
  const live = current(m.job)
  post({ type: 'progress', job: m.job, done: 0, total })
  const partial: (SampleResult | undefined)[] = []
  for (const [i, item] of m.items.entries()) {
    const curveKey = humidityCurveKey(item.study, 0)
    const known = curves.get(curveKey)
    if (known) keepCurve(curveKey, known)
    const withCurve = (r: SampleResult): SampleResult => (known ? { ...r, humidity: known } : r)
    try {
      let optics: SampleOptics | undefined
      if (quickFirst(item)) optics = await quickThenFull(item, m.job, withCurve)
      else optics = await sampleOptics(item.study, false, m.job)
      const r = optics && sampleResultFromOptics(item.study, optics)
      if (r) keepLastFull(item)
      if (live() && r) post({ type: 'result', job: m.job, id: item.id, key: item.key, result: withCurve(r), partial: !known })
      partial.push(known ? undefined : r)
    } catch (err) {
      if (!live()) return
      post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
      partial.push(undefined)
    }
    if (!live()) return
    post({ type: 'progress', job: m.job, done: i + 1, total })
  }
  for (const [i, item] of m.items.entries()) {
    const r = partial[i]
    if (r) {
      try {
        const humidity = await humidityCurve(item.study, m.job)
        if (!live() || !humidity) return
        keepCurve(humidityCurveKey(item.study, 0), humidity)
        post({ type: 'result', job: m.job, id: item.id, key: item.key, result: { ...r, humidity } })
      } catch (err) {
        post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
      }
    }
    post({ type: 'progress', job: m.job, done: m.items.length + i + 1, total })
  }
  post({ type: 'finished', job: m.job })
}

/** A quick pass first (its nodes are kept, so the full pass costs only what it adds), shown if the full pass takes a while; then the full pass. */
async function quickThenFull(item: EvaluateItem, job: number, withCurve: (r: SampleResult) => SampleResult): Promise<SampleOptics | undefined> {
  const live = current(job)
  const started = performance.now()
  const quick = await sampleOptics(item.study, true, job)
  if (!live()) return undefined
  // Shown if the full figures are not there PREVIEW_WORTH_MS after the start (the timer runs while the full
  // pass pauses between its steps); their forcing is worked out only then.
  const showQuick = () => {
    if (quick && live()) post({ type: 'result', job, id: item.id, key: item.key, result: withCurve(sampleResultFromOptics(item.study, quick)), partial: true, preview: true })
  }
  const wait = started + PREVIEW_WORTH_MS - performance.now()
  let timer: ReturnType<typeof setTimeout> | undefined
  let hold = 0
  if (wait <= 0) {
    showQuick()
    hold = DISPLAY_HOLD_MS
  } else timer = setTimeout(showQuick, wait)
  return await sampleOptics(item.study, false, job, hold).finally(() => clearTimeout(timer))
}

/** Loads the expression compiler where a study given to the workers has expression components (the build leaves it out: vite.shared.ts). */
async function expressionsReady(studies: readonly Study[]): Promise<void> {
  if (studies.some(needsExpressionCompiler)) await loadExpressionCompiler()
}

self.onmessage = async (e: MessageEvent<ToWorker>) => {
  const m = e.data
  if (m.type === 'helpers') {
    takeHelpers(m.ports)
    return
  }
  if (m.type === 'sizes') {
    const curves: Record<string, SizeCurves | { error: string }> = {}
    for (const item of m.items) {
      try {
        await expressionsReady([{ user_materials: item.userMaterials } as Study])
        curves[item.id] = sizeCurves(item.sample, item.userMaterials)
      } catch (err) {
        curves[item.id] = { error: message(err) }
      }
    }
    post({ type: 'sizes', job: m.job, curves })
    return
  }
  newest = m.job
  for (const w of helpers) w.postMessage({ type: 'newest', job: m.job } satisfies ToShareWorker)
  if (m.type === 'cancel') return
  try {
    await expressionsReady(m.type === 'evaluate' ? m.items.map((item) => item.study) : [m.study])
  } catch (err) {
    if (m.type === 'evaluate') for (const item of m.items) post({ type: 'failed', job: m.job, id: item.id, key: item.key, message: message(err) })
    return
  }
  if (m.job !== newest) return
  if (m.type === 'evaluate') void evaluate(m)
  if (m.type === 'warm') void warm(m)
}

/**
 * Works out a sample's optics for the node caches' sake alone: the samples made from stretches of the station
 * record share its bins, composition and humidity, so each of them then finds its nodes here, as an edit does.
 */
async function warm(m: Extract<ToWorker, { type: 'warm' }>): Promise<void> {
  const started = performance.now()
  try {
    const done = await sampleOptics(m.study, false, m.job)
    if (done) post({ type: 'warmed', job: m.job, ms: performance.now() - started })
  } catch {
    // the sample made from a stretch will meet the same failure and say it
  }
}
