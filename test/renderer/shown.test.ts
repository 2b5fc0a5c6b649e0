// How the views mark a sample's results (src-renderer/shown.ts): from the current inputs, or stale. An edit's
// new figures get a short grace (AppState.resultsLate) before the old ones are marked; bad inputs and failures
// are marked at once.
import { describe, expect, it } from 'vitest'
import { demoStudy } from '../../src-core/index.ts'
import { sampleKey } from '../../src-renderer/compute/client.ts'
import { sampleState, studyStatus } from '../../src-renderer/shown.ts'
import type { AppState } from '../../src-renderer/state/store.ts'

const study = demoStudy()
const ids = study.samples.map((_, i) => `s${i}`)
// the figures themselves play no part in the marking
const result = {} as NonNullable<AppState['results'][string]['result']>

function state(patch: Partial<AppState>): AppState {
  return {
    study, ids, file: null, dirty: false, pristine: false, past: [], future: [], selected: 's0', compare: [], view: 'optics',
    theme: 'light', drafts: {}, problems: [], results: { s0: { key: sampleKey(study, 0), result } }, sizes: {},
    job: { running: false, done: 0, total: 0 }, resultsLate: false, toast: null, notice: null, cautionsOpen: false,
    reportOpen: false, sizeMoment: 'number', ...patch
  }
}

const edited = { ...study, samples: study.samples.map((s, i) => (i === 0 ? { ...s, rh_percent: s.rh_percent - 5 } : s)) }

describe('stale marking', () => {
  it('a result from the current inputs is current and not marked', () => {
    const x = sampleState(state({}), 's0')!
    expect(x.current).toBe(true)
    expect(x.stale).toBe(false)
  })

  it('after an edit the old result is not current, and is marked only once the grace is over', () => {
    const waiting = sampleState(state({ study: edited, job: { running: true, done: 0, total: 2 } }), 's0')!
    expect(waiting.current).toBe(false)
    expect(waiting.stale).toBe(false)
    const late = sampleState(state({ study: edited, job: { running: true, done: 0, total: 2 }, resultsLate: true }), 's0')!
    expect(late.stale).toBe(true)
  })

  it('a bad field, a problem of the sample or a failure marks it at once', () => {
    expect(sampleState(state({ drafts: { 'samples[0].rh_percent': 'not a number' } }), 's0')!.stale).toBe(true)
    expect(sampleState(state({ problems: [{ path: 'samples[0].rh_percent', message: 'above 100 %' } as AppState['problems'][number]] }), 's0')!.stale).toBe(true)
    const failed = sampleState(state({ results: { s0: { key: sampleKey(study, 0), result, error: 'no convergence' } } }), 's0')!
    expect(failed.current).toBe(false)
    expect(failed.stale).toBe(true)
  })

  it('another sample’s bad field leaves this one current', () => {
    const x = sampleState(state({ drafts: { 'samples[1].rh_percent': 'x' } }), 's0')!
    expect(x.current).toBe(true)
    expect(x.stale).toBe(false)
  })

  it('a preview is current and marked as a preview; a sample without results is marked', () => {
    const p = sampleState(state({ results: { s0: { key: sampleKey(study, 0), result, preview: true } } }), 's0')!
    expect(p.current && p.preview && !p.stale).toBe(true)
    expect(sampleState(state({ results: {} }), 's0')!.stale).toBe(true)
  })
})

describe('the study’s status, one for the header and every view', () => {
  const all = Object.fromEntries(ids.map((id, i) => [id, { key: sampleKey(study, i), result }]))

  it('is up to date only when every sample’s results are from its current inputs and nothing runs', () => {
    expect(studyStatus(state({ results: all })).state).toBe('ok')
    expect(studyStatus(state({ results: all, job: { running: true, done: 1, total: 2 } })).state).toBe('pending')
    // samples waiting for their first figures while the job runs are pending, not stale; once it is over, stale
    expect(studyStatus(state({ resultsLate: true, job: { running: true, done: 1, total: 10 } })).state).toBe('pending')
    expect(studyStatus(state({ resultsLate: true })).state).toBe('stale')
    // one sample without results (the others current): not "up to date"
    expect(studyStatus(state({})).state).not.toBe('ok')
  })

  it('is stale as soon as any sample is: a bad field, a problem, or a computation that failed, with its name', () => {
    expect(studyStatus(state({ results: all, drafts: { 'samples[3].gsd': 'x' } }))).toMatchObject({ state: 'stale', inputs: 1 })
    const failed = studyStatus(state({ results: { ...all, s2: { key: sampleKey(study, 2), result, error: 'Optical depth at 550 nm: 24 754 is outside 0–10' } } }))
    expect(failed).toMatchObject({ state: 'stale', inputs: 0, failed: [study.samples[2].name] })
  })

  it('leaves the uncertainty settings out (they change no sample’s results)', () => {
    expect(studyStatus(state({ results: all, drafts: { 'uncertainty.draws': 'x' } })).state).toBe('ok')
  })
})
