// The station record's files in the app, on the app's store without a page (a stand-in host records the calls):
// the menu's command to add instrument files, and references made relative to the study file when it is saved.
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import { demoStudy, parseStudy, rebaseCampaignPaths, type CampaignSettings } from '../../src-core/index.ts'
import type { Host, OpenedFile } from '../../src-main/host-api.ts'
import { createStore, setStore, store, type AppState } from '../../src-renderer/state/store.ts'

// the catalogue dialog (which commands.ts opens) draws with uPlot, which needs a page
vi.mock('../../src-renderer/views/Catalogue.tsx', () => ({ openCatalogue: () => {} }))

const saved: { text: string; path?: string; saveAs: boolean }[] = []
let saveTo = '/home/e/studies/valley.mote'
let chosen: OpenedFile[] = []
const fakeHost = {
  kind: 'desktop',
  saveStudy: async (req: { text: string; path?: string; saveAs: boolean }) => {
    saved.push(req)
    const path = req.path && !req.saveAs ? req.path : saveTo
    return { name: path.slice(path.lastIndexOf('/') + 1), path }
  },
  keepRecovery: async () => {},
  openInstrumentFiles: async () => chosen,
  readInstrumentFile: async () => ({ missing: 'not in this test' })
} as unknown as Host

const campaign = (paths: string[]): CampaignSettings => ({ files: paths.map((path, i) => ({ kind: i === 0 ? 'mobility' : 'scattering', path })), sample: demoStudy().samples[0].name, wavelength_nm: 550, shape_factor: 1 })

function fresh(file: AppState['file'], c?: CampaignSettings): void {
  const study = { ...demoStudy(), ...(c ? { campaign: c } : {}) }
  setStore(
    createStore<AppState>({
      study, ids: study.samples.map((_, i) => `s${i}`), file, dirty: true, pristine: false, past: [], future: [], selected: 's0', compare: [], view: 'optics',
      theme: 'light', drafts: {}, problems: [], results: {}, sizes: {}, job: { running: false, done: 0, total: 0 },
      resultsLate: false, toast: null, notice: null, cautionsOpen: false, reportOpen: false, sizeMoment: 'number'
    })
  )
  saved.length = 0
}

beforeAll(() => {
  vi.useFakeTimers() // the record's recomputation is started by a timer: it needs a Worker, which is not here
  ;(globalThis as { window?: unknown }).window = { motebenchHost: fakeHost }
})
afterAll(() => {
  vi.useRealTimers()
  delete (globalThis as { window?: unknown }).window
})
beforeEach(async () => (await import('../../src-renderer/campaign/session.ts')).resetSession())

describe('file references and saving', () => {
  it('rebases references: absolute ones made relative, relative ones carried to a new folder, unknown ones kept', () => {
    const c = campaign(['/home/e/data/mob.csv', 'field/neph.csv'])
    const first = rebaseCampaignPaths(c, undefined, '/home/e/studies/valley.mote')
    expect(first.settings.files.map((f) => f.path)).toEqual(['../data/mob.csv', 'field/neph.csv'])
    expect([...first.moved]).toEqual([['/home/e/data/mob.csv', '../data/mob.csv']])
    const elsewhere = rebaseCampaignPaths(first.settings, '/home/e/studies/valley.mote', '/home/e/other/deep/v2.mote')
    expect(elsewhere.settings.files.map((f) => f.path)).toEqual(['../../data/mob.csv', '../../studies/field/neph.csv'])
    // the same folder: nothing changes, the same object back
    const same = rebaseCampaignPaths(first.settings, '/home/e/studies/valley.mote', '/home/e/studies/copy.mote')
    expect(same.settings).toBe(first.settings)
    expect(same.moved.size).toBe(0)
  })

  it("writes files added before the study's first save relative to the study file", async () => {
    const { save } = await import('../../src-renderer/commands.ts')
    fresh(null, campaign(['/home/e/data/mob.csv', '/home/e/studies/field/neph.csv']))
    saveTo = '/home/e/studies/valley.mote'
    expect(await save(false)).toBe(true)
    // the first write asks where; the second, to the same file, keeps the paths relative to it
    expect(saved.length).toBe(2)
    expect(saved[1].path).toBe('/home/e/studies/valley.mote')
    const written = parseStudy(saved[1].text)
    expect(written.ok && written.study.campaign?.files.map((f) => f.path)).toEqual(['../data/mob.csv', 'field/neph.csv'])
    expect(store().get().study.campaign?.files.map((f) => f.path)).toEqual(['../data/mob.csv', 'field/neph.csv'])
    expect(store().get().dirty).toBe(false)
    expect(store().get().past).toEqual([]) // not an undo step: the files are the same
    // saved again in place: already relative, one write
    expect(await save(false)).toBe(true)
    expect(saved.length).toBe(3)
  })

  it('carries relative references along when the study is saved as another file in another folder', async () => {
    const { save } = await import('../../src-renderer/commands.ts')
    fresh({ name: 'valley.mote', path: '/home/e/studies/valley.mote' }, campaign(['../data/mob.csv']))
    saveTo = '/home/e/archive/2026/valley.mote'
    expect(await save(true)).toBe(true)
    const written = parseStudy(saved[saved.length - 1].text)
    expect(written.ok && written.study.campaign?.files[0].path).toBe('../../data/mob.csv')
  })
})

describe('the menu command', () => {
  it('shows the station record and adds the chosen files to the campaign', async () => {
    const { run } = await import('../../src-renderer/commands.ts')
    fresh(null)
    chosen = [{ name: 'neph.csv', path: '/home/e/data/neph.csv', text: '# units: Mm-1\ntime,scattering 550 nm\n2026-07-14T00:00:00Z,20\n', fingerprint: 'whole:0badf00d' }]
    run('add-instrument-files')
    await vi.waitFor(() => expect(store().get().study.campaign?.files.length).toBe(1))
    expect(store().get().view).toBe('record')
    expect(store().get().study.campaign?.files[0]).toMatchObject({ kind: 'scattering', path: '/home/e/data/neph.csv', hash: 'whole:0badf00d' })
  })
})
