// The sample list's actions and the undo history (src-renderer/state/actions.ts), on the app's store without a page.
import { beforeEach, describe, expect, it } from 'vitest'
import { demoStudy } from '../../src-core/index.ts'
import {
  addSample,
  deleteSample,
  duplicateSample,
  edit,
  editSample,
  MAX_COMPARE,
  moveSample,
  redo,
  renameSample,
  toggleCompare,
  undo
} from '../../src-renderer/state/actions.ts'
import { createStore, setStore, store, type AppState } from '../../src-renderer/state/store.ts'

function fresh(): void {
  const study = demoStudy()
  const ids = study.samples.map((_, i) => `s${i}`)
  setStore(
    createStore<AppState>({
      study, ids, file: null, dirty: false, pristine: true, past: [], future: [], selected: 's0', compare: [], view: 'optics',
      theme: 'light', drafts: {}, problems: [], results: {}, sizes: {}, job: { running: false, done: 0, total: 0 },
      resultsLate: false, toast: null, notice: null, cautionsOpen: false, reportOpen: false, sizeMoment: 'number'
    })
  )
}

const names = () => store().get().study.samples.map((s) => s.name)
const get = () => store().get()

beforeEach(fresh)

describe('the sample list', () => {
  it('adds a sample after the others, selects it and marks the study changed', () => {
    const before = names()
    addSample()
    expect(names().slice(0, -1)).toEqual(before)
    expect(get().ids).toHaveLength(before.length + 1)
    expect(get().selected).toBe(get().ids.at(-1))
    expect(get().dirty).toBe(true)
  })

  it('duplicates a sample right after itself, with equal inputs, a new name and its own id', () => {
    duplicateSample('s1')
    const s = get().study.samples
    expect(s[2].name).toBe(`${s[1].name} (copy)`)
    expect({ ...s[2], name: s[1].name }).toEqual(s[1])
    expect(get().selected).toBe(get().ids[2])
    expect(new Set(get().ids).size).toBe(get().ids.length)
    // the copy is a copy: editing it leaves the original alone
    const rh = s[1].rh_percent
    editSample(get().ids[2], (x) => (x.rh_percent = rh + 10))
    expect(get().study.samples[1].rh_percent).toBe(rh)
    // a second copy gets a name of its own
    duplicateSample('s1')
    expect(get().study.samples[2].name).toBe(`${s[1].name} (copy) 2`)
  })

  it('deletes a sample, says so with an undo, and undo puts back the same sample in the same place', () => {
    const before = structuredClone(get().study)
    deleteSample('s2')
    expect(get().ids).not.toContain('s2')
    expect(names()).toEqual(before.samples.filter((_, i) => i !== 2).map((s) => s.name))
    expect(get().toast).toEqual({ text: `Deleted sample “${before.samples[2].name}”.`, undo: true })
    expect(get().selected).toBe('s3')
    undo()
    expect(get().study).toEqual(before)
    expect(get().ids).toEqual(['s0', 's1', 's2', 's3', 's4'])
    redo()
    expect(get().ids).not.toContain('s2')
  })

  it('never deletes the last sample', () => {
    for (const id of ['s1', 's2', 's3', 's4']) deleteSample(id)
    deleteSample('s0')
    expect(get().ids).toEqual(['s0'])
  })

  it('moves a sample one place, with its id, and not past either end', () => {
    const before = names()
    moveSample('s0', 1)
    expect(names()).toEqual([before[1], before[0], ...before.slice(2)])
    expect(get().ids.slice(0, 2)).toEqual(['s1', 's0'])
    const past = get().past.length
    moveSample('s1', -1)
    moveSample('s4', 1)
    expect(get().past.length).toBe(past) // nothing happened, nothing to undo
    undo()
    expect(names()).toEqual(before)
  })

  it('renames a sample; typing in the name field is one undo step, and the uncertain inputs follow the name', () => {
    edit((study) => (study.uncertainty = { samples: { [study.samples[0].name]: { rh_percent: { kind: 'normal', sd: 5 } } } } as never))
    const old = names()[0]
    renameSample('s0', 'W')
    renameSample('s0', 'Wo')
    renameSample('s0', 'Wood')
    expect(names()[0]).toBe('Wood')
    const u = get().study.uncertainty as unknown as { samples: Record<string, unknown> }
    expect(Object.keys(u.samples)).toEqual(['Wood'])
    undo()
    expect(names()[0]).toBe(old)
  })

  it(`marks up to ${MAX_COMPARE} samples for comparison, in list order, and refuses a seventh with a message`, () => {
    for (let i = 0; i < 3; i++) duplicateSample('s0')
    const ids = get().ids
    for (const id of [...ids].reverse().slice(0, MAX_COMPARE)) toggleCompare(id)
    expect(get().compare).toEqual(ids.slice(ids.length - MAX_COMPARE))
    toggleCompare(ids[0])
    expect(get().compare).not.toContain(ids[0])
    expect(get().toast?.text).toMatch(/At most 6/)
    toggleCompare(ids[ids.length - 1])
    expect(get().compare).toHaveLength(MAX_COMPARE - 1)
    // a deleted sample leaves the comparison
    deleteSample(ids[ids.length - 2])
    expect(get().compare).toHaveLength(MAX_COMPARE - 2)
  })
})
