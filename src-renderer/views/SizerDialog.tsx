// After a sizer file is read: choose which distribution (for time series) and where it goes.
import { useState } from 'preact/hooks'
import { sizerRecordToBins } from '../../src-core/index.ts'
import type { PendingSizer } from '../commands.ts'
import { diameter } from '../format.ts'
import { blankSample, edit, editSample } from '../state/actions.ts'
import { newId, store } from '../state/store.ts'
import { Dialog } from './Dialog.tsx'

export function SizerDialog(p: { pending: PendingSizer; onClose: () => void }) {
  const t = p.pending.table
  const [record, setRecord] = useState(0)
  const [target, setTarget] = useState<'new' | 'replace'>('new')
  const scale = t.diameterUnit === 'nm' ? 1e-3 : 1
  const apply = () => {
    const rec = t.records[record]
    const bins = sizerRecordToBins(t, rec, p.pending.name)
    const s = store().get()
    if (target === 'replace') {
      editSample(s.selected, (x) => (x.size = { kind: 'bins', bins }))
    } else {
      const i = s.ids.indexOf(s.selected)
      const id = newId()
      edit((study, ids) => {
        const base = study.samples[i] ?? blankSample('')
        const name = `${p.pending.name.replace(/\.[^.]+$/, '')}${rec.time ? ` ${rec.time}` : ''}`
        study.samples.push({ ...structuredClone(base), name, notes: `Measured bins from ${p.pending.name}${rec.time ? `, ${rec.time}` : ''}.`, size: { kind: 'bins', bins } })
        ids.push(id)
      })
      store().set({ selected: id })
    }
    p.onClose()
  }
  return (
    <Dialog title={`Import “${p.pending.name}”`} name="sizer" onClose={p.onClose}>
      <p data-testid="sizer-summary">
        {t.diameters.length} diameters ({t.edges ? 'bin edges' : 'midpoints'}, {diameter(t.diameters[0] * scale)} – {diameter(t.diameters[t.diameters.length - 1] * scale)}), values as {t.quantity},{' '}
        {t.records.length} distribution{t.records.length === 1 ? '' : 's'}.
      </p>
      {t.records.length > 1 && (
        <label class="field">
          <span>Distribution</span>
          <select value={record} onChange={(e) => setRecord(Number((e.target as HTMLSelectElement).value))}>
            {t.records.map((r, k) => (
              <option value={k} key={k}>
                {r.time || `record ${k + 1}`} (line {r.line})
              </option>
            ))}
          </select>
        </label>
      )}
      <fieldset>
        <legend>Put it</legend>
        <label class="radio">
          <input type="radio" name="sizer-target" checked={target === 'new'} onChange={() => setTarget('new')} /> in a new sample (composition and layer copied from the selected one)
        </label>
        <label class="radio">
          <input type="radio" name="sizer-target" checked={target === 'replace'} onChange={() => setTarget('replace')} /> as the size distribution of the selected sample
        </label>
      </fieldset>
      <div class="dialog-buttons">
        <button type="button" onClick={p.onClose}>
          Cancel
        </button>
        <button type="button" class="primary" onClick={apply} data-testid="sizer-apply">
          Import
        </button>
      </div>
    </Dialog>
  )
}
