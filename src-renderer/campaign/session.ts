// The campaign in the app: the study keeps references to the instrument files and the merge parameters
// (study.campaign, undoable and saved); this session keeps the files' texts, which files could not be read or
// changed, the record computed from them in a worker, the marked stretch and the visible range. A web page holds
// the files themselves, not their texts (held.ts): the worker reads them.
import {
  CAMPAIGN_KIND_WORDS,
  campaignProblems,
  isSizerKind,
  packedBuffers,
  relativeFilePath,
  rebaseCampaignPaths,
  resolveFilePath,
  stretchSample,
  fileChange,
  type CampaignBuild,
  type CampaignFileKind,
  type CampaignSettings,
  type Study
} from '../../src-core/index.ts'
import type { InstrumentFile } from '../../src-main/host-api.ts'
import { host } from '../host/index.ts'
import { edit, uniqueName } from '../state/actions.ts'
import { createStore, newId, store } from '../state/store.ts'
import type { FromRecordWorker, RecordWorkerInput, ToRecordWorker } from './worker.ts'
import type { FromReader, ToReader } from './reader.ts'
import { stretchMarked, warmStretchNodes } from './warm.ts'
import { holdBytes, holdFile, type HeldFile } from './held.ts'
import { guessKind } from './kind.ts'

export type { HeldFile }
export { guessKind }

export interface CampaignSession {
  /** Files read in this session (their texts, or on a web page the files themselves), by the path the study keeps. */
  texts: Record<string, HeldFile>
  /** Kept paths that could not be read: why. */
  missing: Record<string, string>
  /** Kept paths whose file differs from the one added: what changed. */
  changed: Record<string, string>
  build: CampaignBuild | null
  /** Why the record could not be made (beyond a file's own summary). */
  failure: string | null
  running: boolean
  share: number
  /** Milliseconds the last record took in the worker (reading, merging and computing). */
  ms: number
  /** The marked stretch and the visible range, ms. */
  mark: [number, number] | null
  visible: [number, number] | null
}

const session = createStore<CampaignSession>({ texts: {}, missing: {}, changed: {}, build: null, failure: null, running: false, share: 0, ms: 0, mark: null, visible: null })
export const campaignStore = () => session

/** A new campaign's settings: the selected sample, 550 nm (or the study's wavelength nearest it). */
function freshSettings(study: Study): CampaignSettings {
  const s = store().get()
  const i = Math.max(0, s.ids.indexOf(s.selected))
  const wl = study.wavelengths_nm.reduce((a, b) => (Math.abs(b - 550) < Math.abs(a - 550) ? b : a), study.wavelengths_nm[0] ?? 550)
  return { files: [], sample: study.samples[i]?.name ?? study.samples[0].name, wavelength_nm: wl, shape_factor: 1 }
}

/** Adds files to the campaign (one per kind: a file of a kind already present replaces it). */
export async function addFiles(chosen: InstrumentFile[]): Promise<void> {
  if (chosen.length === 0) return
  const files = await holdFiles(chosen)
  const s = store().get()
  const texts = { ...session.get().texts }
  const missing = { ...session.get().missing }
  const changed = { ...session.get().changed }
  edit((study) => {
    const c = study.campaign ?? freshSettings(study)
    for (const f of files) {
      const kind = guessKind(f.name, f.head)
      const kept = relativeFilePath(s.file?.path, f.path ?? f.name)
      const ref = { kind, path: kept, size: f.size, hash: f.fingerprint }
      const at = c.files.findIndex((x) => x.kind === kind)
      if (at >= 0) c.files[at] = ref
      else c.files.push(ref)
      texts[kept] = f
      delete missing[kept]
      delete changed[kept]
    }
    study.campaign = c
  })
  session.set({ texts, missing, changed })
  refresh(false, 0) // at once: the wait is for parameter edits typed in a row
}

/** Points a reference whose file could not be read (or changed) at a file the user chooses. */
export async function pointAgain(index: number): Promise<void> {
  const chosen = await host().openInstrumentFiles()
  if (!chosen || chosen.length === 0) return
  const [f] = await holdFiles(chosen.slice(0, 1))
  const s = store().get()
  const kept = relativeFilePath(s.file?.path, f.path ?? f.name)
  const old = s.study.campaign?.files[index]?.path
  edit((study) => {
    const r = study.campaign?.files[index]
    if (r) Object.assign(r, { path: kept, size: f.size, hash: f.fingerprint })
  })
  const { texts, missing, changed } = session.get()
  const next = { ...texts, [kept]: f }
  const m = { ...missing }
  const c = { ...changed }
  if (old !== undefined) (delete m[old], delete c[old])
  session.set({ texts: next, missing: m, changed: c })
  refresh()
}

/** Takes a changed file as it now is (its new size and fingerprint are kept). */
export function acceptChanged(index: number): void {
  const ref = store().get().study.campaign?.files[index]
  const held = ref && session.get().texts[ref.path]
  if (!ref || !held) return
  edit((study) => {
    const r = study.campaign?.files[index]
    if (r) Object.assign(r, { size: held.size, hash: held.fingerprint })
  })
  const c = { ...session.get().changed }
  delete c[ref.path]
  session.set({ changed: c })
}

export function removeFile(index: number): void {
  edit((study) => {
    study.campaign?.files.splice(index, 1)
  })
  refresh()
}

export function setKind(index: number, kind: CampaignFileKind): void {
  edit((study) => {
    const r = study.campaign?.files[index]
    if (r) r.kind = kind
  })
  refresh()
}

/** Changes a parameter of the campaign (merged with quick successive edits of the same one). */
export function setParameter(change: (c: CampaignSettings) => void, key: string): void {
  spareWorker() // its script loads during the wait for more typing
  edit((study) => {
    if (study.campaign) change(study.campaign)
  }, `campaign:${key}`)
  refresh()
}

/** Reads the files the study refers to that this session does not hold yet (desktop: by path). */
async function readReferenced(): Promise<void> {
  const s = store().get()
  const c = s.study.campaign
  if (!c) return
  for (const ref of c.files) {
    const { texts, missing } = session.get()
    if (texts[ref.path] || missing[ref.path]) continue
    const abs = resolveFilePath(s.file?.path, ref.path)
    const got =
      host().kind === 'browser'
        ? { missing: 'a web page cannot open a file by its path' }
        : abs
          ? await host().readInstrumentFile(abs)
          : { missing: `its folder is not known (the study${s.file ? ` ${s.file.name}` : ''} was not saved to a file)` }
    if ('missing' in got) {
      session.set({ missing: { ...session.get().missing, [ref.path]: got.missing } })
      continue
    }
    session.set({ texts: { ...session.get().texts, [ref.path]: await holdFile(got) } })
    const what = fileChange(ref, got.text, got.fingerprint)
    if (what) {
      session.set({ changed: { ...session.get().changed, [ref.path]: `${what} since it was added to the study` } })
    }
  }
}

// ---------------------------------------------------------------------------------------------------------------
// The record, computed in a worker (one at a time; a newer request ends the running one).

let worker: Worker | null = null
/**
 * A worker started ahead (the view shown without files, files added, a parameter typed), so its script loads
 * meanwhile. Not on every change of the study (`refresh`): a stretch made into a sample would then start one while
 * the optics workers compute the sample.
 */
let spare: Worker | null = null
let job = 0
let timer: ReturnType<typeof setTimeout> | undefined
let lastKey = ''

function stopWorker(): void {
  worker?.terminate()
  worker = null
}

/**
 * A worker whose record is done holds what it read of the files and the files as they came (worker.ts, `kept` and
 * `sources`): it becomes the spare, asked for the next record, which then reads no file from its blob again (a year
 * of rows is most of a record's time). A spare started meanwhile, without those readings, gives way to it.
 */
function keepFinishedWorker(w: Worker): void {
  if (worker === w) worker = null
  // its handlers were this record's
  w.onmessage = null
  w.onerror = null
  if (spare !== w) spare?.terminate()
  spare = w
}

const newWorker = (): Worker => new Worker(new URL('./worker.ts', import.meta.url), { type: 'module', name: 'motebench-record' })

function spareWorker(): void {
  if (typeof Worker === 'undefined') return // tests of the session without a page
  spare ??= newWorker()
}

/**
 * The partner worker (reader.ts), which reads a web page's measured files while the record worker reads the sizer;
 * kept for the session. Its readings are passed on to the record worker that holds each file (`routes`, by serial).
 */
let partner: Worker | null = null
const routes = new Map<number, Worker>()

function partnerWorker(): Worker {
  if (partner) return partner
  const p = new Worker(new URL('./reader.ts', import.meta.url), { type: 'module', name: 'motebench-reader' })
  p.onmessage = (e: MessageEvent<FromReader>) => {
    const m = e.data
    const to = routes.get(m.serial)
    routes.delete(m.serial)
    to?.postMessage({ type: 'partner', ...m } satisfies ToRecordWorker, 'packed' in m ? packedBuffers(m.packed) : [])
  }
  // a partner that fails: the record workers read its files from their blobs
  p.onerror = (e) => {
    e.preventDefault()
    for (const [serial, to] of routes) to.postMessage({ type: 'partner', serial, failed: true } satisfies ToRecordWorker)
    routes.clear()
    partner = null
  }
  partner = p
  return p
}

/**
 * Starts a record worker ahead (the station record shown without files yet), so that adding files need not wait for
 * its script; in a web page, whose files come as bytes, the partner too (the desktop gives texts: a partner is then
 * started only if a file comes as bytes, in holdFiles).
 */
export const prepareRecordWorker = (): void => {
  spareWorker()
  if (typeof Worker !== 'undefined' && host().kind === 'browser') partnerWorker()
}

/**
 * Holds chosen files: a web page's bytes are read here once, measured (held.ts) and moved to a record worker, which
 * reads them ahead (and becomes the spare worker, asked for the record next), so the page decodes none
 * of a year of rows; without workers (tests of the session) the files are only measured.
 */
async function holdFiles(chosen: InstrumentFile[]): Promise<HeldFile[]> {
  if (!chosen.some((f) => 'blob' in f) || typeof Worker === 'undefined') return Promise.all(chosen.map((f) => holdFile(f)))
  const w = spare ?? newWorker()
  spare = null // this one is busy until the files are held; a refresh meanwhile starts another
  const held = await Promise.all(
    chosen.map(async (f) => {
      if (!('blob' in f)) return holdFile(f)
      const bytes = await f.blob.arrayBuffer()
      const h = holdBytes(f, new Uint8Array(bytes))
      if (h.text !== undefined) return h
      // a plain-ASCII file's bytes moved (not copied): a measured file's to the partner, which reads it and hands it
      // back packed for this worker; the sizer's to this worker, which reads the file ahead from them
      const kind = guessKind(h.name, h.head)
      if (isSizerKind(kind)) w.postMessage({ type: 'bytes', serial: h.serial, name: h.name, kind, bytes } satisfies ToRecordWorker, [bytes])
      else {
        const p = partnerWorker()
        routes.set(h.serial, w)
        w.postMessage({ type: 'expect', serial: h.serial } satisfies ToRecordWorker)
        p.postMessage({ serial: h.serial, name: h.name, kind, bytes } satisfies ToReader, [bytes])
      }
      return h
    })
  )
  ;(spare as Worker | null)?.terminate() // started meanwhile, without these texts
  spare = w
  return held
}

/** Stops the running computation (the last record, if any, stays). */
export function stopRecord(): void {
  job++
  stopWorker()
  session.set({ running: false, share: 0, failure: 'Stopped before the record was complete: change a parameter or press “Compute again” to start again.' })
}

/** Recomputes the record soon if what it depends on changed (files, parameters, the sample, wavelengths). */
export function refresh(force = false, delayMs = 250): void {
  clearTimeout(timer)
  timer = setTimeout(() => void start(force), delayMs)
}

async function start(force: boolean): Promise<void> {
  await readReferenced()
  const study = store().get().study
  const c = study.campaign
  if (!c || c.files.length === 0) {
    session.set({ build: null, failure: null, running: false })
    lastKey = ''
    return
  }
  const problems = campaignProblems(c, study.samples.map((x) => x.name))
  if (problems.length > 0) {
    session.set({ failure: problems.map((p) => `${p.message}. ${p.fix}`).join(' '), running: false })
    return
  }
  const { texts } = session.get()
  const inputs: RecordWorkerInput[] = c.files.filter((f) => texts[f.path]).map((f) => {
    const held = texts[f.path]
    return { kind: f.kind, name: held.name, serial: held.serial, ...(held.text !== undefined ? { text: held.text } : { blob: held.blob! }) }
  })
  const sample = study.samples.find((x) => x.name === c.sample)
  // the paths are left out of the key (a save that makes them relative to the study file changes no file)
  const key = JSON.stringify([{ ...c, files: c.files.map((f) => ({ ...f, path: '' })) }, sample && { ...sample, name: '', notes: '', size: null }, study.wavelengths_nm, study.user_materials, inputs.map((i) => i.serial)]) // the refs' own fingerprints are in c (hashing the texts again would hold the page)
  if (key === lastKey && !force) return
  lastKey = key
  if (!inputs.some((i) => isSizerKind(i.kind))) {
    session.set({ build: null, running: false, failure: c.files.some((f) => isSizerKind(f.kind)) ? 'The sizer file could not be read at its path: point at it again.' : 'Add a sizer file (mobility, aerodynamic or optical sizer, or a merged distribution): the record is made from its distributions.' })
    return
  }
  stopWorker()
  const mine = ++job
  spareWorker()
  const w = spare!
  spare = null
  worker = w
  session.set({ running: true, share: 0, failure: null })
  w.onmessage = (e: MessageEvent<FromRecordWorker>) => {
    const m = e.data
    if (m.job !== mine) return
    if (m.type === 'progress') return session.set({ share: m.share })
    keepFinishedWorker(w)
    if (m.type === 'failed') return session.set({ running: false, failure: m.message })
    if (m.build.record) warmStretchNodes(m.build.record)
    session.set({ running: false, share: 1, build: m.build, ms: m.ms, failure: m.build.problem ? `${m.build.problem.message}. ${m.build.problem.fix}` : null, visible: null })
  }
  w.onerror = (e) => {
    e.preventDefault()
    stopWorker()
    session.set({ running: false, failure: `The computation stopped (${e.message || 'worker failure'}). Press “Compute again”.` })
  }
  w.postMessage({ type: 'record', job: mine, inputs, settings: c, study: { samples: [structuredClone(sample!)], user_materials: study.user_materials, wavelengths_nm: study.wavelengths_nm } } satisfies ToRecordWorker)
}

/**
 * After the study was saved at `toPath` (its first save, or "save as" elsewhere): the file references are made
 * relative to the new study file (rebaseCampaignPaths), in the document (not an undo step: the files are the same)
 * and in this session's held texts. True when a path changed, so the study is to be written again.
 */
export function rebaseForSave(fromPath: string | undefined, toPath: string): boolean {
  const app = store().get()
  const c = app.study.campaign
  if (!c) return false
  const { settings, moved } = rebaseCampaignPaths(c, fromPath, toPath)
  if (moved.size === 0) return false
  const rekey = <T,>(m: Record<string, T>): Record<string, T> => Object.fromEntries(Object.entries(m).map(([k, v]) => [moved.get(k) ?? k, v]))
  const { texts, missing, changed } = session.get()
  session.set({ texts: rekey(texts), missing: rekey(missing), changed: rekey(changed) })
  store().set({ study: { ...app.study, campaign: settings } })
  return true
}

/** Forgets the session's files (a new or another study). */
export function resetSession(): void {
  stopWorker()
  // the spare may hold the readings of the files forgotten here
  spare?.terminate()
  spare = null
  job++
  lastKey = ''
  session.set({ texts: {}, missing: {}, changed: {}, build: null, failure: null, running: false, share: 0, mark: null, visible: null })
}

export const setMark = (mark: [number, number] | null): void => {
  session.set({ mark })
  if (mark) stretchMarked()
}
export const setVisible = (visible: [number, number] | null): void => session.set({ visible })

/** Makes the marked stretch a sample of the study (selected); returns why not when it cannot. */
export function makeSample(): string | null {
  const { build, mark } = session.get()
  const r = build?.record
  if (!r || !mark) return 'Mark a stretch of time first (drag across the charts, or type its start and end).'
  let made
  try {
    made = stretchSample(r, mark[0], mark[1])
  } catch (e) {
    return (e as Error).message
  }
  const id = newId()
  edit((study, ids) => {
    study.samples.push({ ...made.sample, name: uniqueName(made.sample.name, study) })
    ids.push(id)
  })
  store().set({ selected: id, view: 'optics', toast: { text: `Made the sample “${made.sample.name}” from ${made.rows} row${made.rows === 1 ? '' : 's'} of the record${made.gapRows ? ` (${made.gapRows} gap rows left out)` : ''}; humidity ${made.humidity.percent} % ${made.humidity.from === 'files' ? `recorded in ${made.humidity.file}` : `of “${r.sample.name}” (${made.humidity.why})`}.`, undo: true } })
  return null
}

export const kindWords = CAMPAIGN_KIND_WORDS

/** Follows the study: a change of what the record depends on recomputes it; another study forgets the files. */
export function watchCampaign(): () => void {
  let study = store().get().study
  let ids = store().get().ids
  return store().subscribe(() => {
    const s = store().get()
    if (s.study === study) return
    // a document of its own (open, new, recovery) shares no sample id with the one before
    if (ids.length > 0 && !s.ids.some((id) => ids.includes(id))) resetSession()
    study = s.study
    ids = s.ids
    if (s.study.campaign || session.get().build) refresh()
  })
}
