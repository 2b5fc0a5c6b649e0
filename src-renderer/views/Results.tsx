// The results area: one view at a time, chosen by tabs (Alt+1…9); the last three are tools run on request.
import type { JSX } from 'preact'
import { showView } from '../state/actions.ts'
import { useApp, type ViewName } from '../state/store.ts'
import { isComparing, shownSamples } from '../shown.ts'
import { AnglesView } from './AnglesView.tsx'
import { ClimateView } from './ClimateView.tsx'
import { CompareView } from './CompareView.tsx'
import { HumidityView } from './HumidityView.tsx'
import { ClosureView } from './ClosureView.tsx'
import { InstrumentView } from './InstrumentView.tsx'
import { UncertaintyView } from './UncertaintyView.tsx'
import { OpticsView } from './OpticsView.tsx'
import { RecordView } from './RecordView.tsx'

export const VIEWS: { id: ViewName; label: string; render: () => JSX.Element; tool?: boolean }[] = [
  { id: 'optics', label: 'Optics by wavelength', render: () => <OpticsView /> },
  { id: 'angles', label: 'Scattering angles', render: () => <AnglesView /> },
  { id: 'humidity', label: 'Humidity f(RH)', render: () => <HumidityView /> },
  { id: 'climate', label: 'Warming or cooling', render: () => <ClimateView /> },
  { id: 'compare', label: 'Side by side', render: () => <CompareView /> },
  { id: 'record', label: 'Station record', render: () => <RecordView /> },
  { id: 'uncertainty', label: 'How sure is the verdict', render: () => <UncertaintyView />, tool: true },
  { id: 'closure', label: 'Index from measurements', render: () => <ClosureView />, tool: true },
  { id: 'instruments', label: 'Instrument corrections', render: () => <InstrumentView />, tool: true }
]

export function Results() {
  const s = useApp()
  const current = VIEWS.find((v) => v.id === s.view) ?? VIEWS[0]
  const onKey = (e: KeyboardEvent, i: number) => {
    const k = e.key === 'ArrowRight' ? 1 : e.key === 'ArrowLeft' ? -1 : 0
    if (!k) return
    const next = VIEWS[(i + k + VIEWS.length) % VIEWS.length]
    showView(next.id)
    ;(document.getElementById(`tab-${next.id}`) as HTMLElement | null)?.focus()
  }
  return (
    <section class="results" aria-label="Results">
      <div class="tabs" role="tablist" aria-label="Result views">
        {VIEWS.map((v, i) => (
          <button
            key={v.id}
            id={`tab-${v.id}`}
            role="tab"
            type="button"
            aria-selected={v.id === current.id}
            aria-controls="result-panel"
            tabIndex={v.id === current.id ? 0 : -1}
            title={`${v.label} (Alt+${i + 1})`}
            onClick={() => showView(v.id)}
            onKeyDown={(e) => onKey(e, i)}
            data-tab={v.id}
            class={v.tool ? `tool-tab${VIEWS[i - 1]?.tool ? '' : ' first-tool'}` : undefined}
          >
            {v.label}
            {v.id === 'compare' && isComparing(s) ? ` (${s.compare.length})` : ''}
          </button>
        ))}
      </div>
      <div
        id="result-panel"
        role="tabpanel"
        aria-labelledby={`tab-${current.id}`}
        class="result-panel"
        tabIndex={0}
        data-fresh={shownSamples(s).every((x) => x.current && !x.preview) ? 'true' : 'false'}
        data-preview={shownSamples(s).some((x) => x.preview) ? 'true' : 'false'}
        data-current={current.id}
      >
        {current.render()}
      </div>
    </section>
  )
}
