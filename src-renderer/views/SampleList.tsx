// The study's samples: choose one to edit, mark 2–6 to compare, add, duplicate, delete (undo), reorder.
import { addSample, deleteSample, duplicateSample, MAX_COMPARE, moveSample, select, toggleCompare } from '../state/actions.ts'
import { useApp } from '../state/store.ts'
import { sampleState } from '../shown.ts'
import { lineStyle } from '../charts/palette.ts'
import { DashSwatch } from '../charts/DashSwatch.tsx'
import { signed } from '../format.ts'

const VERDICT_MARK: Record<string, string> = { cools: '▼ cools', warms: '▲ warms', 'too close to call': '◆ too close to call' }

export function SampleList() {
  const s = useApp()
  const comparing = s.compare.length >= 2
  return (
    <aside class="samples" aria-label="Samples">
      <h2>Samples</h2>
      <p class="help">Mark 2–{MAX_COMPARE} to compare them in every chart.</p>
      <ul class="sample-list" role="list">
        {s.ids.map((id, i) => {
          const st = sampleState(s, id)
          const marked = s.compare.indexOf(id)
          const style = marked >= 0 ? lineStyle(marked, s.theme) : null
          const verdict = st?.result?.forcing.verdict
          return (
            <li key={id} class={`sample-item${id === s.selected ? ' is-selected' : ''}`} data-sample={s.study.samples[i].name}>
              <input
                type="checkbox"
                checked={marked >= 0}
                aria-label={`Compare “${s.study.samples[i].name}”`}
                title="Mark for comparison"
                onChange={() => toggleCompare(id)}
                data-testid="compare-toggle"
              />
              <button
                type="button"
                class="sample-name"
                aria-current={id === s.selected ? 'true' : undefined}
                onClick={() => select(id)}
                onKeyDown={(e) => {
                  if (e.altKey && e.key === 'ArrowUp') {
                    e.preventDefault()
                    moveSample(id, -1)
                  } else if (e.altKey && e.key === 'ArrowDown') {
                    e.preventDefault()
                    moveSample(id, 1)
                  }
                }}
                title="Edit this sample (Alt+↑/↓ moves it)"
              >
                {style && comparing && <DashSwatch stroke={style.stroke} dash={style.dash} />}
                <span class="name-text">{s.study.samples[i].name}</span>
                {verdict && (
                  <span
                    class={`verdict-mini v-${verdict.replace(/ /g, '-')}${st?.stale ? ' is-stale' : ''}`}
                    data-stale={st?.stale ? 'true' : 'false'}
                    title={
                      st?.stale
                        ? 'Stale: this verdict is from earlier inputs'
                        : st?.result
                          ? `Verdict from the thin-layer forcing with global-mean sunlight, ${signed(st.result.forcing.thin_layer_w_m2)} W m⁻² (the Climate view gives the site’s daily mean beside it)`
                          : undefined
                    }
                  >
                    {VERDICT_MARK[verdict]}
                    {st?.stale && <span class="stale-tag">stale</span>}
                  </span>
                )}
                {!verdict && st?.stale && !s.job.running && (
                  <span class="verdict-mini is-stale" data-stale="true">
                    <span class="stale-tag">no results</span>
                  </span>
                )}
              </button>
            </li>
          )
        })}
      </ul>
      <div class="sample-actions" role="group" aria-label="Sample actions">
        <button type="button" onClick={addSample} data-testid="add-sample">
          Add
        </button>
        <button type="button" onClick={() => duplicateSample(s.selected)} data-testid="duplicate-sample">
          Duplicate
        </button>
        <button type="button" onClick={() => deleteSample(s.selected)} disabled={s.ids.length <= 1} data-testid="delete-sample">
          Delete
        </button>
        <button type="button" aria-label="Move the selected sample up" title="Move up (Alt+↑)" onClick={() => moveSample(s.selected, -1)}>
          ↑
        </button>
        <button type="button" aria-label="Move the selected sample down" title="Move down (Alt+↓)" onClick={() => moveSample(s.selected, 1)}>
          ↓
        </button>
      </div>
    </aside>
  )
}
