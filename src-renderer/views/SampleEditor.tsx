// The sample editor: name and notes, the size distribution (modes or measured bins) with its plot, the
// composition, humidity and the layer. Problems of this sample not shown at a field are listed at the top.
import { problemsOf } from '../compute/client.ts'
import { CompositionEditor } from '../edit/CompositionEditor.tsx'
import { Conditions } from '../edit/Conditions.tsx'
import { ModesTable } from '../edit/ModesTable.tsx'
import { OwnComponents } from '../edit/OwnComponents.tsx'
import { openCatalogue } from './Catalogue.tsx'
import { diameter, num } from '../format.ts'
import { editSample, renameSample } from '../state/actions.ts'
import { useApp } from '../state/store.ts'
import { SizePlot } from './SizePlot.tsx'
import { screenName } from '../edit/fieldNames.ts'
import { sampleState } from '../shown.ts'
import type { BinsSpec } from '../../src-core/index.ts'

function BinsPanel(p: { id: string; bins: BinsSpec }) {
  const b = p.bins
  const scale = b.diameter_unit === 'nm' ? 1e-3 : 1
  const lo = b.diameters[0] * scale
  const hi = b.diameters[b.diameters.length - 1] * scale
  return (
    <div class="bins" data-testid="bins-panel">
      <p>
        <strong>{b.values.length} measured bins</strong> ({b.edges ? 'edges' : 'midpoints'} {diameter(lo)} – {diameter(hi)}), values as {b.quantity}
        {b.rows_averaged ? `, the mean of ${b.rows_averaged} rows` : ''}
        {b.source ? `, from ${b.source}` : ''}.
      </p>
      <details>
        <summary>Bin values</summary>
        <div class="bin-table-wrap">
          <table class="grid-table compact">
            <thead>
              <tr>
                <th scope="col">D ({b.diameter_unit === 'um' ? 'µm' : 'nm'})</th>
                <th scope="col">{b.quantity}</th>
              </tr>
            </thead>
            <tbody>
              {b.values.map((v, i) => (
                <tr key={i}>
                  <td>{num(b.diameters[i], 5)}</td>
                  <td>{num(v, 5)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
      <button
        type="button"
        class="small"
        onClick={() =>
          editSample(p.id, (s) => {
            s.size = { kind: 'modes', modes: [{ by: 'number', name: 'accumulation', number_cm3: 1000, median_um: 0.15, gsd: 1.6 }] }
          })
        }
      >
        Replace the bins by lognormal modes
      </button>
    </div>
  )
}

export function SampleEditor() {
  const s = useApp()
  const i = s.ids.indexOf(s.selected)
  if (i < 0) return <section class="editor" />
  const sample = s.study.samples[i]
  const id = s.selected
  const own = problemsOf(s.problems, i)
  const st = sampleState(s, id)
  // the computation's refusal of inputs that each passed (an optical depth beyond the forcing estimate's range)
  const failed = !own.length && st?.error ? st.error : null
  return (
    <section class="editor" aria-label={`Inputs of ${sample.name}`}>
      <div class="editor-head">
        <label class="field name-field">
          <span class="sr-only">Sample name</span>
          <input type="text" value={sample.name} data-testid="sample-name" aria-label="Sample name" onInput={(e) => renameSample(id, (e.target as HTMLInputElement).value)} />
        </label>
      </div>
      {own.length > 0 && (
        <div class="problems" role="alert" data-testid="problems">
          <strong>
            {own.length} input problem{own.length === 1 ? '' : 's'}; the results shown are from the last good inputs.
          </strong>
          <ul>
            {own.slice(0, 5).map((p, k) => (
              <li key={k} data-problem-for={p.path}>
                <span class="where">{screenName(s.study, p.path)}</span>: {p.message}.
              </li>
            ))}
          </ul>
        </div>
      )}
      {failed && (
        <div class="problems" role="alert" data-testid="problems">
          <strong>These inputs could not be computed; the results shown are from the last good inputs.</strong>
          <p>{failed}</p>
        </div>
      )}
      <fieldset>
        <legend>Size distribution</legend>
        {sample.size.kind === 'modes' ? <ModesTable id={id} index={i} modes={sample.size.modes} userMaterials={s.study.user_materials ?? []} /> : <BinsPanel id={id} bins={sample.size.bins} />}
        <SizePlot />
      </fieldset>
      <fieldset>
        <legend>Composition</legend>
        {sample.size.kind === 'modes' && sample.size.modes.some((m) => m.composition) && (
          <p class="hint block">Used by the modes made of the sample's composition; the others have their own (under the size distribution).</p>
        )}
        <CompositionEditor id={id} index={i} composition={sample.composition} userMaterials={s.study.user_materials ?? []} />
        <OwnComponents />
        <button type="button" class="small ghost" onClick={openCatalogue} title="Every component’s refractive index at the study’s wavelengths, density, κ and sources (Ctrl+Shift+M)" data-testid="open-catalogue">
          Component catalogue…
        </button>
      </fieldset>
      <fieldset>
        <legend>Humidity and layer</legend>
        <Conditions id={id} index={i} sample={sample} />
      </fieldset>
      <fieldset>
        <legend>Notes</legend>
        <textarea
          aria-label="Notes on this sample"
          rows={3}
          value={sample.notes ?? ''}
          onInput={(e) => {
            const v = (e.target as HTMLTextAreaElement).value
            editSample(id, (x) => (v ? (x.notes = v) : delete x.notes), 'notes')
          }}
        />
      </fieldset>
    </section>
  )
}
