// Runs the computations in workers as the document changes: at once, or debounced while edits come fast; one
// job at a time, a newer edit supersedes (and stops) the running job, unchanged samples are not computed again.
// The optics worker is kept alive across jobs (its node cache makes edits of sizes and amounts cheap): a newer
// job or a cancel is a message it reads between steps of its work.
import { prepareQuantities, validateStudy, type Study, type StudyProblem } from '../../src-core/index.ts'
import { store, type AppState, type ShownResult } from '../state/store.ts'
import { COMPUTE_THREADS, jobSteps, type EvaluateItem, type FromWorker, type ToWorker } from './messages.ts'

/** Changes that follow a run closer than this (ms) wait this long, so fast typing starts one job, not one a key. */
const DEBOUNCE_MS = 30
/**
 * Results that an edit has put out of date are marked stale only once they have been waited for this long (ms):
 * most edits give their first figures sooner, and marking and unmarking the whole result area in between would
 * only flicker (and take from the computation the time the browser spends drawing it). Bad inputs and failures
 * are marked at once, and so is whatever a finished or stopped job left out of date.
 */
export const STALE_GRACE_MS = 250

let optics: Worker | null = null
/** The optics worker's helpers (one per further processor), started with it. */
let helpers: Worker[] = []
let job = 0
let timer: ReturnType<typeof setTimeout> | undefined
let graceTimer: ReturnType<typeof setTimeout> | undefined
let lastRun = -Infinity
/** Numbers the scheduled runs: only the latest one runs. */
let scheduled = 0
let lastStudy: Study | null = null
let lastDrafts: AppState['drafts'] | null = null
/** Results by input key (a few per sample), so undo and toggling back are instant. */
const cache = new Map<string, ShownResult>()
/** The inputs each sample's size curves were last asked for with, so only changed samples are sent again. */
const sizeKeys = new Map<string, string>()

/**
 * The optics worker and its helpers, all started at once (a helper started by the optics worker itself would
 * begin loading only once that worker had loaded), each helper joined to it by a port.
 */
function startWorkers(): Worker {
  const worker = new Worker(new URL('./worker.ts', import.meta.url), { type: 'module', name: 'motebench-compute' })
  helpers = Array.from({ length: COMPUTE_THREADS - 1 }, (_, i) => new Worker(new URL('./shareWorker.ts', import.meta.url), { type: 'module', name: `motebench-share-${i + 1}` }))
  const ports = helpers.map((helper) => {
    const channel = new MessageChannel()
    helper.postMessage(null, [channel.port1])
    return channel.port2
  })
  worker.postMessage({ type: 'helpers', ports } satisfies ToWorker, ports)
  return worker
}

/** Sample keys by study (a study is never changed in place: an edit makes a new one), as every view asks for them. */
const keysOf = new WeakMap<Study, string[]>()

/** The inputs that decide one sample's results. */
export function sampleKey(study: Study, index: number): string {
  let keys = keysOf.get(study)
  if (!keys) keysOf.set(study, (keys = []))
  return (keys[index] ??= JSON.stringify([study.samples[index], study.site, study.wavelengths_nm, study.user_materials ?? [], study.verdict_margin_w_m2 ?? null]))
}

/** False for the uncertainty settings: they change no sample's optics (the uncertainty view shows their problems). */
export const affectsOptics = (path: string): boolean => !/^uncertainty(\.|\[|$)/.test(path)

/** Problems that block sample `i` (its own, and those of the study as a whole). */
export function problemsOf(problems: StudyProblem[], i: number): StudyProblem[] {
  return problems.filter((p) => affectsOptics(p.path) && (!p.path.startsWith('samples[') || p.path.startsWith(`samples[${i}]`)))
}

/** What a message of the optics worker changes in the state `s` (nothing for an older job's). */
function opticsPatch(s: AppState, m: FromWorker): Partial<AppState> | null {
  if (m.job !== job) return null
  if (m.type === 'progress') {
    // unchanged progress (the job's start, which run() has shown already) is not worth a render
    const now = { running: m.done < m.total, done: m.done, total: m.total }
    return now.running !== s.job.running || now.done !== s.job.done || now.total !== s.job.total ? { job: now } : null
  }
  // once the job is over, whatever it did not bring up to date is marked stale
  if (m.type === 'finished') return { job: { ...s.job, running: false }, resultsLate: true }
  if (m.type === 'result') {
    const shown: ShownResult = m.preview ? { key: m.key, result: m.result, preview: true, partial: true } : m.partial ? { key: m.key, result: m.result, partial: true } : { key: m.key, result: m.result }
    // a partial result (a preview, or its f(RH) curve still to come) is shown but not kept for reuse
    if (!m.partial) cache.set(m.key, shown)
    return { results: { ...s.results, [m.id]: shown } }
  }
  if (m.type === 'failed') {
    const old = s.results[m.id]
    cache.set(m.key, { key: m.key, error: m.message })
    return { results: { ...s.results, [m.id]: { key: old?.key ?? '', result: old?.result, error: m.message } } }
  }
  return null
}

/** What a message of the optics worker with size curves changes in the state `s` (whichever job asked for them). */
function sizesPatch(s: AppState, m: FromWorker): Partial<AppState> | null {
  return m.type === 'sizes' ? { sizes: { ...s.sizes, ...m.curves } } : null
}

/**
 * Messages from the workers wait here for the next frame and are then shown together, in one update of the state:
 * a busy screen often has several waiting (the size curves and the first progress, or a result, the progress
 * and the end of the job), and each update redraws the whole window.
 */
let inbox: [patch: typeof opticsPatch, m: FromWorker][] = []

function receive(patch: typeof opticsPatch, m: FromWorker): void {
  inbox.push([patch, m])
  if (inbox.length > 1) return
  requestAnimationFrame(showInbox)
  // a hidden window gets no frames
  setTimeout(showInbox, 100)
}

function showInbox(): void {
  if (!inbox.length) return
  const waiting = inbox
  inbox = []
  let s = store().get()
  let changed = false
  for (const [patch, m] of waiting) {
    const p = patch(s, m)
    if (!p) continue
    s = { ...s, ...p }
    changed = true
  }
  if (changed) store().set(s)
  sendWarm()
  if (waiting.some(([, m]) => m.type === 'finished')) prepareUnitsWhenIdle()
}

let unitsPrepared = false

/**
 * mathjs's units are made on first use (about 0.2 s of this thread): once a job has finished, in idle time, so that
 * neither the start's computation nor the first unit typed waits for them.
 */
function prepareUnitsWhenIdle(): void {
  if (unitsPrepared) return
  unitsPrepared = true
  if (typeof requestIdleCallback === 'function') requestIdleCallback(() => prepareQuantities(), { timeout: 5000 })
  else setTimeout(prepareQuantities, 500)
}

/** Stops the running job at its next step (the next edit starts a new one). */
export function cancel(): void {
  job++
  if (optics) optics.postMessage({ type: 'cancel', job } satisfies ToWorker)
  store().set({ job: { running: false, done: 0, total: 0 }, resultsLate: true })
}

function run(): void {
  lastRun = performance.now()
  const s = store().get()
  const study = s.study
  const checked = validateStudy(study)
  const problems = checked.ok ? [] : checked.problems
  store().set({ problems })

  const userMaterials = study.user_materials ?? []
  for (const id of sizeKeys.keys()) if (!s.ids.includes(id)) sizeKeys.delete(id)
  const sizeItems: Extract<ToWorker, { type: 'sizes' }>['items'] = []
  study.samples.forEach((sample, i) => {
    const id = s.ids[i]
    // the dry curves (and their errors) depend on these alone: a humidity or layer edit leaves the plot as it is
    const key = JSON.stringify([sample.name, sample.size, sample.composition, userMaterials])
    if (problemsOf(problems, i).some((p) => p.path.startsWith(`samples[${i}]`))) return
    if (id in s.sizes && sizeKeys.get(id) === key) return
    sizeKeys.set(id, key)
    sizeItems.push({ id, sample, userMaterials })
  })
  // the optics worker reads this between the steps of any job it is running (a few milliseconds)
  if (sizeItems.length) opticsWorker().postMessage({ type: 'sizes', job, items: sizeItems } satisfies ToWorker)

  const items: EvaluateItem[] = []
  const results = { ...s.results }
  const draftPaths = Object.keys(s.drafts).filter(affectsOptics)
  study.samples.forEach((sample, i) => {
    const id = s.ids[i]
    const key = sampleKey(study, i)
    if (problemsOf(problems, i).length || draftPaths.some((p) => !p.startsWith('samples[') || p.startsWith(`samples[${i}]`))) return
    const hit = cache.get(key)
    if (hit) {
      results[id] = hit.result ? hit : { key: results[id]?.key ?? '', result: results[id]?.result, error: hit.error }
      return
    }
    // done already; a quick or partial result is computed again (a newer job stops the one that was refining it)
    if (results[id]?.key === key && !results[id].partial) return
    items.push({ id, key, study: { ...study, samples: [sample] } })
  })
  store().set({ results })
  // What the user is looking at first: the selected sample, then the compared ones, then the rest.
  const rank = (id: string) => (id === s.selected ? 0 : s.compare.includes(id) ? 1 : 2)
  items.sort((a, b) => rank(a.id) - rank(b.id))
  // In a job of several samples (opening a study, a site edit), those not on screen get no quick pass: nobody sees
  // their quick figures, and every sample's full figures come sooner without them (messages.ts, EvaluateItem).
  if (items.length > 1) for (const item of items) if (rank(item.id) === 2) item.quick = false

  // A newer edit supersedes the running job: the worker drops it at its next step when the new job arrives.
  job++
  if (!items.length) {
    if (optics && s.job.running) optics.postMessage({ type: 'cancel', job } satisfies ToWorker)
    store().set({ job: { running: false, done: 0, total: 0 }, resultsLate: true })
    return
  }
  store().set({ job: { running: true, done: 0, total: jobSteps(items.length) } })
  opticsWorker().postMessage({ type: 'evaluate', job, items } satisfies ToWorker)
}

function opticsWorker(): Worker {
  if (!optics) {
    optics = startWorkers()
    optics.onmessage = (e: MessageEvent<FromWorker>) => receive(e.data.type === 'sizes' ? sizesPatch : opticsPatch, e.data)
    optics.onerror = (e) => {
      store().set({ job: { running: false, done: 0, total: 0 }, resultsLate: true, notice: { kind: 'error', title: 'The computation stopped', lines: [e.message] } })
      optics = null
      for (const helper of helpers) helper.terminate()
      helpers = []
    }
  }
  return optics
}

/** A one-sample study whose nodes the caches should hold, waiting for the running job to end. */
let warmWanted: Study | null = null

/**
 * Has the optics workers work out `study`'s one sample for their node caches only, once no job is running (a
 * newer edit drops it, as it drops any job). The station record asks this for a sample of its bins, so that a
 * stretch made into a sample gets its first figures as an edit does: from nodes already worked out.
 */
export function warmNodes(study: Study): void {
  warmWanted = study
  sendWarm()
}

function sendWarm(): void {
  if (!warmWanted || store().get().job.running) return
  job++
  opticsWorker().postMessage({ type: 'warm', job, study: warmWanted } satisfies ToWorker)
  warmWanted = null
}

/** Watches the document: every change of the study or of unreadable fields schedules a run. */
export function startComputing(): void {
  const check = (immediate: boolean) => {
    const s = store().get()
    if (s.study === lastStudy && s.drafts === lastDrafts) return
    lastStudy = s.study
    lastDrafts = s.drafts
    clearTimeout(timer)
    // the grace before results put out of date are marked stale starts again (set before the views draw the change)
    clearTimeout(graceTimer)
    if (s.resultsLate) store().set({ resultsLate: false })
    graceTimer = setTimeout(() => store().get().resultsLate || store().set({ resultsLate: true }), STALE_GRACE_MS)
    // A lone edit runs at once, once the task that made it is done (so the change's other updates are in, and
    // the worker starts before the browser lays out and paints); one hard on the heels of a run waits.
    const token = ++scheduled
    const runIfLatest = () => token === scheduled && run()
    if (immediate || performance.now() - lastRun > DEBOUNCE_MS) queueMicrotask(runIfLatest)
    else timer = setTimeout(runIfLatest, DEBOUNCE_MS)
  }
  store().subscribe(() => check(false))
  check(true)
}
