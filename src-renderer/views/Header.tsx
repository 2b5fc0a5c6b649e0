// The top bar: the study's name, file actions, exports, the computing status and the cautions.
import { studyStatus } from '../shown.ts'
import { cancel, exportCsv, exportJson, importSizer, newStudy, openDemo, openReport, openStudy, save } from '../commands.ts'
import { host } from '../host/index.ts'
import { edit } from '../state/actions.ts'
import { store, useApp } from '../state/store.ts'
import { UndoButtons } from './UndoButtons.tsx'

function Status() {
  const s = useApp()
  const status = studyStatus(s)
  const stale = status.state === 'stale'
  const why = status.inputs > 0 ? 'Inputs need attention' : status.failed.length > 0 ? 'Not computed' : 'Not all computed'
  const detail =
    status.inputs > 0
      ? `${status.inputs} input${status.inputs === 1 ? '' : 's'} cannot be used as they stand (marked at the fields)`
      : status.failed.length > 0
        ? `${status.failed.map((n) => `“${n}”`).join(', ')} could not be computed from the current inputs (the reason is beside the results)`
        : 'Some results are from earlier inputs'
  return (
    <span class="status-group" role="status">
      {s.job.running && (
        <span class="status busy" data-status="busy">
          <progress max={s.job.total} value={s.job.done} aria-label="Computing" />
          Computing {s.job.done}/{s.job.total}
          <button type="button" class="small" onClick={cancel} title="Stop this computation (the next edit starts a new one)">
            Stop
          </button>
        </span>
      )}
      {stale && (
        <span class="status warn" data-status="stale" title={`${detail}; the results marked stale are from earlier inputs and update when the inputs are complete and valid.`}>
          {why} · results stale
        </span>
      )}
      {status.state === 'ok' && (
        <span class="status ok" data-status="ok">
          Results up to date
        </span>
      )}
    </span>
  )
}

export function Header() {
  const s = useApp()
  const desktop = host().kind === 'desktop'
  return (
    <header class="topbar">
      <span class="brand" aria-hidden="true">
        Motebench
      </span>
      <label class="study-name">
        <span class="sr-only">Study name</span>
        <input
          type="text"
          value={s.study.name}
          data-testid="study-name"
          onInput={(e) => {
            const v = (e.target as HTMLInputElement).value
            edit((st) => (st.name = v), 'study-name')
          }}
        />
      </label>
      {s.dirty && (
        <span class="dirty" title="Unsaved changes">
          ●<span class="sr-only">unsaved changes</span>
        </span>
      )}
      <nav class="actions" aria-label="Study file">
        {!desktop && (
          <button type="button" onClick={newStudy} title="Start an empty study">
            New
          </button>
        )}
        <button type="button" onClick={() => void openStudy()} title="Open a study file (Ctrl+O)" data-testid="open">
          Open…
        </button>
        <button type="button" onClick={() => void save(false)} title="Save the study (Ctrl+S)" data-testid="save">
          Save
        </button>
        {desktop && (
          <button type="button" onClick={() => void save(true)} title="Save under a new name (Ctrl+Shift+S)">
            Save as…
          </button>
        )}
        <button type="button" onClick={() => void importSizer()} title="Import measured bins from a sizer export (Ctrl+I); you can also drop the file on the window" data-testid="import-sizer">
          Import sizer file…
        </button>
        <button type="button" onClick={() => void exportCsv()} title="Results as a CSV table (Ctrl+E)" data-testid="export-csv">
          CSV
        </button>
        <button type="button" onClick={() => void exportJson()} title="Study and results as JSON (Ctrl+Shift+E)" data-testid="export-json">
          JSON
        </button>
        <button type="button" onClick={openReport} title="A print-ready report of the whole study (Ctrl+P)" data-testid="report">
          Report
        </button>
        {!desktop && (
          <button type="button" class="ghost" onClick={openDemo} title="Open the demo study (invented data)">
            Demo
          </button>
        )}
      </nav>
      <UndoButtons />
      <Status />
      <span class="spacer" />
      <button type="button" class="caution-button" onClick={() => store().set({ cautionsOpen: true })} title="Safety and limits of the estimate (F1)" data-testid="cautions">
        ⚠ Cautions
      </button>
      <button
        type="button"
        class="ghost"
        aria-label={`Switch to the ${s.theme === 'light' ? 'dark' : 'light'} theme`}
        title="Light or dark theme"
        onClick={() => {
          const theme = s.theme === 'light' ? 'dark' : 'light'
          store().set({ theme })
          try {
            localStorage.setItem('motebench.theme', theme)
          } catch {
            /* not kept */
          }
        }}
      >
        {s.theme === 'light' ? '◐ Dark' : '◑ Light'}
      </button>
    </header>
  )
}
