// The one screen: top bar, samples on the left, the sample's inputs in the middle, the results on the right.
import { useEffect, useState } from 'preact/hooks'
import { onPendingSizer, openText, readSizer, run, type PendingSizer } from './commands.ts'
import { host } from './host/index.ts'
import { addFiles } from './campaign/session.ts'
import { showView } from './state/actions.ts'
import { store, useApp } from './state/store.ts'
import { CatalogueDialog } from './views/Catalogue.tsx'
import { CautionsDialog } from './views/Cautions.tsx'
import { Header } from './views/Header.tsx'
import { Notice, Toast } from './views/Messages.tsx'
import { RecoveryOfferBanner } from './views/RecoveryOffer.tsx'
import { Report } from './views/Report.tsx'
import { Results, VIEWS } from './views/Results.tsx'
import { SampleEditor } from './views/SampleEditor.tsx'
import { SampleList } from './views/SampleList.tsx'
import { SizerDialog } from './views/SizerDialog.tsx'

const inTextField = (t: EventTarget | null) => t instanceof HTMLElement && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.isContentEditable)

/** Keyboard shortcuts. On the desktop the menu's accelerators send the file commands instead. */
function onKey(e: KeyboardEvent): void {
  const mod = e.ctrlKey || e.metaKey
  if (e.altKey && !mod && /^[1-9]$/.test(e.key)) {
    e.preventDefault()
    showView(VIEWS[Number(e.key) - 1].id)
    return
  }
  if (e.key === 'F1') {
    e.preventDefault()
    run('cautions')
    return
  }
  if (host().kind === 'desktop' || !mod) return
  const k = e.key.toLowerCase()
  const map: Record<string, Parameters<typeof run>[0] | undefined> = {
    o: 'open',
    s: e.shiftKey ? 'save-as' : 'save',
    i: 'import-sizer',
    e: e.shiftKey ? 'export-json' : 'export-csv',
    p: 'export-report',
    m: e.shiftKey ? 'catalogue' : undefined,
    z: inTextField(e.target) ? undefined : e.shiftKey ? 'redo' : 'undo',
    y: inTextField(e.target) ? undefined : 'redo'
  }
  const cmd = map[k]
  if (cmd) {
    e.preventDefault()
    run(cmd)
  }
}

export function App() {
  const s = useApp()
  const [pending, setPending] = useState<PendingSizer | null>(null)
  const [dragging, setDragging] = useState(false)

  useEffect(() => {
    onPendingSizer(setPending)
    window.addEventListener('keydown', onKey)
    const off = host().onCommand(run)
    return () => {
      window.removeEventListener('keydown', onKey)
      off()
    }
  }, [])

  // Set while rendering, not in an effect: the charts read the theme's colours in their own effects, which run
  // before this component's, so an effect here left every drawn chart in the old theme's ink and grid.
  if (document.documentElement.dataset['theme'] !== s.theme) document.documentElement.dataset['theme'] = s.theme

  const onDrop = (e: DragEvent) => {
    e.preventDefault()
    setDragging(false)
    const all = [...(e.dataTransfer?.files ?? [])]
    if (store().get().view === 'record') {
      // on the station record, every dropped file joins the campaign
      void addFiles(all.map((x) => ({ name: x.name, blob: x })))
      return
    }
    const f = all[0]
    if (!f) return
    void f.text().then((text) => {
      if (!/\.(mote|json)$/i.test(f.name)) readSizer({ name: f.name, text })
      else if (!store().get().dirty || window.confirm('The study has unsaved changes. Discard them?')) openText({ name: f.name, text })
    })
  }

  if (s.reportOpen) return <Report />

  return (
    <div
      class={`app${dragging ? ' is-dragging' : ''}`}
      onDragOver={(e) => {
        e.preventDefault()
        setDragging(true)
      }}
      onDragLeave={(e) => {
        if (e.target === e.currentTarget) setDragging(false)
      }}
      onDrop={onDrop}
    >
      <a class="skip" href="#result-panel">
        Skip to results
      </a>
      <Header />
      <Notice />
      <RecoveryOfferBanner />
      <main class="workspace">
        <SampleList />
        <SampleEditor />
        <Results />
      </main>
      <Toast />
      {dragging && <div class="drop-hint">{s.view === 'record' ? 'Drop instrument files to add them to the campaign' : 'Drop a sizer export to import its bins'}</div>}
      {pending && <SizerDialog pending={pending} onClose={() => setPending(null)} />}
      {s.cautionsOpen && <CautionsDialog />}
      <CatalogueDialog />
    </div>
  )
}
