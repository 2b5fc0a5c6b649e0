// Changes to the document and to what is shown. Every document change goes through `edit`, which keeps the
// undo history (edits of the same field within a moment merge into one step).
import { STUDY_FORMAT, STUDY_VERSION, type Sample, type Study } from '../../src-core/index.ts'
import { newId, store, type Snapshot, type ViewName } from './store.ts'

const HISTORY = 200
let lastMerge: { key: string; at: number } | null = null

const snapshot = (): Snapshot => ({ study: store().get().study, ids: store().get().ids })

/** Changes the study: `change` gets a copy to modify. `mergeKey` merges quick successive edits of one field. */
export function edit(change: (study: Study, ids: string[]) => void, mergeKey?: string): void {
  const s = store().get()
  const study = structuredClone(s.study)
  const ids = [...s.ids]
  change(study, ids)
  const now = Date.now()
  const merge = mergeKey !== undefined && lastMerge?.key === mergeKey && now - lastMerge.at < 1500
  lastMerge = mergeKey !== undefined ? { key: mergeKey, at: now } : null
  const past = merge ? s.past : [...s.past, snapshot()].slice(-HISTORY)
  const selected = ids.includes(s.selected) ? s.selected : (ids[0] ?? '')
  store().set({ study, ids, past, future: [], dirty: true, pristine: false, selected, compare: s.compare.filter((c) => ids.includes(c)) })
}

/** Changes one sample (by id). */
export function editSample(id: string, change: (sample: Sample, study: Study) => void, mergeKey?: string): void {
  edit((study, ids) => {
    const i = ids.indexOf(id)
    if (i >= 0) change(study.samples[i], study)
  }, mergeKey && `${id}:${mergeKey}`)
}

function restore(from: 'past' | 'future'): void {
  const s = store().get()
  const stack = s[from]
  if (!stack.length) return
  const target = stack[stack.length - 1]
  const rest = stack.slice(0, -1)
  const current = snapshot()
  lastMerge = null
  const selected = target.ids.includes(s.selected) ? s.selected : (target.ids[0] ?? '')
  store().set({
    study: target.study,
    ids: target.ids,
    past: from === 'past' ? rest : [...s.past, current],
    future: from === 'past' ? [...s.future, current] : rest,
    dirty: true,
    selected,
    compare: s.compare.filter((c) => target.ids.includes(c)),
    drafts: {},
    toast: null
  })
}

export const undo = (): void => restore('past')
export const redo = (): void => restore('future')

/** Replaces the document (open, new, recovery). */
export function load(study: Study, file: { name: string; path?: string } | null, dirty = false): void {
  const ids = study.samples.map(() => newId())
  lastMerge = null
  store().set({
    study,
    ids,
    file,
    dirty,
    pristine: false,
    past: [],
    future: [],
    selected: ids[0] ?? '',
    compare: [],
    drafts: {},
    problems: [],
    results: {},
    sizes: {},
    toast: null,
    notice: null
  })
}

export function blankSample(name: string): Sample {
  return {
    name,
    size: { kind: 'modes', modes: [{ by: 'number', name: 'accumulation', number_cm3: 1000, median_um: 0.15, gsd: 1.6 }] },
    composition: { components: [{ material: 'ammonium-sulfate', volume_fraction: 1 }], mixing: 'volume-average' },
    rh_percent: 50,
    rh_history: 'rising',
    layer: { kind: 'depth', depth_m: 1000 }
  }
}

export function blankStudy(): Study {
  return {
    format: STUDY_FORMAT,
    version: STUDY_VERSION,
    name: 'New study',
    wavelengths_nm: [400, 450, 500, 550, 600, 700, 850, 1000],
    site: { latitude_deg: 45, day_of_year: 172, cloud_fraction: 0.6, transmittance: 0.76, surface: 'grassland' },
    samples: [blankSample('Sample 1')]
  }
}

export function uniqueName(base: string, study: Study): string {
  const names = new Set(study.samples.map((s) => s.name))
  if (!names.has(base)) return base
  for (let i = 2; ; i++) if (!names.has(`${base} ${i}`)) return `${base} ${i}`
}

export function addSample(): void {
  const id = newId()
  edit((study, ids) => {
    study.samples.push(blankSample(uniqueName(`Sample ${study.samples.length + 1}`, study)))
    ids.push(id)
  })
  store().set({ selected: id })
}

export function duplicateSample(id: string): void {
  const copy = newId()
  edit((study, ids) => {
    const i = ids.indexOf(id)
    if (i < 0) return
    const s = structuredClone(study.samples[i])
    s.name = uniqueName(`${s.name} (copy)`, study)
    study.samples.splice(i + 1, 0, s)
    ids.splice(i + 1, 0, copy)
  })
  store().set({ selected: copy })
}

export function renameSample(id: string, name: string): void {
  editSample(
    id,
    (s, study) => {
      // The sample's uncertain inputs are kept by its name: they follow it.
      const u = study.uncertainty as { samples?: Record<string, unknown> } | undefined
      const mine = u?.samples?.[s.name]
      if (u?.samples && mine !== undefined && !study.samples.some((x) => x !== s && x.name === s.name) && !(name in u.samples)) {
        delete u.samples[s.name]
        u.samples[name] = mine
      }
      s.name = name
    },
    'name'
  )
}

export function deleteSample(id: string): void {
  const s = store().get()
  const i = s.ids.indexOf(id)
  if (i < 0 || s.ids.length <= 1) return
  const name = s.study.samples[i].name
  edit((study, ids) => {
    study.samples.splice(i, 1)
    ids.splice(i, 1)
  })
  store().set({ selected: store().get().ids[Math.min(i, store().get().ids.length - 1)], toast: { text: `Deleted sample “${name}”.`, undo: true } })
}

export function moveSample(id: string, by: -1 | 1): void {
  const i = store().get().ids.indexOf(id)
  const j = i + by
  if (i < 0 || j < 0 || j >= store().get().ids.length) return
  edit((study, ids) => {
    ;[study.samples[i], study.samples[j]] = [study.samples[j], study.samples[i]]
    ;[ids[i], ids[j]] = [ids[j], ids[i]]
  })
}

export const MAX_COMPARE = 6

export function toggleCompare(id: string): void {
  const s = store().get()
  if (s.compare.includes(id)) store().set({ compare: s.compare.filter((c) => c !== id) })
  else if (s.compare.length < MAX_COMPARE) store().set({ compare: s.ids.filter((x) => x === id || s.compare.includes(x)) })
  else store().set({ toast: { text: `At most ${MAX_COMPARE} samples can be compared; unmark one first.`, undo: false } })
}

export const select = (id: string): void => store().set({ selected: id })
export const showView = (view: ViewName): void => store().set({ view })

/** Records (or clears) a field whose text cannot be read. */
export function setDraft(path: string, reason: string | null): void {
  const drafts = store().get().drafts
  if ((drafts[path] ?? null) === reason) return
  const next = { ...drafts }
  if (reason === null) delete next[path]
  else next[path] = reason
  store().set({ drafts: next })
}

/** The samples the charts show: the compared ones when 2 or more are marked, else the selected one. */
export function shownIds(): string[] {
  const s = store().get()
  return s.compare.length >= 2 ? s.compare : [s.selected]
}
