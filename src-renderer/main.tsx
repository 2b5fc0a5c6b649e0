// Start-up: choose the host, set up the store, offer a recovery copy, start the computing worker, render.
import { render } from 'preact'
import { demoStudy } from '../src-core/index.ts'
import { App } from './App.tsx'
import { FIRST_START_KEY } from './cautions.ts'
import { keepHostInformed, openText } from './commands.ts'
import { startComputing } from './compute/client.ts'
import { watchCampaign } from './campaign/session.ts'
import { host } from './host/index.ts'
import { keepRecoveryCopy, offerRecovery } from './recovery.ts'
import { blankStudy, load } from './state/actions.ts'
import { createStore, setStore, store, type AppState } from './state/store.ts'
import './styles.css'
// the rest of the page's style, by part of the screen; the order is the cascade's
import './styles/workspace.css'
import './styles/results.css'
import './styles/dialogs.css'
import './styles/report.css'
import './styles/tools.css'
import './styles/catalogue-warnings.css'
import './styles/fit.css'
import './styles/record.css'

function stored(key: string): string | null {
  try {
    return localStorage.getItem(key)
  } catch {
    return null
  }
}

const prefersDark = window.matchMedia?.('(prefers-color-scheme: dark)').matches
const theme = (stored('motebench.theme') as AppState['theme'] | null) ?? (prefersDark ? 'dark' : 'light')

const demo = demoStudy()
const initial: AppState = {
  study: demo,
  ids: [],
  file: null,
  dirty: false,
  pristine: true,
  past: [],
  future: [],
  selected: '',
  compare: [],
  view: 'optics',
  theme,
  drafts: {},
  problems: [],
  results: {},
  sizes: {},
  job: { running: false, done: 0, total: 0 },
  resultsLate: true,
  toast: null,
  notice: null,
  cautionsOpen: stored(FIRST_START_KEY) === null,
  reportOpen: false,
  sizeMoment: 'number'
}
setStore(createStore(initial))

async function start(): Promise<void> {
  const h = host()
  const up = await h.startUp().catch(() => ({}) as Awaited<ReturnType<typeof h.startUp>>)
  if (up.file) {
    if (!openText(up.file)) load(demo, null)
  } else if (up.blank) load(blankStudy(), null)
  else load(demo, null)
  store().set({ pristine: !up.file })
  if (up.recovery) offerRecovery(up.recovery)
  h.onLoad((f) => openText(f))
  keepHostInformed()
  keepRecoveryCopy()
  startComputing()
  watchCampaign()
  render(<App />, document.getElementById('app') as HTMLElement)
}

void start()
